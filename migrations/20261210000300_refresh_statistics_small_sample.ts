import type { Knex } from 'knex';

// refresh_statistics (20261209000100) analyses a bulk-loaded table inside the loading transaction
// so that the next statements, and the next import's comparison, are not planned as if the month
// were empty. That ANALYZE only has to give the planner the table's size and a rough picture:
// the load's own changes count towards autovacuum's threshold once the transaction commits, and
// autovacuum then analyses the table again with the full default sample (seen after every month
// import in the import benchmark, within a minute). A statistics target of 10 samples 3,000 rows
// instead of 30,000: for a freshly loaded month of one-minute data for eight channels (357,120
// readings) the ANALYZE takes about 20 ms instead of 110–130 ms. The setting is the function's
// own (SET clause), so it ends with the call and changes nothing else in the transaction.
export async function up(knex: Knex): Promise<void> {
  await knex.raw('alter function refresh_statistics(text, bigint) set default_statistics_target = 10');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('alter function refresh_statistics(text, bigint) reset default_statistics_target');
}
