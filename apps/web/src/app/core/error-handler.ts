import { HttpErrorResponse, HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router } from '@angular/router';
import { catchError, throwError } from 'rxjs';

import { ERRORS_HANDLED_BY_CALLER, ERROR_MESSAGE_SHOWN_BY_CALLER, apiErrorMessage } from './api/api-error';
import { Auth } from './auth/auth';

/**
 * One place where failed API calls become something a person sees: the envelope's message in
 * a snackbar, or — when the session has ended (401) — the sign-in page, which brings them back.
 * Requests marked with ERRORS_HANDLED_BY_CALLER are left to their caller; those marked with
 * ERROR_MESSAGE_SHOWN_BY_CALLER get no snackbar (their caller shows the message).
 */
export const errorInterceptor: HttpInterceptorFn = (request, next) => {
  const snackBar = inject(MatSnackBar);
  const router = inject(Router);
  const auth = inject(Auth);

  return next(request).pipe(
    catchError((error: unknown) => {
      if (!(error instanceof HttpErrorResponse) || request.context.get(ERRORS_HANDLED_BY_CALLER)) {
        return throwError(() => error);
      }
      if (error.status === 401) {
        auth.forgetSession();
        if (!router.url.startsWith('/sign-in')) {
          snackBar.open('Your session has ended. Please sign in again.', 'Close', { duration: 6000 });
          void router.navigate(['/sign-in'], { queryParams: { returnUrl: router.url } });
        }
      } else if (!request.context.get(ERROR_MESSAGE_SHOWN_BY_CALLER)) {
        snackBar.open(apiErrorMessage(error), 'Close', { duration: 8000, panelClass: 'error-snackbar' });
      }
      return throwError(() => error);
    }),
  );
};
