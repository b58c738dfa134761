/**
 * The list with `saved` in place of the item of the same id, or added at the end when it is
 * new: how a table of child records takes in what a dialog saved. The list is not changed.
 */
export function upsertById<T extends { id: string }>(items: readonly T[], saved: T): T[] {
  return items.some((item) => item.id === saved.id)
    ? items.map((item) => (item.id === saved.id ? saved : item))
    : [...items, saved];
}
