import type { Knex } from 'knex';
import { appRole } from './lib/tenancy';

// Hourly results refer to their channel (hourly_values) and limit (limit_hourly_values) through a
// check once per statement instead of a foreign key. A foreign key checks every inserted row on
// its own (a lookup and a row lock per row): for the 5,952 channel hours of an import of a month
// of one-minute data for eight channels that was about 35–40 ms of the 90 ms the INSERT took.
// The statement-level check looks up each distinct channel or limit of the statement once.
//
// The other direction (no channel or limit deleted while hours refer to it) is kept the same way:
// a statement-level check after a DELETE refuses it, and the API role cannot delete channels or
// limits at all (they are archived, never deleted). Their ids and organisation never change.
const series = [
  { table: 'hourly_values', column: 'channel_id', parent: 'channels', fkey: 'hourly_values_tenant_id_channel_id_fkey', noun: 'channel' },
  { table: 'limit_hourly_values', column: 'limit_id', parent: 'permit_limits', fkey: 'limit_hourly_values_tenant_id_limit_id_fkey', noun: 'limit' },
] as const;

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create function hourly_series_exist() returns trigger
    language plpgsql stable set search_path = public, pg_temp as $$
    declare
      v_missing text;
    begin
      -- tg_argv: the hours' column, the parent table, the noun for the message
      execute format(
        'select n.%1$I::text from (select distinct tenant_id, %1$I from changed_rows) n
          where not exists (select 1 from %2$I p where p.tenant_id = n.tenant_id and p.id = n.%1$I) limit 1',
        tg_argv[0], tg_argv[1]) into v_missing;
      if v_missing is not null then
        raise exception 'hourly values refer to a % that does not exist (%)', tg_argv[2], v_missing
          using errcode = 'foreign_key_violation';
      end if;
      return null;
    end $$`);
  await knex.raw(`
    create function series_without_hours() returns trigger
    language plpgsql stable set search_path = public, pg_temp as $$
    declare
      v_kept text;
    begin
      -- tg_argv: the hours' table, its column, the noun for the message
      execute format(
        'select g.id::text from gone g where exists (select 1 from %1$I h where h.tenant_id = g.tenant_id and h.%2$I = g.id) limit 1',
        tg_argv[0], tg_argv[1]) into v_kept;
      if v_kept is not null then
        raise exception 'the % % has hourly values; archive it instead of deleting it', tg_argv[2], v_kept
          using errcode = 'foreign_key_violation';
      end if;
      return null;
    end $$`);
  await knex.raw(`
    create function series_key_fixed() returns trigger language plpgsql as $$
    begin
      raise exception 'the id and organisation of a % never change', tg_argv[0] using errcode = 'foreign_key_violation';
    end $$`);
  for (const s of series) {
    await knex.raw(`alter table ?? drop constraint ??`, [s.table, s.fkey]);
    const args = `'${s.column}', '${s.parent}', '${s.noun}'`;
    await knex.raw(`create trigger ${s.table}_series_insert after insert on ${s.table} referencing new table as changed_rows for each statement execute function hourly_series_exist(${args})`);
    await knex.raw(`create trigger ${s.table}_series_update after update on ${s.table} referencing new table as changed_rows for each statement execute function hourly_series_exist(${args})`);
    await knex.raw(
      `create trigger ${s.parent}_hours_delete after delete on ${s.parent} referencing old table as gone for each statement execute function series_without_hours('${s.table}', '${s.column}', '${s.noun}')`,
    );
    await knex.raw(
      `create trigger ${s.parent}_key_fixed before update on ${s.parent} for each row when (old.id is distinct from new.id or old.tenant_id is distinct from new.tenant_id) execute function series_key_fixed('${s.noun}')`,
    );
    await knex.raw('revoke delete on ?? from ??', [s.parent, appRole]);
  }
}

export async function down(knex: Knex): Promise<void> {
  for (const s of series) {
    await knex.raw('grant delete on ?? to ??', [s.parent, appRole]);
    await knex.raw(`drop trigger ${s.parent}_key_fixed on ${s.parent}`);
    await knex.raw(`drop trigger ${s.parent}_hours_delete on ${s.parent}`);
    await knex.raw(`drop trigger ${s.table}_series_update on ${s.table}`);
    await knex.raw(`drop trigger ${s.table}_series_insert on ${s.table}`);
    await knex.raw(`alter table ?? add constraint ?? foreign key (tenant_id, ??) references ?? (tenant_id, id)`, [s.table, s.fkey, s.column, s.parent]);
  }
  await knex.raw('drop function series_key_fixed()');
  await knex.raw('drop function series_without_hours()');
  await knex.raw('drop function hourly_series_exist()');
}
