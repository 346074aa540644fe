import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { apiErrorMessage } from '../core/api-error';

/** Sets a new password from an e-mailed, single-use link. */
@Component({
  selector: 'mac-reset-password-page',
  imports: [
    ReactiveFormsModule,
    MatFormField,
    MatLabel,
    MatError,
    MatHint,
    MatInput,
    MatButton,
    RouterLink,
  ],
  template: `
    <main class="card">
      <div class="brand"><img src="favicon.svg" alt="" width="36" height="36" />Maculo</div>
      <h1>Choose a new password</h1>
      @if (done()) {
        <p class="notice" role="status">Your password is set. You can sign in with it now.</p>
        <a mat-flat-button routerLink="/sign-in">Sign in</a>
      } @else {
        <form [formGroup]="form" (ngSubmit)="save()">
          <mat-form-field>
            <mat-label>New password</mat-label>
            <input
              matInput
              formControlName="newPassword"
              type="password"
              autocomplete="new-password"
              required
            />
            <mat-hint>At least 10 characters; a few unrelated words make a good one.</mat-hint>
            <mat-error>Use at least 10 characters.</mat-error>
          </mat-form-field>
          @if (error()) {
            <p class="error" role="alert">{{ error() }}</p>
          }
          <button mat-flat-button type="submit" [disabled]="busy()">Save password</button>
        </form>
      }
    </main>
  `,
  styleUrl: './auth-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResetPasswordPage {
  private readonly http = inject(HttpClient);
  readonly token = input.required<string>();
  protected readonly busy = signal(false);
  protected readonly done = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly form = inject(NonNullableFormBuilder).group({
    newPassword: ['', [Validators.required, Validators.minLength(10)]],
  });

  protected async save(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    try {
      await firstValueFrom(
        this.http.post('/api/auth/password-reset/confirm', {
          token: this.token(),
          ...this.form.getRawValue(),
        }),
      );
      this.done.set(true);
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
