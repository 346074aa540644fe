import { DatePipe } from '@angular/common';
import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatSnackBar } from '@angular/material/snack-bar';
import { apiErrorMessage } from '../core/api-error';
import { EmptyState } from '../ui/empty-state';
import { CurateApi } from './curate-api';

interface Dispute {
  sightingId: string;
  flank: string;
  quality: string;
  start: string;
  stationCode: string;
  bestPhoto: { id: string; previewUrl: string; thumbUrl: string };
  calls: {
    id: string;
    reviewer: string;
    verdict: string;
    individualId: string | null;
    code: string | null;
    individualStatus: string | null;
    note: string;
    at: string;
  }[];
}

/** Disputed sightings: both calls side by side; the curator decides, with a reason. */
@Component({
  selector: 'mac-disputes-tab',
  imports: [DatePipe, FormsModule, MatButton, EmptyState],
  template: `
    @for (d of disputes.value(); track d.sightingId) {
      <article class="dispute" data-testid="dispute">
        <img
          class="photo"
          [src]="d.bestPhoto.previewUrl"
          [alt]="'Disputed sighting at ' + d.stationCode"
          loading="lazy"
        />
        <div class="body">
          <h3>
            {{ d.stationCode }} · {{ d.start | date: 'medium' }} · {{ d.flank }} flank,
            {{ d.quality }}
          </h3>
          <div class="calls">
            @for (c of d.calls; track c.id; let i = $index) {
              <div class="call">
                <strong>Call {{ i + 1 }}</strong> by {{ c.reviewer }}:
                {{
                  c.verdict === 'match'
                    ? 'match ' + c.code
                    : c.verdict === 'new'
                      ? 'a new individual'
                      : 'unidentifiable'
                }}
                @if (c.note) {
                  <p class="muted">“{{ c.note }}”</p>
                }
              </div>
            }
          </div>
          <label class="reason"
            >Reason
            <input
              [(ngModel)]="reasons[d.sightingId]"
              [name]="'reason-' + d.sightingId"
              placeholder="why this decision"
          /></label>
          <div class="actions">
            @for (c of matchCalls(d); track c.id) {
              <button mat-flat-button (click)="decide(d, 'match', c.individualId!)">
                Confirm as {{ c.code }}
              </button>
            }
            <button mat-stroked-button (click)="decide(d, 'new')">New individual</button>
            <button mat-stroked-button (click)="decide(d, 'unidentifiable')">Unidentifiable</button>
            <input
              class="code"
              [(ngModel)]="codes[d.sightingId]"
              [name]="'code-' + d.sightingId"
              placeholder="or another code, e.g. KHL-004"
              aria-label="Another individual's code"
            />
            <button mat-button (click)="decideCode(d)" [disabled]="!codes[d.sightingId]">
              Confirm as that code
            </button>
          </div>
        </div>
      </article>
    } @empty {
      @if (!disputes.isLoading()) {
        <mac-empty-state
          icon="task_alt"
          title="No disputes"
          message="When two reviewers disagree about a sighting, it waits here for your decision."
        />
      }
    }
  `,
  styles: `
    .dispute {
      display: grid;
      grid-template-columns: 320px 1fr;
      gap: 16px;
      padding: 12px;
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: 12px;
      margin-bottom: 12px;
    }
    .photo {
      width: 100%;
      border-radius: 8px;
    }
    h3 {
      margin: 0 0 8px;
      font: var(--mat-sys-title-small);
    }
    .calls {
      display: grid;
      grid-template-columns: 1fr 1fr;
      gap: 8px;
    }
    .call {
      padding: 8px;
      border-radius: 8px;
      background: var(--mat-sys-surface-container);
    }
    .actions {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      align-items: center;
      margin-top: 8px;
    }
    .reason {
      display: flex;
      flex-direction: column;
      margin-top: 8px;
    }
    input {
      padding: 6px;
      border-radius: 6px;
      border: 1px solid var(--mat-sys-outline);
      background: var(--mat-sys-surface);
      color: var(--mat-sys-on-surface);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DisputesTab {
  private readonly api = inject(CurateApi);
  private readonly snackBar = inject(MatSnackBar);
  readonly slug = input.required<string>();
  protected readonly disputes = httpResource<Dispute[]>(
    () => `/api/projects/${this.slug()}/disputes`,
    { defaultValue: [] },
  );
  protected readonly reasons: Record<string, string> = {};
  protected readonly codes: Record<string, string> = {};
  protected readonly count = computed(() => this.disputes.value().length);
  protected readonly busy = signal(false);

  protected matchCalls(d: Dispute) {
    return d.calls.filter(
      (c) => c.verdict === 'match' && c.individualId && c.individualStatus === 'active',
    );
  }

  protected async decideCode(d: Dispute): Promise<void> {
    try {
      await this.decide(
        d,
        'match',
        await this.api.resolveCode(this.slug(), this.codes[d.sightingId] ?? ''),
      );
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
  }

  protected async decide(d: Dispute, verdict: string, individualId?: string): Promise<void> {
    const reason = (this.reasons[d.sightingId] ?? '').trim();
    if (reason.length < 3) {
      this.snackBar.open('Give a reason for the decision (a few words).', 'OK', { duration: 5000 });
      return;
    }
    try {
      const res = await this.api.resolve(this.slug(), d.sightingId, {
        verdict,
        reason,
        ...(individualId ? { individualId } : {}),
      });
      this.snackBar.open(res.change.summary, undefined, { duration: 4000 });
      this.disputes.reload();
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
  }
}
