import type { Knex } from 'knex';

// Readings take their ids from their identity sequence a block at a time (a backend-local cache
// of 1,000 values) instead of one shared-sequence call per row: for an import of a month of
// one-minute data for eight channels (357,120 readings) the per-row nextval was about a tenth of
// the INSERTs' time.
//
// Ids order the versions of one reading (drilldown: `order by t, id`). A cache on its own would
// break that: a session keeps the rest of its block after its transaction, and a later write from
// that session could take ids below those another session wrote in between. Every writer of
// readings therefore drops its cached values (DISCARD SEQUENCES) right after taking the stack's
// readings lock (readings.store.ts lockStackReadings): its first id comes from a fresh block,
// above every id handed out before, by any session, to any earlier holder of that lock.
export async function up(knex: Knex): Promise<void> {
  await knex.raw('alter table readings alter column id set cache 1000');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('alter table readings alter column id set cache 1');
}
