import type { Knex } from 'knex';

// The table connect-pg-simple expects (its documented table.sql). The store is told not to
// create it, so the API role never needs DDL rights.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`create table "session" (
    "sid" varchar not null collate "default" primary key,
    "sess" json not null,
    "expire" timestamp(6) not null
  )`);
  await knex.raw('create index "IDX_session_expire" on "session" ("expire")');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('session');
}
