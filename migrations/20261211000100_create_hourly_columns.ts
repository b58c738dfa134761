import type { Knex } from 'knex';
import { currentTenantSql, enableTenantRls, tenantColumn } from './lib/tenancy';

// The data review reads a stack's hourly results for a month or a quarter, again and again, while
// they change only when readings, corrections, fuels or limits do. Building the review's columns
// from the hourly rows (a few thousand rows to one JSON document per channel and limit) is most of
// a review's time, so each channel's and limit's hours of one UTC month are kept built, as that
// JSON text, in `hourly_columns`, and read back as they are.
//
// Never stale, by construction: every write to hourly_values or limit_hourly_values bumps the
// version of the (channel or limit, UTC month) it touches in `hourly_column_versions` (statement
// triggers below, in the writing transaction). A built document names the version it was built
// from, read in the same statement (one snapshot) as the hours it holds, and a reader only takes
// the document of the version it sees. A build that races a write therefore stores a document of
// an old version, which nobody reads. Versions are never decremented or deleted, so a version
// number is never reused for other data. `format` names the document's layout and legends: a
// release that changes them simply builds new documents.
//
// Written only by the transaction that writes hourly rows (versions) and by readers (documents,
// insert-only: no reader waits for a writer's lock). The trigger runs as the writer: hourly rows
// are only ever written in a tenant scope (row-level security on them says so), and it records
// only rows of that tenant (rows of another tenant reach it only by an organisation's cascading
// delete, whose versions and documents the same cascade removes).
const tenantOnce = `(select ${currentTenantSql})`;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('hourly_column_versions', (t) => {
    tenantColumn(t);
    t.text('kind').notNullable();
    t.uuid('series_id').notNullable();
    t.specificType('month_start', 'timestamptz').notNullable();
    t.bigInteger('version').notNullable().defaultTo(1);
    t.primary(['tenant_id', 'kind', 'series_id', 'month_start']);
  });
  await knex.raw("alter table hourly_column_versions add constraint hourly_column_versions_kind check (kind in ('channel', 'limit'))");

  await knex.schema.createTable('hourly_columns', (t) => {
    tenantColumn(t);
    t.text('kind').notNullable();
    t.uuid('series_id').notNullable();
    t.specificType('month_start', 'timestamptz').notNullable();
    t.bigInteger('version').notNullable();
    t.text('format').notNullable();
    t.text('body').notNullable();
    t.specificType('built_at', 'timestamptz').notNullable().defaultTo(knex.fn.now());
    t.primary(['tenant_id', 'kind', 'series_id', 'month_start', 'version', 'format']);
  });
  await knex.raw("alter table hourly_columns add constraint hourly_columns_kind check (kind in ('channel', 'limit'))");

  for (const table of ['hourly_column_versions', 'hourly_columns']) {
    await enableTenantRls(knex, table, { index: false });
    await knex.raw(`alter policy ?? on ?? using (tenant_id = ${tenantOnce}) with check (tenant_id = ${tenantOnce})`, [`${table}_tenant_isolation`, table]);
  }

  // TG_ARGV: the kind ('channel' | 'limit') and the id column of the hourly table. The transition
  // tables are named `changed_rows` (and `replaced_rows`, the old rows of an UPDATE).
  await knex.raw(`
    create function bump_hourly_column_versions() returns trigger
    language plpgsql volatile set search_path = public, pg_temp as $$
    declare
      v_rows text := case when tg_op = 'UPDATE' then '(select * from changed_rows union all select * from replaced_rows)' else 'changed_rows' end;
    begin
      execute format(
        'insert into hourly_column_versions as v (tenant_id, kind, series_id, month_start)
         select distinct tenant_id, %L, %I, date_trunc(''month'', hour_start, ''UTC'')
           from %s r
          where r.tenant_id = ${tenantOnce.replace(/'/g, "''")}
          order by 1, 2, 3, 4
         on conflict (tenant_id, kind, series_id, month_start) do update set version = v.version + 1',
        tg_argv[0], tg_argv[1], v_rows);
      return null;
    end $$`);
  await knex.raw(`
    create function refuse_hourly_truncate() returns trigger language plpgsql as $$
    begin
      raise exception '% cannot be truncated: the review''s built columns would not see it; delete the rows instead', tg_table_name;
    end $$`);
  for (const [table, kind, column] of [
    ['hourly_values', 'channel', 'channel_id'],
    ['limit_hourly_values', 'limit', 'limit_id'],
  ] as const) {
    const args = `'${kind}', '${column}'`;
    await knex.raw(`create trigger ${table}_columns_insert after insert on ${table} referencing new table as changed_rows for each statement execute function bump_hourly_column_versions(${args})`);
    await knex.raw(`create trigger ${table}_columns_delete after delete on ${table} referencing old table as changed_rows for each statement execute function bump_hourly_column_versions(${args})`);
    await knex.raw(
      `create trigger ${table}_columns_update after update on ${table} referencing new table as changed_rows old table as replaced_rows for each statement execute function bump_hourly_column_versions(${args})`,
    );
    // TRUNCATE has no transition table to bump versions from: refused (delete the rows instead).
    await knex.raw(`create trigger ${table}_columns_truncate before truncate on ${table} for each statement execute function refuse_hourly_truncate()`);
  }
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ['hourly_values', 'limit_hourly_values']) {
    for (const event of ['insert', 'delete', 'update', 'truncate']) await knex.raw(`drop trigger if exists ${table}_columns_${event} on ${table}`);
  }
  await knex.raw('drop function if exists bump_hourly_column_versions()');
  await knex.raw('drop function if exists refuse_hourly_truncate()');
  await knex.schema.dropTableIfExists('hourly_columns');
  await knex.schema.dropTableIfExists('hourly_column_versions');
}
