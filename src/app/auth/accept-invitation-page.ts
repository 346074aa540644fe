import { HttpClient, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import type { InvitationPreview, MeResponse } from '../../../shared/auth';
import { ROLE_LABELS } from '../../../shared/roles';
import { apiErrorMessage } from '../core/api-error';
import { AuthStore } from '../core/auth-store';

/** Follows an invitation link: a new person sets name and password; a known one confirms theirs. */
@Component({
  selector: 'mac-accept-invitation-page',
  imports: [
    ReactiveFormsModule,
    MatFormField,
    MatLabel,
    MatError,
    MatHint,
    MatInput,
    MatButton,
    MatProgressBar,
    RouterLink,
  ],
  template: `
    <main class="card">
      <div class="brand"><img src="favicon.svg" alt="" width="36" height="36" />Maculo</div>
      @if (invitation.isLoading()) {
        <mat-progress-bar mode="indeterminate" />
      } @else if (invitation.error()) {
        <h1>This invitation cannot be used</h1>
        <p class="error" role="alert">{{ loadError() }}</p>
        <div class="links"><a routerLink="/sign-in">Go to sign-in</a></div>
      } @else if (invitation.value(); as inv) {
        <h1>Join {{ inv.projectName }}</h1>
        <p class="notice">
          You are invited as <strong>{{ roleLabel() }}</strong> with the address
          <strong>{{ inv.email }}</strong>.
        </p>
        <form [formGroup]="form" (ngSubmit)="accept()">
          @if (!inv.accountExists) {
            <mat-form-field>
              <mat-label>Your name</mat-label>
              <input matInput formControlName="name" autocomplete="name" required />
              <mat-error>Please give your name.</mat-error>
            </mat-form-field>
          }
          <mat-form-field>
            <mat-label>{{
              inv.accountExists ? 'Your current password' : 'Choose a password'
            }}</mat-label>
            <input
              matInput
              formControlName="password"
              type="password"
              [attr.autocomplete]="inv.accountExists ? 'current-password' : 'new-password'"
              required
            />
            @if (!inv.accountExists) {
              <mat-hint>At least 10 characters.</mat-hint>
            }
            <mat-error>{{
              inv.accountExists ? 'Enter your password.' : 'Use at least 10 characters.'
            }}</mat-error>
          </mat-form-field>
          @if (error()) {
            <p class="error" role="alert">{{ error() }}</p>
          }
          <button mat-flat-button type="submit" [disabled]="busy()">Join the project</button>
        </form>
      }
    </main>
  `,
  styleUrl: './auth-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AcceptInvitationPage {
  private readonly http = inject(HttpClient);
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);
  readonly token = input.required<string>();
  protected readonly invitation = httpResource<InvitationPreview>(
    () => `/api/invitations/${this.token()}`,
  );
  protected readonly loadError = computed(() => apiErrorMessage(this.invitation.error()));
  protected readonly roleLabel = computed(() => {
    const role = this.invitation.value()?.role;
    return role ? ROLE_LABELS[role].toLowerCase() : '';
  });
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly form = inject(NonNullableFormBuilder).group({
    name: [''],
    password: ['', Validators.required],
  });

  protected async accept(): Promise<void> {
    const inv = this.invitation.value();
    if (!inv) return;
    const { name, password } = this.form.getRawValue();
    if (!inv.accountExists && (!name.trim() || password.length < 10)) {
      this.form.markAllAsTouched();
      this.error.set(
        !name.trim() ? 'Please give your name.' : 'Use at least 10 characters for a password.',
      );
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    try {
      const me = await firstValueFrom(
        this.http.post<MeResponse>(`/api/invitations/${this.token()}/accept`, {
          name: inv.accountExists ? 'existing account' : name.trim(),
          password,
        }),
      );
      this.auth.adopt(me);
      await this.router.navigate(['/p', inv.projectSlug, 'overview']);
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
