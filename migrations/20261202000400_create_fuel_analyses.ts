import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// Fuel analyses are history: never updated; a new lab result is a new row valid from its date.
// The F-factors (40 CFR 60 App. A Method 19) are stored with the analysis together with how they
// were obtained, so a figure computed later can always be traced to the analysis behind it.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE fuel_analyses (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      tenant_id uuid NOT NULL REFERENCES organisations (id) ON DELETE CASCADE,
      fuel_id uuid NOT NULL,
      valid_from date NOT NULL,
      ultimate jsonb,
      composition jsonb,
      gcv_mj_per_kg numeric CHECK (gcv_mj_per_kg > 0),
      gcv_mj_per_nm3 numeric CHECK (gcv_mj_per_nm3 > 0),
      gcv_source text NOT NULL DEFAULT 'measured' CHECK (gcv_source IN ('measured', 'correlation', 'none')),
      fd_dscf_per_mmbtu numeric NOT NULL CHECK (fd_dscf_per_mmbtu > 0),
      fw_wscf_per_mmbtu numeric CHECK (fw_wscf_per_mmbtu > 0),
      fc_scf_per_mmbtu numeric NOT NULL CHECK (fc_scf_per_mmbtu > 0),
      f_factor_source text NOT NULL CHECK (f_factor_source IN ('computed', 'method19_default')),
      created_by uuid REFERENCES users (id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (tenant_id, id),
      FOREIGN KEY (tenant_id, fuel_id) REFERENCES fuels (tenant_id, id)
    );
    CREATE INDEX fuel_analyses_fuel_idx ON fuel_analyses (tenant_id, fuel_id, valid_from DESC, created_at DESC);
  `);
  await enableTenantRls(knex, 'fuel_analyses');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TABLE IF EXISTS fuel_analyses');
}
