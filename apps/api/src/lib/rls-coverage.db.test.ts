import type { Knex } from 'knex';
import { createOwnerDb } from '../test-support/test-app';

// Sweep of the live schema: every table with a tenant_id column must have row-level security
// ENABLEd and FORCEd, a policy comparing tenant_id with app.tenant_id, and an index led by tenant_id.
// A new migration that forgets enableTenantRls() fails here.

interface TenantTable {
  table: string;
  rls: boolean;
  forced: boolean;
  policies: string[];
  indexed: boolean;
}

let owner: Knex;
let tenantTables: TenantTable[];

beforeAll(async () => {
  owner = createOwnerDb();
  const { rows } = await owner.raw(`
    select c.relname as table,
           c.relrowsecurity as rls,
           c.relforcerowsecurity as forced,
           coalesce((select array_agg(coalesce(p.qual, '') || ' ' || coalesce(p.with_check, ''))
                       from pg_policies p where p.schemaname = 'public' and p.tablename = c.relname), '{}') as policies,
           exists (select 1 from pg_index i
                     join pg_attribute a on a.attrelid = i.indrelid and a.attnum = i.indkey[0]
                    where i.indrelid = c.oid and a.attname = 'tenant_id') as indexed
      from information_schema.columns col
      join pg_class c on c.relname = col.table_name
      join pg_namespace n on n.oid = c.relnamespace and n.nspname = col.table_schema
     where col.table_schema = 'public' and col.column_name = 'tenant_id' and c.relkind in ('r', 'p')
     order by c.relname`);
  tenantTables = rows;
});

afterAll(() => owner.destroy());

describe('every table with a tenant_id column', () => {
  it('includes the foundation tables (the sweep sees the schema)', () => {
    expect(tenantTables.map((t) => t.table)).toEqual(expect.arrayContaining(['memberships', 'audit_log']));
  });

  it('has row-level security enabled and forced', () => {
    const offenders = tenantTables.filter((t) => !t.rls || !t.forced).map((t) => t.table);
    expect(offenders).toEqual([]);
  });

  it('has a policy that compares tenant_id with app.tenant_id', () => {
    const offenders = tenantTables
      .filter((t) => !t.policies.some((p) => p.includes('tenant_id') && p.includes("current_setting('app.tenant_id'")))
      .map((t) => t.table);
    expect(offenders).toEqual([]);
  });

  it('has an index led by tenant_id', () => {
    expect(tenantTables.filter((t) => !t.indexed).map((t) => t.table)).toEqual([]);
  });
});

describe('organisations', () => {
  it('has row-level security enabled and forced too', async () => {
    const { rows } = await owner.raw("select relrowsecurity, relforcerowsecurity from pg_class where relname = 'organisations'");
    expect(rows[0]).toEqual({ relrowsecurity: true, relforcerowsecurity: true });
  });
});
