import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { MeResponse } from '../../../shared/auth';
import { AuthStore } from './auth-store';

const ME: MeResponse = {
  user: { id: 'u1', email: 'eli@example.org', name: 'Eli', isAdmin: false },
  memberships: [{ projectSlug: 'kasiri-leopards', role: 'curator' }],
};

describe('AuthStore', () => {
  let store: AuthStore;
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting()],
    });
    store = TestBed.inject(AuthStore);
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  it('should load the session once and know the role per project', async () => {
    const first = store.ensureLoaded();
    const second = store.ensureLoaded();
    http.expectOne('/api/auth/me').flush(ME);
    expect(await first).toEqual(ME);
    expect(await second).toEqual(ME);
    expect(store.roleIn('kasiri-leopards')).toBe('curator');
    expect(store.roleIn('other')).toBeNull();
  });

  it('should treat 401 as signed out', async () => {
    const loaded = store.ensureLoaded();
    http
      .expectOne('/api/auth/me')
      .flush(
        { error: { code: 'unauthenticated', message: 'x' } },
        { status: 401, statusText: 'Unauthorized' },
      );
    expect(await loaded).toBeNull();
    expect(store.user()).toBeNull();
  });

  it('should sign in and out through the API', async () => {
    const signingIn = store.signIn('eli@example.org', 'pw');
    const login = http.expectOne('/api/auth/login');
    expect(login.request.body).toEqual({ email: 'eli@example.org', password: 'pw' });
    login.flush(ME);
    await signingIn;
    expect(store.user()?.name).toBe('Eli');
    const out = store.signOut();
    http.expectOne('/api/auth/logout').flush(null, { status: 204, statusText: 'No Content' });
    await out;
    expect(store.user()).toBeNull();
  });
});
