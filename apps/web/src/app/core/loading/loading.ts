import { HttpInterceptorFn } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { finalize } from 'rxjs';

/** Counts HTTP requests in flight so one global progress bar can show that work is going on. */
@Injectable({ providedIn: 'root' })
export class Loading {
  private readonly inFlight = signal(0);

  readonly active = computed(() => this.inFlight() > 0);

  started(): void {
    this.inFlight.update((count) => count + 1);
  }

  finished(): void {
    this.inFlight.update((count) => Math.max(0, count - 1));
  }
}

export const loadingInterceptor: HttpInterceptorFn = (request, next) => {
  const loading = inject(Loading);
  loading.started();
  // finalize also runs on error and on unsubscribe (a cancelled request).
  return next(request).pipe(finalize(() => loading.finished()));
};
