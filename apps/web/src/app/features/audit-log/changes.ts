/** One field that an audited action changed. */
export interface FieldChange {
  field: string;
  /** Display text of the old value; null when the record did not exist before. */
  before: string | null;
  /** Display text of the new value; null when the record no longer exists. */
  after: string | null;
}

function display(value: unknown): string {
  if (value === null || value === undefined) return '—';
  if (typeof value === 'string') return value;
  return JSON.stringify(value);
}

/** Snapshots are normally objects; anything else is shown as a single `value` field. */
function asFields(snapshot: unknown): Record<string, unknown> | null {
  if (snapshot === null || snapshot === undefined) return null;
  if (typeof snapshot === 'object' && !Array.isArray(snapshot)) return snapshot as Record<string, unknown>;
  return { value: snapshot };
}

/**
 * The fields that differ between an audit entry's `before` and `after` snapshots, in field
 * order. A created record lists every field with `before` null; a deleted one every field with
 * `after` null. Inputs are not modified.
 *
 * @example
 * describeChanges({ role: 'manager', name: 'A' }, { role: 'officer', name: 'A' })
 * //=> [{ field: 'role', before: 'manager', after: 'officer' }]
 */
export function describeChanges(beforeSnapshot: unknown, afterSnapshot: unknown): FieldChange[] {
  const before = asFields(beforeSnapshot);
  const after = asFields(afterSnapshot);
  const fields = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])].sort();
  const changes: FieldChange[] = [];
  for (const field of fields) {
    const oldText = before ? display(before[field]) : null;
    const newText = after ? display(after[field]) : null;
    if (oldText !== newText) changes.push({ field, before: oldText, after: newText });
  }
  return changes;
}
