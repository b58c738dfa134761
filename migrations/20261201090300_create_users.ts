import type { Knex } from 'knex';

// A person may belong to several organisations, so users carry no tenant_id. Access to this
// table by the API role is restricted in 20261201090700_users_rls.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('users', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.specificType('email', 'citext').notNullable().unique();
    t.text('name').notNullable();
    t.text('password_hash');
    // Demo accounts are refused at sign-in when NODE_ENV=production.
    t.boolean('is_demo').notNullable().defaultTo(false);
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('disabled_at', { useTz: true });
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('users');
}
