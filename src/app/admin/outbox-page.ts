import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatListItem, MatListItemLine, MatListItemTitle, MatNavList } from '@angular/material/list';
import { MatProgressBar } from '@angular/material/progress-bar';
import type { OutboxMessage } from '../../../shared/admin';
import { apiErrorMessage } from '../core/api-error';
import { EmptyState } from '../ui/empty-state';
import { AdminApi } from './admin-api';

/** The local mail fake's catch: every e-mail the app sent when no SMTP relay is configured. */
@Component({
  selector: 'mac-outbox-page',
  imports: [
    DatePipe,
    MatNavList,
    MatListItem,
    MatListItemTitle,
    MatListItemLine,
    MatButton,
    MatProgressBar,
    EmptyState,
  ],
  template: `
    <p class="muted">
      Without an SMTP relay (SMTP_URL), Maculo keeps outgoing e-mail here instead of sending it.
    </p>
    @if (loading()) {
      <mat-progress-bar mode="indeterminate" />
    }
    @if (error()) {
      <p class="error" role="alert">{{ error() }}</p>
    }
    <div class="outbox">
      <mat-nav-list class="list" data-testid="outbox-list">
        @for (m of messages(); track m.id) {
          <button
            mat-list-item
            type="button"
            (click)="selected.set(m)"
            [activated]="selected()?.id === m.id"
          >
            <span matListItemTitle>{{ m.subject }}</span>
            <span matListItemLine>{{ m.to }} · {{ m.receivedAt | date: 'medium' }}</span>
          </button>
        } @empty {
          @if (!loading()) {
            <mac-empty-state
              icon="mail"
              title="No e-mail yet"
              message="Invitations and password resets appear here."
            />
          }
        }
        @if (next()) {
          <button mat-button (click)="load()">Older messages</button>
        }
      </mat-nav-list>
      @if (selected(); as m) {
        <article class="message" data-testid="outbox-message">
          <h2>{{ m.subject }}</h2>
          <p class="muted">From {{ m.from }} to {{ m.to }}, {{ m.receivedAt | date: 'medium' }}</p>
          <pre>{{ m.text }}</pre>
        </article>
      }
    </div>
  `,
  styles: `
    .outbox {
      display: grid;
      grid-template-columns: minmax(260px, 1fr) 2fr;
      gap: 16px;
    }
    .message pre {
      white-space: pre-wrap;
      font: var(--mat-sys-body-medium);
      background: var(--mat-sys-surface-container);
      padding: 16px;
      border-radius: 8px;
    }
    .error {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutboxPage {
  private readonly api = inject(AdminApi);
  protected readonly messages = signal<OutboxMessage[]>([]);
  protected readonly selected = signal<OutboxMessage | null>(null);
  protected readonly next = signal<string | null>(null);
  protected readonly loading = signal(false);
  protected readonly error = signal<string | null>(null);

  constructor() {
    void this.load();
  }

  protected async load(): Promise<void> {
    this.loading.set(true);
    try {
      const page = await this.api.outbox(this.next());
      this.messages.update((list) => [...list, ...page.items]);
      this.next.set(page.next);
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.loading.set(false);
    }
  }
}
