import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import {
  MatCard,
  MatCardContent,
  MatCardHeader,
  MatCardSubtitle,
  MatCardTitle,
} from '@angular/material/card';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { ProjectListItem } from '../../../shared/projects';
import { ROLE_LABELS, type ProjectRole } from '../../../shared/roles';
import { AuthStore } from '../core/auth-store';
import { EmptyState } from '../ui/empty-state';

/** The projects the signed-in person belongs to. */
@Component({
  selector: 'mac-projects-page',
  imports: [
    MatCard,
    MatCardHeader,
    MatCardTitle,
    MatCardSubtitle,
    MatCardContent,
    MatProgressBar,
    RouterLink,
    EmptyState,
  ],
  template: `
    <div class="page">
      <h1 class="page-title">Your projects</h1>
      @if (projects.isLoading()) {
        <mat-progress-bar mode="indeterminate" />
      } @else if (projects.error()) {
        <mac-empty-state
          icon="error"
          title="Projects could not be loaded"
          message="Reload the page to try again."
        />
      } @else {
        <div class="grid">
          @for (p of projects.value(); track p.slug) {
            <a class="project-link" [routerLink]="['/p', p.slug, 'overview']">
              <mat-card appearance="outlined">
                <mat-card-header>
                  <mat-card-title>{{ p.name }}</mat-card-title>
                  <mat-card-subtitle>{{ roleLabel(p.role) }}</mat-card-subtitle>
                </mat-card-header>
                <mat-card-content
                  ><span class="muted">{{ p.slug }}</span></mat-card-content
                >
              </mat-card>
            </a>
          } @empty {
            <mac-empty-state
              icon="folder_off"
              title="You are not in any project yet"
              [message]="
                auth.isAdmin()
                  ? 'Create a project under Administration, then add people to it.'
                  : 'Ask a project ecologist to invite you; the link arrives by e-mail.'
              "
            />
          }
        </div>
      }
    </div>
  `,
  styles: `
    .grid {
      display: grid;
      gap: 16px;
      grid-template-columns: repeat(auto-fill, minmax(280px, 1fr));
    }
    .project-link {
      text-decoration: none;
      color: inherit;
    }
    mat-card:hover {
      border-color: var(--mat-sys-primary);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectsPage {
  protected readonly auth = inject(AuthStore);
  protected readonly projects = httpResource<ProjectListItem[]>(() => '/api/projects', {
    defaultValue: [],
  });

  protected roleLabel(role: ProjectRole | null): string {
    return role ? ROLE_LABELS[role] : 'Administrator (no project role)';
  }
}
