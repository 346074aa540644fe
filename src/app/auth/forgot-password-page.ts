import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { apiErrorMessage } from '../core/api-error';

/** Asks for a reset link; the answer is the same whether or not the address has an account. */
@Component({
  selector: 'mac-forgot-password-page',
  imports: [ReactiveFormsModule, MatFormField, MatLabel, MatError, MatInput, MatButton, RouterLink],
  template: `
    <main class="card">
      <div class="brand"><img src="favicon.svg" alt="" width="36" height="36" />Maculo</div>
      <h1>Reset your password</h1>
      @if (sent()) {
        <p class="notice" role="status">{{ sent() }}</p>
      } @else {
        <form [formGroup]="form" (ngSubmit)="send()">
          <mat-form-field>
            <mat-label>E-mail</mat-label>
            <input matInput formControlName="email" type="email" autocomplete="username" required />
            <mat-error>Enter the e-mail address of your account.</mat-error>
          </mat-form-field>
          @if (error()) {
            <p class="error" role="alert">{{ error() }}</p>
          }
          <button mat-flat-button type="submit" [disabled]="busy()">Send me a link</button>
        </form>
      }
      <div class="links"><a routerLink="/sign-in">Back to sign-in</a></div>
    </main>
  `,
  styleUrl: './auth-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ForgotPasswordPage {
  private readonly http = inject(HttpClient);
  protected readonly busy = signal(false);
  protected readonly sent = signal<string | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email]],
  });

  protected async send(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    try {
      const res = await firstValueFrom(
        this.http.post<{ message: string }>('/api/auth/password-reset', this.form.getRawValue()),
      );
      this.sent.set(res.message);
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
