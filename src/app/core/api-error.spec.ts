import { HttpErrorResponse } from '@angular/common/http';
import { apiErrorCode, apiErrorDetails, apiErrorMessage } from './api-error';

describe('api errors', () => {
  it('should show the server message of an API error', () => {
    const err = new HttpErrorResponse({
      status: 401,
      error: { error: { code: 'invalid_credentials', message: 'Wrong e-mail or password.' } },
    });
    expect(apiErrorMessage(err)).toBe('Wrong e-mail or password.');
    expect(apiErrorCode(err)).toBe('invalid_credentials');
  });

  it('should explain a network failure', () => {
    expect(apiErrorMessage(new HttpErrorResponse({ status: 0 }))).toMatch(/cannot be reached/);
  });

  it('should fall back to a generic sentence for other errors', () => {
    expect(apiErrorMessage(new HttpErrorResponse({ status: 502, error: '<html>' }))).toBe(
      'Something went wrong. Please try again.',
    );
    expect(apiErrorCode(new HttpErrorResponse({ status: 502 }))).toBeNull();
  });

  it('should list field problems of a validation error', () => {
    const err = new HttpErrorResponse({
      status: 400,
      error: {
        error: {
          code: 'validation_failed',
          message: 'email: This is not a valid e-mail address.',
          details: {
            request: [
              { path: 'email', message: 'This is not a valid e-mail address.' },
              { path: '(body)', message: 'Unknown field: x.' },
            ],
          },
        },
      },
    });
    expect(apiErrorDetails(err)).toEqual([
      'email: This is not a valid e-mail address.',
      'Unknown field: x.',
    ]);
  });
});
