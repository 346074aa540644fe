import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter, Router } from '@angular/router';
import { SignInPage } from './sign-in-page';

describe('SignInPage', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [SignInPage],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])],
    });
  });

  function fill(root: HTMLElement, email: string, password: string): void {
    const inputs = root.querySelectorAll('input');
    inputs[0]!.value = email;
    inputs[0]!.dispatchEvent(new Event('input'));
    inputs[1]!.value = password;
    inputs[1]!.dispatchEvent(new Event('input'));
  }

  it('should show the server refusal in plain words', async () => {
    const fixture = TestBed.createComponent(SignInPage);
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    fill(root, 'eli@example.org', 'wrong');
    root.querySelector('form')!.dispatchEvent(new Event('submit'));
    TestBed.inject(HttpTestingController)
      .expectOne('/api/auth/login')
      .flush(
        { error: { code: 'invalid_credentials', message: 'Wrong e-mail or password.' } },
        { status: 401, statusText: 'Unauthorized' },
      );
    await fixture.whenStable();
    expect(root.querySelector('[role=alert]')?.textContent).toContain('Wrong e-mail or password.');
  });

  it('should not call the server while the form is incomplete', async () => {
    const fixture = TestBed.createComponent(SignInPage);
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    fill(root, 'not-an-email', '');
    root.querySelector('form')!.dispatchEvent(new Event('submit'));
    TestBed.inject(HttpTestingController).expectNone('/api/auth/login');
  });

  it('should go to the return address after signing in', async () => {
    const fixture = TestBed.createComponent(SignInPage);
    fixture.componentRef.setInput('returnUrl', '/p/kasiri-leopards/team');
    await fixture.whenStable();
    const router = TestBed.inject(Router);
    const navigate = vi.spyOn(router, 'navigateByUrl').mockResolvedValue(true);
    const root = fixture.nativeElement as HTMLElement;
    fill(root, 'eli@example.org', 'a-password');
    root.querySelector('form')!.dispatchEvent(new Event('submit'));
    TestBed.inject(HttpTestingController)
      .expectOne('/api/auth/login')
      .flush({
        user: { id: 'u', email: 'eli@example.org', name: 'Eli', isAdmin: false },
        memberships: [],
      });
    await fixture.whenStable();
    await new Promise((r) => setTimeout(r));
    expect(navigate).toHaveBeenCalledWith('/p/kasiri-leopards/team');
  });
});
