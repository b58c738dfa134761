/**
 * Conversions between PostgreSQL row values and the API's JSON values, shared by the set-up
 * modules (sites, units, stacks, channels, fuels, permits). node-postgres returns `numeric` as a
 * string (to keep precision), `date` as a local-midnight Date and `timestamptz` as a Date.
 */

/** `numeric` column → number (null stays null). */
export function toNumber(value: unknown): number | null {
  if (value === null || value === undefined) return null;
  const n = typeof value === 'number' ? value : Number(value);
  return Number.isFinite(n) ? n : null;
}

/** `date` column → 'YYYY-MM-DD'. pg parses a date as local midnight, so read it back in local time. */
export function toDateOnly(value: unknown): string | null {
  if (value === null || value === undefined) return null;
  if (typeof value === 'string') return value.slice(0, 10);
  if (value instanceof Date) {
    const y = value.getFullYear();
    const m = String(value.getMonth() + 1).padStart(2, '0');
    const d = String(value.getDate()).padStart(2, '0');
    return `${y}-${m}-${d}`;
  }
  throw new TypeError(`not a date: ${String(value)}`);
}

/** `timestamptz` column → ISO 8601 string in UTC. */
export function toIso(value: unknown): string | null {
  if (value === null || value === undefined) return null;
  if (value instanceof Date) return value.toISOString();
  return new Date(String(value)).toISOString();
}

/** Like toIso for a NOT NULL column. */
export function toIsoRequired(value: unknown): string {
  const iso = toIso(value);
  if (iso === null) throw new TypeError('timestamp expected');
  return iso;
}
