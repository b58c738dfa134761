import type { Knex } from 'knex';

// Housekeeping (20261206000100) also clears the new staging table, import_columns, under the same
// rule as import_rows: staging of an import that was committed, rolled back or failed, or whose
// draft is older than the cutoff. Like import_rows, the table is FORCEd under row-level security,
// so the owner (who runs the function, SECURITY DEFINER) gets narrow policies of its own to read
// and delete it. The function keeps its signature; staging_rows_deleted counts both tables.
const staleImport = `i.tenant_id = r.tenant_id and i.id = r.import_id
         and (i.state in ('committed', 'rolled_back', 'failed') or i.uploaded_at < now() - p_draft_max_age)`;

function purgeFunction(withColumns: boolean): string {
  return `
    create or replace function purge_stale_work(p_draft_max_age interval)
    returns table (staging_rows_deleted bigint, rate_limits_deleted bigint)
    language plpgsql volatile security definer set search_path = public, pg_temp as $$
    declare
      v_rows bigint;
      v_parts bigint := 0;
      v_limits bigint;
    begin
      delete from import_rows r using imports i where ${staleImport};
      get diagnostics v_rows = row_count;
      ${withColumns ? `delete from import_columns r using imports i where ${staleImport};
      get diagnostics v_parts = row_count;` : ''}
      delete from rate_limit where reset_at < now();
      get diagnostics v_limits = row_count;
      return query select v_rows + v_parts, v_limits;
    end $$`;
}

export async function up(knex: Knex): Promise<void> {
  await knex.raw('create policy import_columns_housekeeping_delete on import_columns for delete to current_user using (true)');
  await knex.raw('create policy import_columns_housekeeping_read on import_columns for select to current_user using (true)');
  await knex.raw(purgeFunction(true));
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(purgeFunction(false));
  await knex.raw('drop policy if exists import_columns_housekeeping_read on import_columns');
  await knex.raw('drop policy if exists import_columns_housekeeping_delete on import_columns');
}
