import { HttpErrorResponse } from '@angular/common/http';
import { ErrorHandler, Injectable, inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { apiErrorMessage } from './api-error';

/** Unhandled errors: the user sees the ones they can act on; all go to the console. */
@Injectable()
export class AppErrorHandler implements ErrorHandler {
  private readonly snackBar = inject(MatSnackBar);

  handleError(error: unknown): void {
    console.error(error);
    const cause = error instanceof Error && error.cause ? error.cause : error;
    if (cause instanceof HttpErrorResponse && cause.status !== 401) {
      this.snackBar.open(apiErrorMessage(cause), 'Dismiss', { duration: 8000 });
    }
  }
}
