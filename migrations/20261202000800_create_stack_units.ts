import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// The emission units that exhaust through a stack.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE stack_units (
      tenant_id uuid NOT NULL,
      stack_id uuid NOT NULL,
      unit_id uuid NOT NULL,
      PRIMARY KEY (tenant_id, stack_id, unit_id),
      FOREIGN KEY (tenant_id, stack_id) REFERENCES stacks (tenant_id, id) ON DELETE CASCADE,
      FOREIGN KEY (tenant_id, unit_id) REFERENCES emission_units (tenant_id, id) ON DELETE CASCADE
    );
    CREATE INDEX stack_units_unit_idx ON stack_units (tenant_id, unit_id);
  `);
  await enableTenantRls(knex, 'stack_units', { index: false });
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TABLE IF EXISTS stack_units');
}
