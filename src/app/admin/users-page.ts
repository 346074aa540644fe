import { DatePipe } from '@angular/common';
import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSlideToggle } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { AdminUserView } from '../../../shared/admin';
import { apiErrorMessage } from '../core/api-error';
import { AuthStore } from '../core/auth-store';
import { AdminApi } from './admin-api';

/** Accounts: create, make admin, disable. */
@Component({
  selector: 'mac-users-page',
  imports: [
    ReactiveFormsModule,
    DatePipe,
    MatFormField,
    MatLabel,
    MatHint,
    MatError,
    MatInput,
    MatCheckbox,
    MatButton,
    MatSlideToggle,
    MatProgressBar,
  ],
  templateUrl: './users-page.html',
  styleUrl: './admin-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UsersPage {
  private readonly api = inject(AdminApi);
  private readonly snackBar = inject(MatSnackBar);
  protected readonly me = inject(AuthStore).user;
  protected readonly users = httpResource<AdminUserView[]>(() => '/api/admin/users', {
    defaultValue: [],
  });
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email]],
    name: ['', Validators.required],
    isAdmin: [false],
  });

  protected async create(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    try {
      const user = await this.api.createUser(this.form.getRawValue());
      this.form.reset({ email: '', name: '', isAdmin: false });
      this.users.reload();
      this.snackBar.open(
        `Account created; ${user.email} gets an e-mail to choose a password.`,
        undefined,
        {
          duration: 5000,
        },
      );
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }

  protected async setDisabled(user: AdminUserView, disabled: boolean): Promise<void> {
    await this.patch(
      user,
      { disabled },
      disabled ? `${user.name} is disabled and signed out.` : `${user.name} can sign in again.`,
    );
  }

  protected async setAdmin(user: AdminUserView, isAdmin: boolean): Promise<void> {
    await this.patch(
      user,
      { isAdmin },
      isAdmin
        ? `${user.name} is now an administrator.`
        : `${user.name} is no longer an administrator.`,
    );
  }

  protected memberships(user: AdminUserView): string {
    return user.memberships.map((m) => `${m.projectSlug} (${m.role})`).join(', ') || '—';
  }

  private async patch(
    user: AdminUserView,
    patch: { disabled?: boolean; isAdmin?: boolean },
    done: string,
  ) {
    try {
      await this.api.updateUser(user.id, patch);
      this.snackBar.open(done, undefined, { duration: 3000 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
    this.users.reload();
  }
}
