import type { Knex } from 'knex';
import { currentTenantSql, currentUserSql } from './lib/tenancy';

// organisations is the tenant table itself: its key is id, not tenant_id.
export async function up(knex: Knex): Promise<void> {
  await knex.raw('alter table organisations enable row level security');
  await knex.raw('alter table organisations force row level security');
  await knex.raw(
    `create policy organisations_tenant_isolation on organisations for all using (id = ${currentTenantSql}) with check (id = ${currentTenantSql})`,
  );
  // The switcher lists every organisation the signed-in user belongs to.
  await knex.raw(
    `create policy organisations_of_own_memberships on organisations for select using (id in (select m.tenant_id from memberships m where m.user_id = ${currentUserSql}))`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop policy if exists organisations_of_own_memberships on organisations');
  await knex.raw('drop policy if exists organisations_tenant_isolation on organisations');
  await knex.raw('alter table organisations no force row level security');
  await knex.raw('alter table organisations disable row level security');
}
