import type { Knex } from 'knex';

// Fixed-window counters for express-rate-limit, shared by every API instance.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('rate_limit', (t) => {
    t.text('key').primary();
    t.integer('hits').notNullable();
    t.timestamp('reset_at', { useTz: true }).notNullable();
    t.index(['reset_at'], 'rate_limit_reset_at_idx');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('rate_limit');
}
