import type { Knex } from 'knex';
import { appRole } from './lib/tenancy';

// Housekeeping across every organisation: import staging rows that are no longer needed (the
// import was committed, rolled back or failed, or its draft was left for longer than the cutoff)
// and expired login rate-limit windows. Staging is FORCEd under row-level security, so the owner
// gets narrow policies of its own — read imports, delete staging — and the API role only the right
// to call this one function (it runs as the owner: SECURITY DEFINER).
export async function up(knex: Knex): Promise<void> {
  await knex.raw('create policy imports_housekeeping_read on imports for select to current_user using (true)');
  await knex.raw('create policy import_rows_housekeeping_delete on import_rows for delete to current_user using (true)');
  await knex.raw('create policy import_rows_housekeeping_read on import_rows for select to current_user using (true)');
  await knex.raw(`
    create function purge_stale_work(p_draft_max_age interval)
    returns table (staging_rows_deleted bigint, rate_limits_deleted bigint)
    language plpgsql volatile security definer set search_path = public, pg_temp as $$
    declare
      v_rows bigint;
      v_limits bigint;
    begin
      delete from import_rows r
       using imports i
       where i.tenant_id = r.tenant_id and i.id = r.import_id
         and (i.state in ('committed', 'rolled_back', 'failed') or i.uploaded_at < now() - p_draft_max_age);
      get diagnostics v_rows = row_count;
      delete from rate_limit where reset_at < now();
      get diagnostics v_limits = row_count;
      return query select v_rows, v_limits;
    end $$`);
  await knex.raw('revoke all on function purge_stale_work(interval) from public');
  await knex.raw('grant execute on function purge_stale_work(interval) to ??', [appRole]);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop function if exists purge_stale_work(interval)');
  await knex.raw('drop policy if exists import_rows_housekeeping_read on import_rows');
  await knex.raw('drop policy if exists import_rows_housekeeping_delete on import_rows');
  await knex.raw('drop policy if exists imports_housekeeping_read on imports');
}
