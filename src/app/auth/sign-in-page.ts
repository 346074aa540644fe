import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { apiErrorMessage } from '../core/api-error';
import { AuthStore } from '../core/auth-store';

/** E-mail and password; one generic answer when either is wrong. */
@Component({
  selector: 'mac-sign-in-page',
  imports: [
    ReactiveFormsModule,
    MatFormField,
    MatLabel,
    MatError,
    MatInput,
    MatButton,
    MatProgressBar,
    RouterLink,
  ],
  template: `
    <main class="card">
      <div class="brand"><img src="favicon.svg" alt="" width="36" height="36" />Maculo</div>
      <p class="muted notice">Camera-trap photo identification and population estimates.</p>
      <h1>Sign in</h1>
      @if (expired()) {
        <p class="notice">Your session has ended. Please sign in again.</p>
      }
      <form [formGroup]="form" (ngSubmit)="signIn()">
        <mat-form-field>
          <mat-label>E-mail</mat-label>
          <input matInput formControlName="email" type="email" autocomplete="username" required />
          <mat-error>Enter your e-mail address.</mat-error>
        </mat-form-field>
        <mat-form-field>
          <mat-label>Password</mat-label>
          <input
            matInput
            formControlName="password"
            type="password"
            autocomplete="current-password"
            required
          />
          <mat-error>Enter your password.</mat-error>
        </mat-form-field>
        @if (error()) {
          <p class="error" role="alert">{{ error() }}</p>
        }
        @if (busy()) {
          <mat-progress-bar mode="indeterminate" />
        }
        <button mat-flat-button type="submit" [disabled]="busy()">Sign in</button>
      </form>
      <div class="links">
        <a routerLink="/forgot-password">Forgot your password?</a>
      </div>
    </main>
  `,
  styleUrl: './auth-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignInPage {
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);
  readonly returnUrl = input<string>();
  readonly expired = input<string>();
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email]],
    password: ['', Validators.required],
  });

  protected async signIn(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    try {
      const { email, password } = this.form.getRawValue();
      await this.auth.signIn(email, password);
      const target = this.returnUrl();
      await this.router.navigateByUrl(
        target && target.startsWith('/') && !target.startsWith('//') ? target : '/',
      );
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
