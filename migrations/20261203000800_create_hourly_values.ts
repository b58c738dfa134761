import type { Knex } from 'knex';
import { appRole, enableTenantRls } from './lib/tenancy';

// Hourly results derived from readings (recomputed for the affected hours on commit, rollback and
// correction): per channel, the mean of valid readings in the channel's own unit and basis; per
// limit, the value in the limit's unit, basis and reference O2. Partitioned by UTC month like
// readings (partitions via ensure_month_partition).
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create table hourly_values (
      tenant_id uuid not null,
      channel_id uuid not null,
      hour_start timestamptz not null,
      value double precision,
      status text not null,
      coverage double precision not null check (coverage >= 0 and coverage <= 1),
      readings_valid integer not null default 0,
      readings_total integer not null default 0,
      computed_at timestamptz not null default now(),
      primary key (tenant_id, channel_id, hour_start),
      foreign key (tenant_id, channel_id) references channels (tenant_id, id)
    ) partition by range (hour_start)
  `);
  await knex.raw('create table hourly_values_default partition of hourly_values default');
  await knex.raw('revoke all on hourly_values_default from ??', [appRole]);
  await enableTenantRls(knex, 'hourly_values_default', { index: false });
  await enableTenantRls(knex, 'hourly_values', { index: false });

  await knex.raw(`
    create table limit_hourly_values (
      tenant_id uuid not null,
      limit_id uuid not null,
      hour_start timestamptz not null,
      value double precision,
      status text not null,
      o2_percent_dry double precision,
      computed_at timestamptz not null default now(),
      primary key (tenant_id, limit_id, hour_start),
      foreign key (tenant_id, limit_id) references permit_limits (tenant_id, id)
    ) partition by range (hour_start)
  `);
  await knex.raw('create table limit_hourly_values_default partition of limit_hourly_values default');
  await knex.raw('revoke all on limit_hourly_values_default from ??', [appRole]);
  await enableTenantRls(knex, 'limit_hourly_values_default', { index: false });
  await enableTenantRls(knex, 'limit_hourly_values', { index: false });
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop table if exists limit_hourly_values');
  await knex.raw('drop table if exists hourly_values');
}
