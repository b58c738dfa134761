import type { Knex } from 'knex';
import { appRole, enableTenantRls, tenantColumn } from './lib/tenancy';

// Append-only audit trail: a trigger rejects UPDATE, DELETE and TRUNCATE for every role, and the
// API role holds only SELECT and INSERT.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('audit_log', (t) => {
    tenantColumn(t, 'RESTRICT');
    t.bigIncrements('id').primary();
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.uuid('actor_user_id').references('id').inTable('users').onDelete('RESTRICT');
    t.text('action').notNullable();
    t.text('entity').notNullable();
    t.text('entity_id');
    t.jsonb('before');
    t.jsonb('after');
    t.text('request_id');
    t.index(['tenant_id', 'id'], 'audit_log_tenant_id_id_idx');
    t.index(['tenant_id', 'entity', 'id'], 'audit_log_tenant_id_entity_idx');
    t.index(['tenant_id', 'actor_user_id'], 'audit_log_tenant_id_actor_idx');
  });
  await enableTenantRls(knex, 'audit_log', { index: false });
  await knex.raw('revoke update, delete, truncate on audit_log from ??', [appRole]);
  await knex.raw(`
    create function audit_log_reject_change() returns trigger language plpgsql as $$
    begin
      raise exception 'audit_log is append-only: % is not allowed', tg_op using errcode = 'insufficient_privilege';
    end $$`);
  await knex.raw(`create trigger audit_log_no_update_delete before update or delete on audit_log
    for each row execute function audit_log_reject_change()`);
  await knex.raw(`create trigger audit_log_no_truncate before truncate on audit_log
    for each statement execute function audit_log_reject_change()`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('audit_log');
  await knex.raw('drop function if exists audit_log_reject_change()');
}
