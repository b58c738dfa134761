import type { Knex } from 'knex';
import { asOwnerInTenant, createOrganisation, createUser, type TestOrganisation } from '../test-support/fixtures';
import { createOwnerDb, testEnv } from '../test-support/test-app';
import { createDb, withScope } from './db';

// Row-level security, seen from the API's own database role (flueledger_app): inside organisation
// A's transaction, organisation B does not exist.

let app: Knex;
let owner: Knex;
let a: TestOrganisation;
let b: TestOrganisation;

beforeAll(async () => {
  app = createDb(testEnv());
  owner = createOwnerDb();
  a = await createOrganisation(owner);
  b = await createOrganisation(owner);
  for (const org of [a, b]) {
    await asOwnerInTenant(owner, org.id, (trx) =>
      trx('audit_log').insert({ tenant_id: org.id, actor_user_id: org.users.admin.id, action: 'test.recorded', entity: 'test' }),
    );
  }
});

afterAll(async () => {
  await app.destroy();
  await owner.destroy();
});

const inA = <T>(work: (trx: Knex.Transaction) => Promise<T>) => withScope(app, { tenantId: a.id, userId: a.users.admin.id }, work);
const inB = <T>(work: (trx: Knex.Transaction) => Promise<T>) => withScope(app, { tenantId: b.id, userId: b.users.admin.id }, work);

describe('the API role inside organisation A', () => {
  it('connects as a role that is neither superuser, nor BYPASSRLS, nor the owner of tenant tables', async () => {
    const { rows } = await app.raw(`select rolsuper, rolbypassrls, current_user as role,
      (select tableowner from pg_tables where tablename = 'memberships') as owner from pg_roles where rolname = current_user`);
    expect(rows[0]).toEqual({ rolsuper: false, rolbypassrls: false, role: 'flueledger_app', owner: 'flueledger_owner' });
  });

  it.each(['memberships', 'audit_log'])("cannot read B's %s rows, even asking for them by tenant_id", async (table) => {
    const [own, foreign, all] = await inA(async (trx) => [
      await trx(table).where({ tenant_id: a.id }),
      await trx(table).where({ tenant_id: b.id }),
      await trx(table).distinct('tenant_id'),
    ]);
    expect(own.length).toBeGreaterThan(0);
    expect(foreign).toHaveLength(0);
    expect(all.map((r: { tenant_id: string }) => r.tenant_id)).toEqual([a.id]);
  });

  it('sees only organisation A', async () => {
    const ids = await inA((trx) => trx('organisations').whereIn('id', [a.id, b.id]).pluck('id'));
    expect(ids).toEqual([a.id]);
  });

  it("cannot update B's memberships or organisation", async () => {
    const [memberships, organisations] = await inA(async (trx) => [
      await trx('memberships').where({ tenant_id: b.id }).update({ role: 'auditor' }),
      await trx('organisations').where({ id: b.id }).update({ name: 'Taken over' }),
    ]);
    expect(memberships).toBe(0);
    expect(organisations).toBe(0);
    const admin = await inB((trx) => trx('memberships').where({ tenant_id: b.id, user_id: b.users.admin.id }).first('role'));
    expect(admin.role).toBe('admin');
    expect((await inB((trx) => trx('organisations').where({ id: b.id }).first('name'))).name).toBe(b.name);
  });

  it("cannot delete B's memberships or organisation", async () => {
    const [memberships, organisations] = await inA(async (trx) => [
      await trx('memberships').where({ tenant_id: b.id }).delete(),
      await trx('organisations').where({ id: b.id }).delete(),
    ]);
    expect(memberships).toBe(0);
    expect(organisations).toBe(0);
    expect(await inB((trx) => trx('memberships').where({ tenant_id: b.id }))).toHaveLength(4);
  });

  it('cannot insert rows into B', async () => {
    const stranger = await createUser(owner);
    await expect(inA((trx) => trx('memberships').insert({ tenant_id: b.id, user_id: stranger.id, role: 'admin' }))).rejects.toThrow(
      /row-level security/,
    );
    await expect(inA((trx) => trx('audit_log').insert({ tenant_id: b.id, action: 'forged', entity: 'test' }))).rejects.toThrow(
      /row-level security/,
    );
  });

  it("cannot move a row of A into B", async () => {
    await expect(
      inA((trx) => trx('memberships').where({ tenant_id: a.id, user_id: a.users.manager.id }).update({ tenant_id: b.id })),
    ).rejects.toThrow(/row-level security/);
  });

  it("cannot see B's people", async () => {
    const visible = await inA((trx) => trx('users').whereIn('id', [a.users.officer.id, b.users.officer.id]).pluck('id'));
    expect(visible).toEqual([a.users.officer.id]);
  });
});

describe('the API role without a tenant', () => {
  it('sees no tenant rows at all', async () => {
    const counts = await withScope(app, { tenantId: null, userId: null }, async (trx) => [
      (await trx('memberships').whereIn('tenant_id', [a.id, b.id])).length,
      (await trx('audit_log').whereIn('tenant_id', [a.id, b.id])).length,
      (await trx('organisations').whereIn('id', [a.id, b.id])).length,
      (await trx('users').whereIn('id', [a.users.admin.id, b.users.admin.id])).length,
    ]);
    expect(counts).toEqual([0, 0, 0, 0]);
  });

  it('sees its own memberships and their organisations once the user is known (sign-in, switcher)', async () => {
    const rows = await withScope(app, { tenantId: null, userId: a.users.officer.id }, (trx) =>
      trx('memberships as m').join('organisations as o', 'o.id', 'm.tenant_id').select('o.id', 'm.role', 'm.user_id'),
    );
    expect(rows).toEqual([{ id: a.id, role: 'officer', user_id: a.users.officer.id }]);
  });

  it('leaves no tenant behind on a pooled connection after the transaction', async () => {
    await inA((trx) => trx.raw('select 1'));
    const { rows } = await app.raw("select nullif(current_setting('app.tenant_id', true), '') as tenant");
    expect(rows[0].tenant).toBeNull();
  });
});
