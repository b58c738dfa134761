import type { Knex } from 'knex';

// Case-insensitive e-mail addresses. citext is a trusted extension (PostgreSQL 13+), so the
// database owner may create it without superuser rights.
export async function up(knex: Knex): Promise<void> {
  await knex.raw('create extension if not exists citext');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop extension if exists citext');
}
