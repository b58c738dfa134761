/**
 * The names of the records with these ids, in the order of the ids and joined for reading
 * ("Boiler 1, Boiler 2"); ids of records not among `records` (archived, say) are left out.
 */
export function namesOf(ids: readonly string[], records: readonly { id: string; name: string }[]): string {
  const names = new Map(records.map((record) => [record.id, record.name]));
  return ids
    .map((id) => names.get(id) ?? '')
    .filter(Boolean)
    .join(', ');
}
