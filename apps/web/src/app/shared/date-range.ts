import { AbstractControl, ValidationErrors } from '@angular/forms';

/** The end of a date range must not come before its start (both 'YYYY-MM-DD'). */
export function datesInOrder(fromKey: string, toKey: string, message: string) {
  return (group: AbstractControl): ValidationErrors | null => {
    const from = group.get(fromKey)?.value as string | undefined;
    const toControl = group.get(toKey);
    const to = toControl?.value as string | undefined;
    const wrong = Boolean(from && to && to < from);
    if (toControl) {
      const { order: _previous, ...others } = toControl.errors ?? {};
      const next = wrong ? { ...others, order: message } : others;
      toControl.setErrors(Object.keys(next).length ? next : null, { emitEvent: false });
    }
    return wrong ? { order: message } : null;
  };
}
