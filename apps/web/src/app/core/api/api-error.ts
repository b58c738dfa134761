import { HttpContext, HttpContextToken, HttpErrorResponse } from '@angular/common/http';

/** The API's one error envelope (see DESIGN.md §6). */
export interface ApiErrorBody {
  error: { code: string; message: string; details?: unknown };
}

/**
 * Marks a request whose caller shows its own errors (the sign-in form, the session probe at
 * start-up), so the global error interceptor neither shows a snackbar nor redirects.
 */
export const ERRORS_HANDLED_BY_CALLER = new HttpContextToken<boolean>(() => false);

export function handledByCaller(): HttpContext {
  return new HttpContext().set(ERRORS_HANDLED_BY_CALLER, true);
}

/**
 * Marks a request whose caller shows the error's message itself, next to what failed (the file
 * upload): the global error interceptor shows no snackbar with the same words, but still sends a
 * person whose session has ended to sign-in.
 */
export const ERROR_MESSAGE_SHOWN_BY_CALLER = new HttpContextToken<boolean>(() => false);

export function messageShownByCaller(): HttpContext {
  return new HttpContext().set(ERROR_MESSAGE_SHOWN_BY_CALLER, true);
}

function isApiErrorBody(body: unknown): body is ApiErrorBody {
  if (typeof body !== 'object' || body === null || !('error' in body)) return false;
  const error = (body as { error: unknown }).error;
  return (
    typeof error === 'object' &&
    error !== null &&
    typeof (error as { message?: unknown }).message === 'string' &&
    typeof (error as { code?: unknown }).code === 'string'
  );
}

/** A sentence a person can act on, for any failed request. */
export function apiErrorMessage(response: HttpErrorResponse): string {
  if (response.status === 0) {
    return 'The FlueLedger server cannot be reached. Check your connection and try again.';
  }
  if (isApiErrorBody(response.error)) return response.error.error.message;
  if (response.status >= 500) return 'The server ran into a problem. Please try again in a moment.';
  return `The request failed (HTTP ${response.status}).`;
}

/** The envelope's machine-readable code, when the server sent one. */
export function apiErrorCode(response: HttpErrorResponse): string | undefined {
  return isApiErrorBody(response.error) ? response.error.error.code : undefined;
}
