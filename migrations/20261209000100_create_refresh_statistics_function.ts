import type { Knex } from 'knex';
import { appRole } from './lib/tenancy';

// A bulk load into a fresh month partition (or into staging) leaves the planner with no
// statistics until autovacuum gets round to it, and a join planned on "this table is empty" can
// run for minutes instead of milliseconds (a re-import's comparison against a month just loaded
// did exactly that). The API role owns no table and may not ANALYZE, so this owner-run function
// analyses one allow-listed table when the rows just written are a large share of what the
// planner believes it holds. ANALYZE counts the calling transaction's own new rows, so it can run
// before that transaction commits.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create function refresh_statistics(p_table text, p_rows_written bigint) returns boolean
    language plpgsql volatile security definer set search_path = public, pg_temp as $$
    declare
      v_tuples real;
    begin
      if p_table <> 'import_rows' and p_table !~ '^(readings|hourly_values|limit_hourly_values)_y[0-9]{4}m[0-9]{2}$' then
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
    end $$`);
  await knex.raw('revoke all on function refresh_statistics(text, bigint) from public');
  await knex.raw('grant execute on function refresh_statistics(text, bigint) to ??', [appRole]);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop function if exists refresh_statistics(text, bigint)');
}
