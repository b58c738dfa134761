import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// A combustion unit (boiler, turbine, …). Its rated thermal input decides which rules apply.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE emission_units (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      tenant_id uuid NOT NULL REFERENCES organisations (id) ON DELETE CASCADE,
      site_id uuid NOT NULL,
      name text NOT NULL CHECK (length(btrim(name)) > 0),
      unit_type text NOT NULL CHECK (unit_type IN ('boiler', 'process_heater', 'kiln', 'gas_turbine',
        'engine', 'incinerator', 'other')),
      rated_thermal_input_mwth numeric NOT NULL CHECK (rated_thermal_input_mwth > 0),
      in_service_from date NOT NULL,
      in_service_to date CHECK (in_service_to IS NULL OR in_service_to >= in_service_from),
      version integer NOT NULL DEFAULT 1,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      archived_at timestamptz,
      UNIQUE (tenant_id, id),
      FOREIGN KEY (tenant_id, site_id) REFERENCES sites (tenant_id, id)
    );
    CREATE INDEX emission_units_site_idx ON emission_units (tenant_id, site_id);
  `);
  await enableTenantRls(knex, 'emission_units');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TABLE IF EXISTS emission_units');
}
