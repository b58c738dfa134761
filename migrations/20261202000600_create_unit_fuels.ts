import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// The fuels an emission unit burns.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE unit_fuels (
      tenant_id uuid NOT NULL,
      unit_id uuid NOT NULL,
      fuel_id uuid NOT NULL,
      PRIMARY KEY (tenant_id, unit_id, fuel_id),
      FOREIGN KEY (tenant_id, unit_id) REFERENCES emission_units (tenant_id, id) ON DELETE CASCADE,
      FOREIGN KEY (tenant_id, fuel_id) REFERENCES fuels (tenant_id, id) ON DELETE CASCADE
    );
    CREATE INDEX unit_fuels_fuel_idx ON unit_fuels (tenant_id, fuel_id);
  `);
  await enableTenantRls(knex, 'unit_fuels', { index: false });
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TABLE IF EXISTS unit_fuels');
}
