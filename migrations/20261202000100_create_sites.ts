import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// A plant location. The time zone decides where local days and months begin for averaging;
// the regime only pre-fills defaults (reference O2, ambient O2) on limits.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE sites (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      tenant_id uuid NOT NULL REFERENCES organisations (id) ON DELETE CASCADE,
      name text NOT NULL CHECK (length(btrim(name)) > 0),
      time_zone text NOT NULL,
      country char(2) NOT NULL CHECK (country ~ '^[A-Z]{2}$'),
      regime text NOT NULL CHECK (regime IN ('eu_ied', 'us_epa', 'other')),
      address text,
      version integer NOT NULL DEFAULT 1,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      archived_at timestamptz,
      -- lets child tables reference (tenant_id, id) so a row can never point into another tenant
      UNIQUE (tenant_id, id)
    );
  `);
  await enableTenantRls(knex, 'sites');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TABLE IF EXISTS sites');
}
