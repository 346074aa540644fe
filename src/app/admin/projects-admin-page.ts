import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { ProjectDetail } from '../../../shared/projects';
import { apiErrorDetails, apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { AdminApi } from './admin-api';

/** All projects; create a new one. Settings are edited on each project's settings page. */
@Component({
  selector: 'mac-projects-admin-page',
  imports: [
    ReactiveFormsModule,
    MatFormField,
    MatLabel,
    MatHint,
    MatError,
    MatInput,
    MatButton,
    RouterLink,
  ],
  template: `
    <section class="section">
      <h2>New project</h2>
      <form [formGroup]="form" (ngSubmit)="create()" class="form-grid">
        <mat-form-field>
          <mat-label>Name</mat-label>
          <input matInput formControlName="name" />
        </mat-form-field>
        <mat-form-field>
          <mat-label>Slug (used in addresses)</mat-label>
          <input matInput formControlName="slug" />
          <mat-hint>lowercase letters, digits, hyphens</mat-hint>
        </mat-form-field>
        <mat-form-field>
          <mat-label>Target species (scientific)</mat-label>
          <input matInput formControlName="targetSpeciesScientific" />
        </mat-form-field>
        <mat-form-field>
          <mat-label>Target species (common)</mat-label>
          <input matInput formControlName="targetSpeciesCommon" />
        </mat-form-field>
        <mat-form-field>
          <mat-label>Time zone</mat-label>
          <input matInput formControlName="timezone" />
        </mat-form-field>
        <mat-form-field>
          <mat-label>Code prefix</mat-label>
          <input matInput formControlName="codePrefix" />
          <mat-error>1–6 capital letters</mat-error>
        </mat-form-field>
        <div><button mat-flat-button type="submit" [disabled]="busy()">Create project</button></div>
      </form>
      @for (e of errors(); track e) {
        <p class="error" role="alert">{{ e }}</p>
      }
    </section>
    <section class="section">
      <h2>Projects</h2>
      <table class="table" data-testid="admin-projects">
        <thead>
          <tr>
            <th>Name</th>
            <th>Slug</th>
            <th>Species</th>
            <th>Members</th>
            <th>Sensitivity</th>
            <th></th>
          </tr>
        </thead>
        <tbody>
          @for (p of projects.value(); track p.slug) {
            <tr>
              <td>{{ p.name }}</td>
              <td>{{ p.slug }}</td>
              <td>
                <em>{{ p.targetSpeciesScientific }}</em>
              </td>
              <td>{{ p.members }}</td>
              <td>{{ p.sensitivity }}</td>
              <td>
                <a [routerLink]="['/p', p.slug, 'settings']">Settings</a> ·
                <a [routerLink]="['/p', p.slug, 'team']">Team</a>
              </td>
            </tr>
          } @empty {
            <tr>
              <td colspan="6" class="muted">No projects yet.</td>
            </tr>
          }
        </tbody>
      </table>
    </section>
  `,
  styleUrl: './admin-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectsAdminPage {
  private readonly api = inject(AdminApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly store = inject(ProjectStore);
  protected readonly projects = httpResource<(ProjectDetail & { members: number })[]>(
    () => '/api/admin/projects',
    {
      defaultValue: [],
    },
  );
  protected readonly busy = signal(false);
  protected readonly errors = signal<string[]>([]);
  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', Validators.required],
    slug: ['', Validators.required],
    targetSpeciesScientific: ['', Validators.required],
    targetSpeciesCommon: ['', Validators.required],
    timezone: ['UTC', Validators.required],
    codePrefix: ['', [Validators.required, Validators.pattern(/^[A-Z]{1,6}$/)]],
  });

  protected async create(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.errors.set([]);
    try {
      const project = await this.api.createProject(this.form.getRawValue());
      this.form.reset({ timezone: 'UTC' });
      this.projects.reload();
      void this.store.loadList();
      this.snackBar.open(
        `Project ${project.name} created. Add people under Memberships.`,
        undefined,
        { duration: 5000 },
      );
    } catch (err) {
      const details = apiErrorDetails(err);
      this.errors.set(details.length ? details : [apiErrorMessage(err)]);
    } finally {
      this.busy.set(false);
    }
  }
}
