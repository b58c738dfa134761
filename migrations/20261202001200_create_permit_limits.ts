import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// One emission limit value of a permit, stored as data in the shape the compliance engine reads
// (packages/calc/src/limits): averaging period, reference O2, criterion, confidence interval …
// rather than one code path per regulation.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE permit_limits (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      tenant_id uuid NOT NULL REFERENCES organisations (id) ON DELETE CASCADE,
      permit_id uuid NOT NULL,
      stack_id uuid,
      unit_id uuid,
      pollutant text NOT NULL CHECK (pollutant IN ('NOx', 'NO', 'NO2', 'SO2', 'CO', 'dust', 'HCl', 'HF',
        'TOC', 'NH3', 'Hg', 'CO2')),
      elv numeric NOT NULL CHECK (elv > 0),
      unit text NOT NULL CHECK (unit IN ('mg/Nm3', 'ppm', 'ug/Nm3', 'lb/MMBtu', 'ng/J', 'kg/h', 't/yr')),
      reference_o2_percent numeric CHECK (reference_o2_percent >= 0 AND reference_o2_percent < 21),
      ambient_o2_percent numeric NOT NULL DEFAULT 21 CHECK (ambient_o2_percent IN (21, 20.9)),
      basis text NOT NULL CHECK (basis IN ('dry', 'wet')),
      period text NOT NULL CHECK (period IN ('hour', 'half_hour', 'day', 'month', 'year', 'rolling_days',
        'rolling_hours', 'block_hours')),
      period_length integer CHECK (period_length > 0),
      -- rolling windows count only operating days/hours (e.g. "30 boiler operating days")
      operating_periods_only boolean NOT NULL DEFAULT true,
      criterion jsonb NOT NULL,
      confidence_interval_percent numeric CHECK (confidence_interval_percent >= 0 AND confidence_interval_percent < 100),
      near_miss_percent numeric NOT NULL DEFAULT 90 CHECK (near_miss_percent > 0 AND near_miss_percent < 100),
      correct_only_when_above boolean NOT NULL DEFAULT false,
      exclude_statuses text[] NOT NULL DEFAULT '{startup-shutdown}',
      -- minimum data for a valid period, the compliance engine's MinData (packages/calc/src/limits)
      min_data jsonb,
      effective_from date NOT NULL,
      effective_to date CHECK (effective_to IS NULL OR effective_to >= effective_from),
      version integer NOT NULL DEFAULT 1,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      archived_at timestamptz,
      -- a limit applies to a stack or to a unit, never both and never neither
      CHECK ((stack_id IS NULL) <> (unit_id IS NULL)),
      CHECK ((period IN ('rolling_days', 'rolling_hours', 'block_hours')) = (period_length IS NOT NULL)),
      UNIQUE (tenant_id, id),
      FOREIGN KEY (tenant_id, permit_id) REFERENCES permits (tenant_id, id),
      FOREIGN KEY (tenant_id, stack_id) REFERENCES stacks (tenant_id, id),
      FOREIGN KEY (tenant_id, unit_id) REFERENCES emission_units (tenant_id, id)
    );
    CREATE INDEX permit_limits_permit_idx ON permit_limits (tenant_id, permit_id);
  `);
  await enableTenantRls(knex, 'permit_limits');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TABLE IF EXISTS permit_limits');
}
