import type { Knex } from 'knex';
import { appRole } from './lib/tenancy';

// Every table the owner creates from now on is usable by the API role without a GRANT in each
// migration. Tables that must be narrower (audit_log) revoke in their own migration.
export async function up(knex: Knex): Promise<void> {
  await knex.raw('alter default privileges in schema public grant select, insert, update, delete on tables to ??', [appRole]);
  await knex.raw('alter default privileges in schema public grant usage on sequences to ??', [appRole]);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('alter default privileges in schema public revoke select, insert, update, delete on tables from ??', [appRole]);
  await knex.raw('alter default privileges in schema public revoke usage on sequences from ??', [appRole]);
}
