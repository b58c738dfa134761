import type { Knex } from 'knex';

// Organisations are the tenants. The row-level security of this table is added once memberships
// exist (20261201090400), because a signed-in user may list the organisations they belong to.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('organisations', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.text('name').notNullable();
    t.text('slug').notNullable().unique();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw("alter table organisations add constraint organisations_slug_format check (slug ~ '^[a-z0-9][a-z0-9-]{1,62}$')");
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('organisations');
}
