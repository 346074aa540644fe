import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { DuplicateSuggestion } from '../../../shared/curate';
import { apiErrorMessage } from '../core/api-error';
import { EmptyState } from '../ui/empty-state';
import { CurateApi } from './curate-api';

/** Possible duplicates with their evidence: merge one into the other, or say they differ. */
@Component({
  selector: 'mac-duplicates-tab',
  imports: [FormsModule, RouterLink, MatButton, EmptyState],
  template: `
    @for (s of suggestions.value(); track s.first.id + s.second.id) {
      <article class="pair" data-testid="duplicate">
        <div class="sides">
          @for (side of [s.first, s.second]; track side.id) {
            <div class="side">
              <a [routerLink]="['../catalogue', side.code]"
                ><strong>{{ side.code }}</strong></a
              >
              {{ side.nickname }}
              <span class="muted">{{ side.flanks }}</span>
              <div class="refs">
                @for (r of side.references; track r.photoId) {
                  <img
                    [src]="r.thumbUrl"
                    [alt]="side.code + ' ' + r.flank + ' reference'"
                    loading="lazy"
                  />
                } @empty {
                  <span class="muted">no reference photo</span>
                }
              </div>
            </div>
          }
        </div>
        <ul class="evidence">
          @for (e of s.evidence; track e.text) {
            <li>{{ e.text }}</li>
          }
        </ul>
        <label class="reason"
          >Reason
          <input
            [(ngModel)]="reasons[key(s)]"
            [name]="'r-' + key(s)"
            placeholder="what convinced you"
        /></label>
        <div class="actions">
          <button mat-flat-button (click)="merge(s, s.second.id, s.first.id)">
            Merge {{ s.second.code }} into {{ s.first.code }}
          </button>
          <button mat-stroked-button (click)="merge(s, s.first.id, s.second.id)">
            Merge {{ s.first.code }} into {{ s.second.code }}
          </button>
          <button mat-button (click)="dismiss(s)">Not the same animal</button>
        </div>
      </article>
    } @empty {
      @if (!suggestions.isLoading()) {
        <mac-empty-state
          icon="join_inner"
          title="No possible duplicates"
          message="Pairs appear here when two individuals may be one animal: opposite flanks seen together, alike marks, or detections that alternate."
        />
      }
    }
  `,
  styles: `
    .pair {
      padding: 12px;
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: 12px;
      margin-bottom: 12px;
    }
    .sides {
      display: grid;
      grid-template-columns: 1fr 1fr;
      gap: 12px;
    }
    .refs {
      display: flex;
      gap: 6px;
      margin-top: 6px;
    }
    .refs img {
      width: 150px;
      height: 100px;
      object-fit: cover;
      border-radius: 6px;
    }
    .evidence {
      margin: 8px 0;
    }
    .actions {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
    }
    .reason {
      display: flex;
      flex-direction: column;
      margin-bottom: 8px;
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
export class DuplicatesTab {
  private readonly api = inject(CurateApi);
  private readonly snackBar = inject(MatSnackBar);
  readonly slug = input.required<string>();
  protected readonly suggestions = httpResource<DuplicateSuggestion[]>(
    () => `/api/projects/${this.slug()}/duplicates`,
    { defaultValue: [] },
  );
  protected readonly reasons: Record<string, string> = {};

  protected key(s: DuplicateSuggestion): string {
    return `${s.first.id}-${s.second.id}`;
  }

  private reasonOf(s: DuplicateSuggestion): string | null {
    const reason = (this.reasons[this.key(s)] ?? '').trim();
    if (reason.length >= 3) return reason;
    this.snackBar.open('Give a reason (a few words); it stays in the history.', 'OK', {
      duration: 5000,
    });
    return null;
  }

  protected async merge(s: DuplicateSuggestion, from: string, into: string): Promise<void> {
    const reason = this.reasonOf(s);
    if (!reason) return;
    try {
      const res = await this.api.merge(this.slug(), from, into, reason);
      this.snackBar.open(res.change.summary, 'OK', { duration: 5000 });
      this.suggestions.reload();
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
  }

  protected async dismiss(s: DuplicateSuggestion): Promise<void> {
    try {
      await this.api.dismiss(
        this.slug(),
        s.first.id,
        s.second.id,
        (this.reasons[this.key(s)] ?? '').trim() || 'different animals',
      );
      this.suggestions.reload();
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
  }
}
