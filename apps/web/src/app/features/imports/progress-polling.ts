import { InjectionToken } from '@angular/core';
import { EMPTY, Observable, catchError, exhaustMap, timer } from 'rxjs';

import type { ImportProgress } from '../../core/api/imports-api';

/** How often the page asks the server how far a long import step got. Tests set it far apart. */
export const PROGRESS_POLL_INTERVAL_MS = new InjectionToken<number>('PROGRESS_POLL_INTERVAL_MS', {
  providedIn: 'root',
  factory: () => 500,
});

/**
 * Runs `request` and, for as long as it is in flight, polls `poll` every `intervalMs` and hands
 * each answer to `onProgress`. The server writes progress from a separate connection, so a poll
 * sees it while the long request is still inside its transaction. A failed poll is skipped: the
 * request itself reports what went wrong.
 */
export function withProgressPolling<T>(
  request: Observable<T>,
  poll: () => Observable<ImportProgress>,
  onProgress: (progress: ImportProgress) => void,
  intervalMs: number,
): Observable<T> {
  return new Observable<T>((subscriber) => {
    const polling = timer(intervalMs, intervalMs)
      .pipe(exhaustMap(() => poll().pipe(catchError(() => EMPTY))))
      .subscribe(onProgress);
    const running = request.subscribe({
      next: (value) => subscriber.next(value),
      error: (error: unknown) => {
        polling.unsubscribe();
        subscriber.error(error);
      },
      complete: () => {
        polling.unsubscribe();
        subscriber.complete();
      },
    });
    return () => {
      polling.unsubscribe();
      running.unsubscribe();
    };
  });
}

const phaseLabels: Record<string, string> = {
  reading: 'Reading the file',
  parsing: 'Reading the file',
  staging: 'Checking the values',
  mapping: 'Applying the column mapping',
  checking: 'Comparing with stored data',
  comparing: 'Comparing with stored data',
  loading: 'Writing readings',
  writing: 'Writing readings',
  inserting: 'Writing readings',
  superseding: 'Replacing conflicting values',
  computing: 'Calculating hourly values',
  hourly: 'Calculating hourly values',
  done: 'Finished',
};

/** The server's phase key in words; unknown keys are shown as they come, made readable. */
export function phaseLabel(phase: string | null | undefined): string {
  if (!phase) return 'Working';
  return phaseLabels[phase] ?? phase.charAt(0).toUpperCase() + phase.slice(1).replace(/[_-]/g, ' ');
}

/** Done as a share of total, 0–100, or null while the total is not known. */
export function progressPercent(progress: ImportProgress | null): number | null {
  if (!progress || progress.total === null || progress.done === null || progress.total <= 0) return null;
  return Math.min(100, Math.max(0, (progress.done / progress.total) * 100));
}

/** "Writing readings: 250 of 1,000" */
export function progressText(progress: ImportProgress | null): string {
  const phase = phaseLabel(progress?.phase);
  if (!progress || progress.total === null || progress.done === null) return `${phase}…`;
  const format = new Intl.NumberFormat('en-GB');
  return `${phase}: ${format.format(progress.done)} of ${format.format(progress.total)}`;
}
