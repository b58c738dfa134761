import type { Knex } from 'knex';

// Stacks under US EPA rules report flow in standard cubic feet per hour (68 °F, 29.92 in Hg;
// 40 CFR 60.2 standard conditions) and temperature in °F: channels may say so.
const before = ['mg/Nm3', 'ppm', 'ug/Nm3', '%', 'Nm3/h', 'm3/h', 'degC', 'K', 'kPa', 'hPa', 'MW', 'kg/h', 't/h'];
const after = [...before, 'scfh', 'degF'];

async function allow(knex: Knex, units: string[]): Promise<void> {
  const { rows } = await knex.raw(
    `select conname from pg_constraint where conrelid = 'channels'::regclass and contype = 'c' and pg_get_constraintdef(oid) like '%unit%'`,
  );
  for (const { conname } of rows as { conname: string }[]) await knex.raw('alter table channels drop constraint ??', [conname]);
  // DDL takes no bind parameters; the units are this file's own constants.
  await knex.raw(`alter table channels add constraint channels_unit_check check (unit in (${units.map((u) => `'${u}'`).join(', ')}))`);
}

export async function up(knex: Knex): Promise<void> {
  await allow(knex, after);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("update channels set archived_at = coalesce(archived_at, now()) where unit in ('scfh', 'degF')");
  await allow(knex, before);
}
