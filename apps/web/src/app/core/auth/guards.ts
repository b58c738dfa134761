import { inject } from '@angular/core';
import { CanActivateFn, Router } from '@angular/router';
import { MatSnackBar } from '@angular/material/snack-bar';

import { Permission } from '../api/auth-api';
import { Auth } from './auth';

/** Signed-out visitors go to the sign-in page, which brings them back afterwards. */
export const authGuard: CanActivateFn = (_route, state) => {
  const auth = inject(Auth);
  if (auth.signedIn()) return true;
  return inject(Router).createUrlTree(['/sign-in'], { queryParams: { returnUrl: state.url } });
};

/** The sign-in page is only for signed-out visitors. */
export const signedOutGuard: CanActivateFn = () => {
  const auth = inject(Auth);
  return auth.signedIn() ? inject(Router).createUrlTree(['/overview']) : true;
};

/**
 * Lets the route open only when the active role holds `permission`. The API enforces the same
 * map; this guard only spares people a page that would answer 403.
 */
export function permissionGuard(permission: Permission): CanActivateFn {
  return () => {
    const auth = inject(Auth);
    if (auth.can(permission)) return true;
    const organisation = auth.me()?.organisation.name ?? 'this organisation';
    inject(MatSnackBar).open(`Your role in ${organisation} does not include that page.`, 'Close', {
      duration: 6000,
    });
    return inject(Router).createUrlTree(['/overview']);
  };
}

/**
 * Accepts only an in-app path as the place to return to after sign-in, so a crafted link
 * cannot send someone to another site.
 */
export function safeReturnUrl(returnUrl: string | null | undefined): string {
  if (!returnUrl || !returnUrl.startsWith('/') || returnUrl.startsWith('//') || returnUrl.includes('\\')) {
    return '/overview';
  }
  if (returnUrl.startsWith('/sign-in')) return '/overview';
  return returnUrl;
}
