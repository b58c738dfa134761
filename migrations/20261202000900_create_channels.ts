import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// What a stack's monitors report: one parameter in one unit on one basis. The logger's column
// name (source_label) lets an import map its columns to channels.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE channels (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      tenant_id uuid NOT NULL REFERENCES organisations (id) ON DELETE CASCADE,
      stack_id uuid NOT NULL,
      parameter text NOT NULL CHECK (parameter IN ('NOx', 'NO', 'NO2', 'SO2', 'CO', 'dust', 'HCl', 'HF',
        'TOC', 'NH3', 'Hg', 'CO2', 'O2', 'H2O', 'flow', 'temperature', 'pressure', 'load', 'fuel_flow')),
      unit text NOT NULL CHECK (unit IN ('mg/Nm3', 'ppm', 'ug/Nm3', '%', 'Nm3/h', 'm3/h', 'degC', 'K',
        'kPa', 'hPa', 'MW', 'kg/h', 't/h')),
      basis text NOT NULL CHECK (basis IN ('wet', 'dry')),
      conditions text NOT NULL CHECK (conditions IN ('actual', 'standard')),
      range_min numeric,
      range_max numeric,
      interval_minutes integer NOT NULL CHECK (interval_minutes IN (1, 5, 10, 15, 30, 60)),
      source_label text,
      version integer NOT NULL DEFAULT 1,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      archived_at timestamptz,
      CHECK (range_min IS NULL OR range_max IS NULL OR range_min < range_max),
      UNIQUE (tenant_id, id),
      FOREIGN KEY (tenant_id, stack_id) REFERENCES stacks (tenant_id, id)
    );
    CREATE INDEX channels_stack_idx ON channels (tenant_id, stack_id);
    -- one live channel per parameter and basis on a stack; archived ones keep their history
    CREATE UNIQUE INDEX channels_stack_parameter_basis_live_uq ON channels (stack_id, parameter, basis)
      WHERE archived_at IS NULL;
  `);
  await enableTenantRls(knex, 'channels');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TABLE IF EXISTS channels');
}
