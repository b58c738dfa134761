import type { Knex } from 'knex';
import { appRole, currentTenantSql } from './lib/tenancy';

// Month partitions of the large time-series tables (readings, hourly_values, limit_hourly_values)
// are created on demand, by the API, which owns nothing. This SECURITY DEFINER function (owned by
// the schema owner) creates one partition of an allow-listed parent, in UTC calendar months, and
// revokes the API role's direct access to it: queries go through the parent, whose row-level
// security policy applies (PostgreSQL checks privileges and policies on the parent only). Each
// partition also gets the tenant policy itself (ENABLE + FORCE), so a role that ever reaches a
// partition directly is held by the same wall.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create function ensure_month_partition(parent text, month_start date) returns text
    language plpgsql security definer set search_path = public, pg_temp as $$
    declare
      first_day date := date_trunc('month', month_start)::date;
      partition_name text;
      tenant_expr text := $q$${currentTenantSql}$q$;
    begin
      if parent not in ('readings', 'hourly_values', 'limit_hourly_values') then
        raise exception 'ensure_month_partition: % is not a month-partitioned table', parent;
      end if;
      partition_name := format('%s_y%sm%s', parent, to_char(first_day, 'YYYY'), to_char(first_day, 'MM'));
      if to_regclass(partition_name) is not null then
        return partition_name;
      end if;
      -- Two imports may want the same month at once: one creates it, the other finds it.
      perform pg_advisory_xact_lock(hashtext('ensure_month_partition:' || partition_name));
      if to_regclass(partition_name) is not null then
        return partition_name;
      end if;
      execute format('create table %I partition of %I for values from (%L) to (%L)', partition_name, parent,
        (first_day::timestamp at time zone 'UTC'), ((first_day + interval '1 month')::timestamp at time zone 'UTC'));
      execute format('revoke all on %I from %I', partition_name, ${knex.raw('?', [appRole]).toQuery()});
      execute format('alter table %I enable row level security', partition_name);
      execute format('alter table %I force row level security', partition_name);
      execute format('create policy %I on %I for all using (tenant_id = %s) with check (tenant_id = %s)',
        partition_name || '_tenant_isolation', partition_name, tenant_expr, tenant_expr);
      return partition_name;
    end $$
  `);
  await knex.raw('revoke all on function ensure_month_partition(text, date) from public');
  await knex.raw('grant execute on function ensure_month_partition(text, date) to ??', [appRole]);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop function if exists ensure_month_partition(text, date)');
}
