import type { Knex } from 'knex';

// What a limit's hourly value was derived from and alongside it: the pollutant channel used, the
// reason of an invalid hour (e.g. o2_invalid), the share of the hour covered by valid readings,
// the dry concentration at the measured O2 (mg/Nm3, before the O2 correction) and the mass rate
// (kg/h, when a flow is known) — so a figure traces back without recomputing it.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    alter table limit_hourly_values
      add column channel_id uuid,
      add column reason text,
      add column coverage double precision check (coverage is null or (coverage >= 0 and coverage <= 1)),
      add column dry_mg_per_nm3 double precision,
      add column mass_kg_per_hour double precision
  `);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`
    alter table limit_hourly_values
      drop column if exists channel_id,
      drop column if exists reason,
      drop column if exists coverage,
      drop column if exists dry_mg_per_nm3,
      drop column if exists mass_kg_per_hour
  `);
}
