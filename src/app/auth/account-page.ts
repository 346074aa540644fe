import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCard, MatCardContent, MatCardHeader, MatCardTitle } from '@angular/material/card';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatSnackBar } from '@angular/material/snack-bar';
import { firstValueFrom } from 'rxjs';
import { apiErrorMessage } from '../core/api-error';
import { AuthStore } from '../core/auth-store';

/** The signed-in person's account: who they are, and changing the password. */
@Component({
  selector: 'mac-account-page',
  imports: [
    ReactiveFormsModule,
    MatCard,
    MatCardHeader,
    MatCardTitle,
    MatCardContent,
    MatFormField,
    MatLabel,
    MatError,
    MatHint,
    MatInput,
    MatButton,
  ],
  template: `
    <div class="page">
      <h1 class="page-title">Your account</h1>
      <mat-card appearance="outlined">
        <mat-card-header
          ><mat-card-title>{{ auth.user()?.name }}</mat-card-title></mat-card-header
        >
        <mat-card-content>
          <p class="muted">{{ auth.user()?.email }}</p>
          <h2>Change password</h2>
          <form [formGroup]="form" (ngSubmit)="changePassword()" class="form">
            <mat-form-field>
              <mat-label>Current password</mat-label>
              <input
                matInput
                type="password"
                formControlName="currentPassword"
                autocomplete="current-password"
              />
              <mat-error>Enter your current password.</mat-error>
            </mat-form-field>
            <mat-form-field>
              <mat-label>New password</mat-label>
              <input
                matInput
                type="password"
                formControlName="newPassword"
                autocomplete="new-password"
              />
              <mat-hint
                >At least 10 characters. Other signed-in devices will be signed out.</mat-hint
              >
              <mat-error>Use at least 10 characters.</mat-error>
            </mat-form-field>
            @if (error()) {
              <p class="error" role="alert">{{ error() }}</p>
            }
            <div>
              <button mat-flat-button type="submit" [disabled]="busy()">Change password</button>
            </div>
          </form>
        </mat-card-content>
      </mat-card>
    </div>
  `,
  styles: `
    .form {
      display: flex;
      flex-direction: column;
      gap: 12px;
      max-width: 420px;
    }
    .error {
      color: var(--mat-sys-error);
    }
    mat-card {
      max-width: 640px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AccountPage {
  private readonly http = inject(HttpClient);
  private readonly snackBar = inject(MatSnackBar);
  protected readonly auth = inject(AuthStore);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly form = inject(NonNullableFormBuilder).group({
    currentPassword: ['', Validators.required],
    newPassword: ['', [Validators.required, Validators.minLength(10)]],
  });

  protected async changePassword(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    try {
      await firstValueFrom(this.http.post('/api/auth/password', this.form.getRawValue()));
      this.form.reset();
      this.snackBar.open('Your password is changed.', undefined, { duration: 4000 });
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
