import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { EmptyState } from './empty-state';

/** An area that has no working screen yet says so plainly (route data gives the words). */
@Component({
  selector: 'mac-area-placeholder',
  imports: [EmptyState],
  template: `
    <div class="page">
      <h1 class="page-title">{{ title() }}</h1>
      <mac-empty-state [icon]="icon()" [title]="'Not available yet'" [message]="message()" />
    </div>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AreaPlaceholder {
  readonly title = input('');
  readonly icon = input('construction');
  readonly message = input('');
}
