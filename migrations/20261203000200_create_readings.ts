import type { Knex } from 'knex';
import { appRole, enableTenantRls } from './lib/tenancy';

// Raw readings, one row per channel and interval start `t` (UTC), partitioned by UTC month.
// Raw values are never overwritten: a replacement (a corrected or re-imported value) is a new row,
// and the old row only gets superseded_at/superseded_by set — a trigger refuses any other change
// and every DELETE. The current value of (channel, t) is the row with superseded_at null.
//
// No foreign keys on channel_id/import_id/created_by: a month of one-minute data for ten channels
// is 450,000 rows, and a per-row foreign-key check would double the load time. The import service
// (the only bulk writer) checks that every channel belongs to the stack and organisation.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create table readings (
      id bigint generated always as identity,
      tenant_id uuid not null,
      channel_id uuid not null,
      t timestamptz not null,
      value double precision,
      status text not null default 'valid' check (status in ('valid', 'calibration', 'maintenance', 'fault',
        'out_of_range', 'not_operating', 'startup_shutdown', 'substituted', 'invalidated')),
      import_id uuid,
      created_by uuid,
      created_at timestamptz not null default now(),
      superseded_at timestamptz,
      superseded_by bigint,
      reason text,
      -- a valid reading has a value; substitutions and invalidations say why
      check (value is not null or status <> 'valid'),
      check (status not in ('substituted', 'invalidated') or reason is not null),
      check (superseded_by is null or superseded_at is not null)
    ) partition by range (t)
  `);
  await knex.raw('create table readings_default partition of readings default');
  await knex.raw('revoke all on readings_default from ??', [appRole]);
  await enableTenantRls(knex, 'readings_default', { index: false });
  // One current row per channel and time; superseded rows have their own small index.
  await knex.raw('create unique index readings_current_uq on readings (tenant_id, channel_id, t) where superseded_at is null');
  await knex.raw('create index readings_superseded_idx on readings (tenant_id, channel_id, t) where superseded_at is not null');
  await enableTenantRls(knex, 'readings', { index: false });

  await knex.raw(`
    create function readings_append_only() returns trigger language plpgsql as $$
    begin
      if tg_op = 'DELETE' then
        raise exception 'readings are never deleted; supersede them instead' using errcode = 'insufficient_privilege';
      end if;
      if (new.id, new.tenant_id, new.channel_id, new.t, new.value, new.status, new.import_id, new.created_by,
          new.created_at, new.reason)
         is distinct from
         (old.id, old.tenant_id, old.channel_id, old.t, old.value, old.status, old.import_id, old.created_by,
          old.created_at, old.reason) then
        raise exception 'readings are raw records: only superseded_at and superseded_by may be set'
          using errcode = 'insufficient_privilege';
      end if;
      if old.superseded_at is not null and new.superseded_at is distinct from old.superseded_at then
        raise exception 'a superseded reading stays superseded' using errcode = 'insufficient_privilege';
      end if;
      if old.superseded_by is not null and new.superseded_by is distinct from old.superseded_by then
        raise exception 'superseded_by is set once' using errcode = 'insufficient_privilege';
      end if;
      return new;
    end $$
  `);
  await knex.raw(`create trigger readings_append_only before update or delete on readings
    for each row execute function readings_append_only()`);
  await knex.raw('revoke delete, truncate on readings from ??', [appRole]);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop table if exists readings cascade');
  await knex.raw('drop function if exists readings_append_only()');
}
