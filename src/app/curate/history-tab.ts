import { DatePipe } from '@angular/common';
import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { IdentityChangeView } from '../../../shared/curate';
import { apiErrorMessage } from '../core/api-error';
import { EmptyState } from '../ui/empty-state';
import { CurateApi } from './curate-api';

/** Every identity change, newest first, each undoable exactly (unless a later change stands in the way). */
@Component({
  selector: 'mac-history-tab',
  imports: [DatePipe, MatButton, EmptyState],
  template: `
    @if (conflict()) {
      <p class="conflict" role="alert" data-testid="undo-conflict">{{ conflict() }}</p>
    }
    <ol class="changes" data-testid="changes">
      @for (c of changes.value(); track c.id) {
        <li [class.undone]="c.undoneBy">
          <div>
            <strong>{{ c.summary }}</strong>
            <span class="muted">by {{ c.by }}, {{ c.at | date: 'medium' }}</span>
            @if (c.reason) {
              <span>— “{{ c.reason }}”</span>
            }
            @if (c.undoneBy) {
              <span class="tag">undone</span>
            }
          </div>
          @if (c.kind !== 'undo' && !c.undoneBy) {
            <button mat-stroked-button (click)="undo(c)">Undo</button>
          }
        </li>
      } @empty {
        @if (!changes.isLoading()) {
          <mac-empty-state
            icon="history"
            title="No identity changes yet"
            message="Merges, splits and dispute decisions are listed here, with who made them and why."
          />
        }
      }
    </ol>
  `,
  styles: `
    .changes {
      list-style: none;
      padding: 0;
    }
    li {
      display: flex;
      justify-content: space-between;
      gap: 12px;
      padding: 8px 0;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    li.undone strong {
      text-decoration: line-through;
    }
    .tag {
      margin-left: 8px;
      padding: 0 8px;
      border-radius: 8px;
      background: var(--mat-sys-surface-container-high);
    }
    .conflict {
      padding: 8px 12px;
      border-radius: 8px;
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HistoryTab {
  private readonly api = inject(CurateApi);
  private readonly snackBar = inject(MatSnackBar);
  readonly slug = input.required<string>();
  protected readonly changes = httpResource<IdentityChangeView[]>(
    () => `/api/projects/${this.slug()}/identity-changes`,
    { defaultValue: [] },
  );
  protected readonly conflict = signal<string | null>(null);

  protected async undo(change: IdentityChangeView): Promise<void> {
    const reason = prompt(`Undo “${change.summary}”? Say why:`) ?? '';
    try {
      const res = await this.api.undo(this.slug(), change.id, reason);
      this.conflict.set(null);
      this.snackBar.open(`${res.change.summary}.`, undefined, { duration: 4000 });
      this.changes.reload();
    } catch (err) {
      this.conflict.set(apiErrorMessage(err));
    }
  }
}
