import { Signal, computed, inject } from '@angular/core';

import { Auth } from '../core/auth/auth';

/**
 * Whether the signed-in person may change set-up records (`site:write`); everyone else reads
 * them. Call it in an injection context (a field initialiser). The API checks again on every
 * request: this only decides which controls to show.
 */
export function canEditSetup(): Signal<boolean> {
  const auth = inject(Auth);
  return computed(() => auth.me()?.permissions.includes('site:write') ?? false);
}
