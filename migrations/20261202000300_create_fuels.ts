import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// A fuel fired at a site. Its analyses (composition, heating value, F-factors) live in
// fuel_analyses as a history, because a fuel's analysis changes with each delivery or lab report.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE fuels (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      tenant_id uuid NOT NULL REFERENCES organisations (id) ON DELETE CASCADE,
      site_id uuid NOT NULL,
      name text NOT NULL CHECK (length(btrim(name)) > 0),
      fuel_type text NOT NULL CHECK (fuel_type IN ('natural_gas', 'propane', 'butane', 'fuel_oil',
        'bituminous_coal', 'anthracite', 'lignite', 'wood', 'wood_bark', 'other_gas', 'other_liquid',
        'other_solid')),
      kind text NOT NULL CHECK (kind IN ('gas', 'liquid', 'solid')),
      version integer NOT NULL DEFAULT 1,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      archived_at timestamptz,
      UNIQUE (tenant_id, id),
      FOREIGN KEY (tenant_id, site_id) REFERENCES sites (tenant_id, id)
    );
    CREATE INDEX fuels_site_idx ON fuels (tenant_id, site_id);
  `);
  await enableTenantRls(knex, 'fuels');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TABLE IF EXISTS fuels');
}
