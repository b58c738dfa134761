import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// Every problem found in a file: row, column, the value as written, and why it is not imported.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create table import_problems (
      tenant_id uuid not null,
      import_id uuid not null,
      row_number integer not null,
      column_index integer not null,
      column_label text not null,
      value text not null,
      code text not null,
      reason text not null,
      foreign key (tenant_id, import_id) references imports (tenant_id, id) on delete cascade
    )
  `);
  await knex.raw('create index import_problems_import_idx on import_problems (import_id, row_number, column_index)');
  await enableTenantRls(knex, 'import_problems');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop table if exists import_problems');
}
