import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';

/** Plain-language warnings beside an estimate; nothing is drawn when there are none. */
@Component({
  selector: 'mac-warning-list',
  imports: [MatIcon],
  template: `
    @if (warnings().length > 0) {
      <ul class="warnings" [attr.aria-label]="label()">
        @for (w of warnings(); track $index) {
          <li>
            <mat-icon aria-hidden="true">warning</mat-icon><span>{{ w }}</span>
          </li>
        }
      </ul>
    }
  `,
  styles: `
    .warnings {
      list-style: none;
      margin: 4px 0 0;
      padding: 0;
      display: grid;
      gap: 4px;
    }
    li {
      display: flex;
      gap: 6px;
      align-items: flex-start;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    mat-icon {
      flex: none;
      font-size: 18px;
      width: 18px;
      height: 18px;
      color: var(--mat-sys-tertiary);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class WarningList {
  readonly warnings = input<readonly string[]>([]);
  readonly label = input('Warnings');
}
