import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// Staging of an import that is not committed yet: the parsed file as a few byte strings — part 0
// the row fields (times, row numbers, statuses), part k the k-th value column of imports.columns
// (format: apps/api/src/modules/imports/imports.copy.ts, "the staged file"). It replaces one
// import_rows row per file row: a month of one-minute data for eight channels is nine rows of
// 3.4 MB together instead of 44,640 rows, written in one statement and read back without
// parsing, and the commit and the preview take the values from it as arrays.
//
// UNLOGGED like import_rows: it can always be rebuilt from import_files, which the service does
// when it finds it empty (PostgreSQL empties unlogged tables after a crash). Stored EXTERNAL (out
// of line, not compressed): the doubles of measured values barely compress, and trying costs time.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create unlogged table import_columns (
      tenant_id uuid not null,
      import_id uuid not null,
      part integer not null check (part >= 0),
      content bytea not null,
      primary key (tenant_id, import_id, part)
    )
  `);
  await knex.raw('alter table import_columns alter column content set storage external');
  await enableTenantRls(knex, 'import_columns', { index: false });
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop table if exists import_columns');
}
