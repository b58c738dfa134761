import type { Knex } from 'knex';
import { up as createImportRows } from './20261203000500_create_import_rows';
import { currentTenantSql } from './lib/tenancy';

// import_rows, the first staging table (one row per file row), has had no reader or writer since
// staging moved to import_columns (20261210000100). Housekeeping and refresh_statistics stop
// naming it, then it goes. Both functions keep their signatures and settings.
const staleImport = `i.tenant_id = r.tenant_id and i.id = r.import_id
         and (i.state in ('committed', 'rolled_back', 'failed') or i.uploaded_at < now() - p_draft_max_age)`;

function purgeFunction(withImportRows: boolean): string {
  return `
    create or replace function purge_stale_work(p_draft_max_age interval)
    returns table (staging_rows_deleted bigint, rate_limits_deleted bigint)
    language plpgsql volatile security definer set search_path = public, pg_temp as $$
    declare
      v_rows bigint := 0;
      v_parts bigint;
      v_limits bigint;
    begin
      ${withImportRows ? `delete from import_rows r using imports i where ${staleImport};
      get diagnostics v_rows = row_count;` : ''}
      delete from import_columns r using imports i where ${staleImport};
      get diagnostics v_parts = row_count;
      delete from rate_limit where reset_at < now();
      get diagnostics v_limits = row_count;
      return query select v_rows + v_parts, v_limits;
    end $$`;
}

function refreshStatisticsFunction(withImportRows: boolean): string {
  return `
    create or replace function refresh_statistics(p_table text, p_rows_written bigint) returns boolean
    language plpgsql volatile security definer set search_path = public, pg_temp set default_statistics_target = 10 as $$
    declare
      v_tuples real;
    begin
      if ${withImportRows ? "p_table <> 'import_rows' and " : ''}p_table !~ '^(readings|hourly_values|limit_hourly_values)_y[0-9]{4}m[0-9]{2}$' then
        raise exception 'refresh_statistics: % is not a bulk-loaded table', p_table;
      end if;
      select reltuples into v_tuples from pg_class where oid = to_regclass(p_table);
      if v_tuples is null then
        return false;
      end if;
      -- Never analysed (-1), or this write is more than a tenth of what the statistics know.
      if v_tuples >= 0 and p_rows_written <= 0.1 * greatest(v_tuples, 1000) then
        return false;
      end if;
      execute format('analyze %I', p_table);
      return true;
    end $$`;
}

export async function up(knex: Knex): Promise<void> {
  await knex.raw(purgeFunction(false));
  await knex.raw(refreshStatisticsFunction(false));
  await knex.raw('drop table import_rows');
}

export async function down(knex: Knex): Promise<void> {
  await createImportRows(knex);
  const tenantOnce = `(select ${currentTenantSql})`;
  await knex.raw(`alter policy import_rows_tenant_isolation on import_rows using (tenant_id = ${tenantOnce}) with check (tenant_id = ${tenantOnce})`);
  await knex.raw('create policy import_rows_housekeeping_delete on import_rows for delete to current_user using (true)');
  await knex.raw('create policy import_rows_housekeeping_read on import_rows for select to current_user using (true)');
  await knex.raw(refreshStatisticsFunction(true));
  await knex.raw(purgeFunction(true));
}
