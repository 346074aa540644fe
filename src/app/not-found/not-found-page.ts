import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { EmptyState } from '../ui/empty-state';

/** Unknown addresses and pages the person's role does not open. */
@Component({
  selector: 'mac-not-found-page',
  imports: [EmptyState, MatButton, RouterLink],
  template: `
    <div class="page">
      @if (kind() === 'not-allowed') {
        <mac-empty-state
          icon="lock"
          title="Not open to your role"
          message="This page needs a higher role in the project. Ask the project's ecologist if you need it."
        >
          <a mat-flat-button routerLink="/">Go to your projects</a>
        </mac-empty-state>
      } @else {
        <mac-empty-state
          icon="explore_off"
          title="Page not found"
          message="There is no page at this address. It may have moved, or the link may be incomplete."
        >
          <a mat-flat-button routerLink="/">Go to your projects</a>
        </mac-empty-state>
      }
    </div>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NotFoundPage {
  readonly kind = input<'not-found' | 'not-allowed'>('not-found');
}
