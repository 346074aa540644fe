import {
  ChangeDetectionStrategy,
  Component,
  effect,
  inject,
  input,
  signal,
  untracked,
} from '@angular/core';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterOutlet } from '@angular/router';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { EmptyState } from '../ui/empty-state';

/** Loads the project named in the address and shows its pages. */
@Component({
  selector: 'mac-project-layout',
  imports: [RouterOutlet, MatProgressBar, EmptyState],
  template: `
    @if (error()) {
      <mac-empty-state icon="block" title="This project cannot be opened" [message]="error()!" />
    } @else if (!store.current()) {
      <mat-progress-bar mode="indeterminate" />
    } @else {
      <router-outlet />
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectLayout {
  protected readonly store = inject(ProjectStore);
  readonly slug = input.required<string>();
  protected readonly error = signal<string | null>(null);

  constructor() {
    effect(() => {
      const slug = this.slug();
      // Only the slug is a dependency: opening the project updates the store's own signals.
      untracked(() => {
        this.error.set(null);
        this.store.open(slug).catch((err: unknown) => this.error.set(apiErrorMessage(err)));
      });
    });
  }
}
