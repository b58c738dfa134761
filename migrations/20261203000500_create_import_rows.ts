import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// Staging: the parsed rows of an import not yet committed, one row per file row with its values
// in column order (vals[k] = k-th value column of imports.columns). UNLOGGED: it is loaded by COPY
// without write-ahead logging and can always be rebuilt from import_files, which the service does
// when it finds it empty (PostgreSQL empties unlogged tables after a crash).
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create unlogged table import_rows (
      tenant_id uuid not null,
      import_id uuid not null,
      row_number integer not null,
      t timestamptz,
      status text not null,
      vals double precision[] not null,
      primary key (tenant_id, import_id, row_number)
    )
  `);
  await enableTenantRls(knex, 'import_rows', { index: false });
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop table if exists import_rows');
}
