/**
 * What happens when the readings of some channels change (an import is committed or rolled back,
 * a correction is made). The hourly-results work fills this in: recompute hourly_values and
 * limit_hourly_values for the affected hours. It runs inside the same transaction as the change,
 * so derived values commit or roll back with the readings they come from.
 */
import type { Knex } from 'knex';
import { type KnownReadings, type RecomputeWrites, planRecompute, recomputeForReadings, storeRecompute } from '../results/results.service';

export type { KnownReadings } from '../results/results.service';

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

/** The work of `onReadingsChanged` split in three, for a writer that knows the new readings. */
export interface PreparedReadingsChange {
  /** CPU only (no database): call it while the database writes the readings. */
  compute(): void;
  /** Writes what `compute` produced (computing first if it was not called). */
  store(): Promise<void>;
}

/**
 * `onReadingsChanged` for a writer that holds the complete current readings of the changed
 * channels within the change's whole hours (`known`): it reads what the results depend on now,
 * under the stack's readings lock, so the hours can be computed while the readings are inserted
 * and stored after them. Everything still runs in the change's transaction.
 */
export async function prepareReadingsChange(ctx: ReadingsChangeContext, change: ReadingsChange, known: KnownReadings): Promise<PreparedReadingsChange> {
  const scope = { tenantId: ctx.tenantId, db: ctx.db };
  const plan = await planRecompute(scope, change, known);
  let writes: RecomputeWrites | null = null;
  return {
    compute: () => {
      writes ??= plan.compute();
    },
    store: async () => {
      writes ??= plan.compute();
      await storeRecompute(scope, writes);
    },
  };
}
