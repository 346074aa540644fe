import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';

/** A caution where the work can hurt someone: sensitive locations, privacy, estimates. */
@Component({
  selector: 'mac-caution-note',
  imports: [MatIcon],
  template: `
    <div class="caution" role="note">
      <mat-icon aria-hidden="true">{{ icon() }}</mat-icon>
      <div><ng-content /></div>
    </div>
  `,
  styles: `
    .caution {
      display: flex;
      gap: 12px;
      align-items: flex-start;
    }
    mat-icon {
      flex: none;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CautionNote {
  readonly icon = input('warning');
}
