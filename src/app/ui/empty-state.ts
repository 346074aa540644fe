import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';

/** A calm "nothing here" panel: an icon, a title and what to do next. */
@Component({
  selector: 'mac-empty-state',
  imports: [MatIcon],
  template: `
    <mat-icon aria-hidden="true">{{ icon() }}</mat-icon>
    <h2>{{ title() }}</h2>
    <p class="muted">{{ message() }}</p>
    <ng-content />
  `,
  styles: `
    :host {
      display: flex;
      flex-direction: column;
      align-items: center;
      text-align: center;
      padding: 48px 24px;
      gap: 4px;
    }
    mat-icon {
      font-size: 48px;
      width: 48px;
      height: 48px;
      color: var(--mat-sys-outline);
    }
    h2 {
      font: var(--mat-sys-title-large);
      margin: 8px 0 0;
    }
    p {
      max-width: 560px;
      font: var(--mat-sys-body-large);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EmptyState {
  readonly icon = input('inbox');
  readonly title = input.required<string>();
  readonly message = input('');
}
