import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// A permit issued for a site; its limits are in permit_limits, its PDF in permit_documents.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE permits (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      tenant_id uuid NOT NULL REFERENCES organisations (id) ON DELETE CASCADE,
      site_id uuid NOT NULL,
      reference text NOT NULL CHECK (length(btrim(reference)) > 0),
      authority text NOT NULL CHECK (length(btrim(authority)) > 0),
      effective_from date NOT NULL,
      effective_to date CHECK (effective_to IS NULL OR effective_to >= effective_from),
      version integer NOT NULL DEFAULT 1,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      archived_at timestamptz,
      UNIQUE (tenant_id, id),
      FOREIGN KEY (tenant_id, site_id) REFERENCES sites (tenant_id, id)
    );
    CREATE INDEX permits_site_idx ON permits (tenant_id, site_id);
    CREATE UNIQUE INDEX permits_reference_live_uq ON permits (tenant_id, site_id, reference)
      WHERE archived_at IS NULL;
  `);
  await enableTenantRls(knex, 'permits');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TABLE IF EXISTS permits');
}
