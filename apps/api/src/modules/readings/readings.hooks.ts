/**
 * What happens when the readings of some channels change (an import is committed or rolled back,
 * a correction is made). The hourly-results work fills this in: recompute hourly_values and
 * limit_hourly_values for the affected hours. It runs inside the same transaction as the change,
 * so derived values commit or roll back with the readings they come from.
 */
import type { Knex } from 'knex';
import { recomputeForReadings } from '../results/results.service';

export interface ReadingsChangeContext {
  tenantId: string;
  userId: string;
  requestId?: string;
  /** The transaction of the change (row-level security scoped to the tenant). */
  db: Knex.Transaction;
}

export interface ReadingsChange {
  channelIds: string[];
  /** Start of the first affected interval (UTC). */
  from: Date;
  /** End (exclusive) of the last affected interval (UTC). */
  to: Date;
}

export async function onReadingsChanged(ctx: ReadingsChangeContext, change: ReadingsChange): Promise<void> {
  // Hourly values of the changed channels, then of every limit reading them (modules/results).
  await recomputeForReadings({ tenantId: ctx.tenantId, db: ctx.db }, change);
}
