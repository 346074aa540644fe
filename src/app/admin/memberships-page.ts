import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { AdminUserView } from '../../../shared/admin';
import type { MemberView, ProjectDetail } from '../../../shared/projects';
import { PROJECT_ROLES, ROLE_LABELS, type ProjectRole } from '../../../shared/roles';
import { apiErrorMessage } from '../core/api-error';
import { AdminApi } from './admin-api';

/** Grants people roles in projects. */
@Component({
  selector: 'mac-memberships-page',
  imports: [FormsModule, MatFormField, MatLabel, MatSelect, MatOption, MatButton],
  template: `
    <section class="section">
      <h2>Grant a role</h2>
      <div class="inline-form">
        <mat-form-field>
          <mat-label>Project</mat-label>
          <mat-select [(ngModel)]="slug" data-testid="membership-project">
            @for (p of projects.value(); track p.slug) {
              <mat-option [value]="p.slug">{{ p.name }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <mat-form-field>
          <mat-label>Person</mat-label>
          <mat-select [(ngModel)]="userId">
            @for (u of users.value(); track u.id) {
              <mat-option [value]="u.id">{{ u.name }} ({{ u.email }})</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <mat-form-field>
          <mat-label>Role</mat-label>
          <mat-select [(ngModel)]="role">
            @for (r of roles; track r) {
              <mat-option [value]="r">{{ label(r) }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <button mat-flat-button (click)="grant()" [disabled]="!slug() || !userId()">Grant</button>
      </div>
    </section>
    @if (slug()) {
      <section class="section">
        <h2>Members of {{ projectName() }}</h2>
        <table class="table">
          <thead>
            <tr>
              <th>Name</th>
              <th>E-mail</th>
              <th>Role</th>
            </tr>
          </thead>
          <tbody>
            @for (m of members.value(); track m.userId) {
              <tr>
                <td>{{ m.name }}</td>
                <td>{{ m.email }}</td>
                <td>{{ label(m.role) }}</td>
              </tr>
            } @empty {
              <tr>
                <td colspan="3" class="muted">No members yet.</td>
              </tr>
            }
          </tbody>
        </table>
      </section>
    }
  `,
  styleUrl: './admin-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MembershipsPage {
  private readonly api = inject(AdminApi);
  private readonly snackBar = inject(MatSnackBar);
  protected readonly roles = PROJECT_ROLES;
  protected readonly slug = signal<string | null>(null);
  protected readonly userId = signal<string | null>(null);
  protected readonly role = signal<ProjectRole>('volunteer');
  protected readonly projects = httpResource<ProjectDetail[]>(() => '/api/admin/projects', {
    defaultValue: [],
  });
  protected readonly users = httpResource<AdminUserView[]>(() => '/api/admin/users', {
    defaultValue: [],
  });
  protected readonly members = httpResource<MemberView[]>(
    () => (this.slug() ? `/api/projects/${this.slug()}/members` : undefined),
    { defaultValue: [] },
  );
  protected readonly projectName = computed(
    () => this.projects.value().find((p) => p.slug === this.slug())?.name ?? '',
  );

  protected label(role: ProjectRole): string {
    return ROLE_LABELS[role];
  }

  protected async grant(): Promise<void> {
    const slug = this.slug();
    const userId = this.userId();
    if (!slug || !userId) return;
    try {
      this.members.set(await this.api.grant(slug, userId, this.role()));
      this.snackBar.open('Role granted.', undefined, { duration: 3000 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
  }
}
