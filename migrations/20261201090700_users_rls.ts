import type { Knex } from 'knex';
import { currentTenantSql, currentUserSql } from './lib/tenancy';

// users has no tenant_id, but the API role must still not list everyone's accounts and password
// hashes. It may see: itself, members of the current organisation, and people who appear in the
// current organisation's audit trail (former members stay named there). RLS is ENABLEd but not
// FORCEd so that the owner (migrations, seeds, the SECURITY DEFINER sign-in lookup) sees all rows.
export async function up(knex: Knex): Promise<void> {
  await knex.raw('alter table users enable row level security');
  await knex.raw(`create policy users_visible on users for select using (
    id = ${currentUserSql}
    or exists (select 1 from memberships m where m.user_id = users.id and m.tenant_id = ${currentTenantSql})
    or exists (select 1 from audit_log a where a.actor_user_id = users.id and a.tenant_id = ${currentTenantSql})
  )`);
  await knex.raw(`create policy users_update_self on users for update using (id = ${currentUserSql}) with check (id = ${currentUserSql})`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop policy if exists users_update_self on users');
  await knex.raw('drop policy if exists users_visible on users');
  await knex.raw('alter table users disable row level security');
}
