import type { Knex } from 'knex';

/**
 * Helpers for tenant-owned tables. Every table with a `tenant_id` column gets an index on it and a
 * row-level security policy, ENABLEd and FORCEd (FORCE so that even the owner role, which runs
 * migrations and seeds, cannot read across tenants by accident). The API connects as
 * `flueledger_app`, which owns nothing and has NOBYPASSRLS, so the policy always applies to it.
 *
 * Usage in a migration:
 *   await knex.schema.createTable('stacks', (t) => { tenantColumn(t); ... });
 *   await enableTenantRls(knex, 'stacks');
 */

/** The API's login role (created by infra/pg.sh). Override for a differently named deployment. */
export const appRole = process.env.FL_DB_APP_ROLE ?? 'flueledger_app';

/**
 * SQL expression for the current request's tenant. A transaction-local set_config leaves `''`
 * (not NULL) on a pooled connection afterwards, hence nullif: no tenant set → NULL → no rows.
 */
export const currentTenantSql = "nullif(current_setting('app.tenant_id', true), '')::uuid";

/** SQL expression for the signed-in user (set by the API next to the tenant). */
export const currentUserSql = "nullif(current_setting('app.user_id', true), '')::uuid";

/** Adds `tenant_id uuid not null references organisations(id)`. */
export function tenantColumn(t: Knex.CreateTableBuilder, onDelete: 'CASCADE' | 'RESTRICT' = 'CASCADE'): void {
  t.uuid('tenant_id').notNullable().references('id').inTable('organisations').onDelete(onDelete);
}

export interface TenantRlsOptions {
  /**
   * Create `<table>_tenant_id_idx`. Pass false when the table already has an index whose first
   * column is tenant_id (for example a composite primary key (tenant_id, …)).
   */
  index?: boolean;
}

/** Index + ENABLE + FORCE row-level security + the tenant policy `<table>_tenant_isolation`. */
export async function enableTenantRls(knex: Knex, table: string, options: TenantRlsOptions = {}): Promise<void> {
  if (options.index !== false) {
    await knex.raw('create index ?? on ?? (tenant_id)', [`${table}_tenant_id_idx`, table]);
  }
  await knex.raw('alter table ?? enable row level security', [table]);
  await knex.raw('alter table ?? force row level security', [table]);
  await knex.raw(
    `create policy ?? on ?? for all using (tenant_id = ${currentTenantSql}) with check (tenant_id = ${currentTenantSql})`,
    [`${table}_tenant_isolation`, table],
  );
}

/** Reverse of enableTenantRls (for down migrations). */
export async function disableTenantRls(knex: Knex, table: string, options: TenantRlsOptions = {}): Promise<void> {
  await knex.raw('drop policy if exists ?? on ??', [`${table}_tenant_isolation`, table]);
  await knex.raw('alter table ?? no force row level security', [table]);
  await knex.raw('alter table ?? disable row level security', [table]);
  if (options.index !== false) await knex.raw('drop index if exists ??', [`${table}_tenant_id_idx`]);
}
