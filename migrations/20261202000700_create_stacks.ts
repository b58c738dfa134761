import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// A stack (flue) where the monitors measure; one or more emission units exhaust through it.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE stacks (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      tenant_id uuid NOT NULL REFERENCES organisations (id) ON DELETE CASCADE,
      site_id uuid NOT NULL,
      name text NOT NULL CHECK (length(btrim(name)) > 0),
      height_m numeric CHECK (height_m > 0),
      diameter_m numeric CHECK (diameter_m > 0),
      version integer NOT NULL DEFAULT 1,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      archived_at timestamptz,
      UNIQUE (tenant_id, id),
      FOREIGN KEY (tenant_id, site_id) REFERENCES sites (tenant_id, id)
    );
    CREATE INDEX stacks_site_idx ON stacks (tenant_id, site_id);
  `);
  await enableTenantRls(knex, 'stacks');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TABLE IF EXISTS stacks');
}
