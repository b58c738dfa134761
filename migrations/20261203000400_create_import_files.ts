import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// The uploaded file itself: an import can be read again (another timestamp column, another
// interval convention) and every stored reading can be traced to the exact bytes it came from.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create table import_files (
      import_id uuid primary key,
      tenant_id uuid not null,
      content bytea not null,
      foreign key (tenant_id, import_id) references imports (tenant_id, id) on delete cascade
    )
  `);
  await knex.raw("alter table import_files alter column content set storage external");
  await enableTenantRls(knex, 'import_files');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop table if exists import_files');
}
