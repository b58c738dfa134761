import type { Knex } from 'knex';
import { currentUserSql, enableTenantRls, tenantColumn } from './lib/tenancy';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('memberships', (t) => {
    tenantColumn(t);
    t.uuid('user_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.text('role').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['tenant_id', 'user_id']);
    t.index(['user_id'], 'memberships_user_id_idx');
  });
  await knex.raw("alter table memberships add constraint memberships_role_check check (role in ('admin', 'officer', 'manager', 'auditor'))");
  // The primary key (tenant_id, user_id) already indexes tenant_id.
  await enableTenantRls(knex, 'memberships', { index: false });
  // Sign-in and the organisation switcher list a user's own memberships before a tenant is chosen.
  await knex.raw(`create policy memberships_own_rows on memberships for select using (user_id = ${currentUserSql})`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('memberships');
}
