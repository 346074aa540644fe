import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { MeResponse } from '../../../shared/auth';
import type { ProjectRole } from '../../../shared/roles';

/** The signed-in user and their memberships, loaded once and kept in signals. */
@Injectable({ providedIn: 'root' })
export class AuthStore {
  private readonly http = inject(HttpClient);
  private readonly state = signal<MeResponse | null>(null);
  private loading: Promise<MeResponse | null> | null = null;

  readonly me = this.state.asReadonly();
  readonly user = computed(() => this.state()?.user ?? null);
  readonly isAdmin = computed(() => this.state()?.user.isAdmin ?? false);
  readonly memberships = computed(() => this.state()?.memberships ?? []);

  /** Loads the session once (401 means signed out); later calls reuse the answer. */
  ensureLoaded(): Promise<MeResponse | null> {
    this.loading ??= this.refresh();
    return this.loading;
  }

  /** Asks the server again who is signed in. */
  async refresh(): Promise<MeResponse | null> {
    try {
      const me = await firstValueFrom(this.http.get<MeResponse>('/api/auth/me'));
      this.state.set(me);
      return me;
    } catch (err) {
      if (err instanceof HttpErrorResponse && err.status === 401) {
        this.state.set(null);
        return null;
      }
      this.loading = null;
      throw err;
    }
  }

  /** Signs in; throws the HTTP error on failure. */
  async signIn(email: string, password: string): Promise<MeResponse> {
    const me = await firstValueFrom(
      this.http.post<MeResponse>('/api/auth/login', { email, password }),
    );
    this.adopt(me);
    return me;
  }

  /** Takes a session the server has just opened (sign-in, accepted invitation). */
  adopt(me: MeResponse): void {
    this.state.set(me);
    this.loading = Promise.resolve(me);
  }

  /** Signs out on the server and forgets the user here. */
  async signOut(): Promise<void> {
    try {
      await firstValueFrom(this.http.post('/api/auth/logout', {}));
    } finally {
      this.forget();
    }
  }

  /** Forgets the user without asking the server (the session ended elsewhere). */
  forget(): void {
    this.state.set(null);
    this.loading = Promise.resolve(null);
  }

  /** The user's role in a project, or null. */
  roleIn(slug: string): ProjectRole | null {
    return this.memberships().find((m) => m.projectSlug === slug)?.role ?? null;
  }
}
