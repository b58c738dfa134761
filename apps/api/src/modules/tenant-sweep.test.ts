import type { Knex } from 'knex';
import { apiRoutes } from '../routes';
import type { AnyRoute } from '../routing/route';
import { ApiClient } from '../test-support/api-client';
import { asOwnerInTenant, createOrganisation, type TestOrganisation } from '../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../test-support/test-app';
import { validBodies } from './sites/route-samples';
import { buildSiteTree, type SiteTree } from './sites/setup-fixtures';

// Every route of the route table that takes an id in its path is called by organisation A's
// administrator (who holds every permission) with the id of organisation B's record. Each must
// answer 404 — never 403, never B's data — and must leave B's record untouched.

let t: TestApp;
let owner: Knex;
let a: TestOrganisation;
let b: TestOrganisation;
let aTree: SiteTree;
let bTree: SiteTree;
let adminA: ApiClient;

/** Organisation B's id for each path parameter. A new `:param` in the route table needs an entry. */
let foreignIds: Record<string, string>;

const key = (route: AnyRoute) => `${route.method.toUpperCase()} ${route.path}`;
const paramNames = (path: string) => [...path.matchAll(/:([A-Za-z]+)/g)].map((m) => m[1]);
const routesWithIds = apiRoutes.filter((route) => paramNames(route.path).length > 0);

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  a = await createOrganisation(owner);
  b = await createOrganisation(owner);
  aTree = await buildSiteTree(t.db, a, 'A Works');
  bTree = await buildSiteTree(t.db, b, 'B Works');
  // a bare import record of B (the import module's own tests cover real uploads)
  const [bImport] = await asOwnerInTenant(owner, b.id, (trx) =>
    trx('imports')
      .insert({
        tenant_id: b.id,
        stack_id: bTree.stackId,
        file_name: 'b.xlsx',
        sha256: '0'.repeat(64),
        size_bytes: 1,
        format: 'xlsx',
        uploaded_by: b.users.officer.id,
        timestamp_column: 0,
        timestamp_header: 'Time',
      })
      .returning('id'),
  );
  foreignIds = {
    userId: b.users.officer.id,
    importId: bImport.id,
    siteId: bTree.siteId,
    unitId: bTree.unitId,
    stackId: bTree.stackId,
    channelId: bTree.channelId,
    fuelId: bTree.fuelId,
    permitId: bTree.permitId,
    limitId: bTree.limitId,
  };
  adminA = await ApiClient.signedIn(t.app, a.users.admin.email, a.users.admin.password);
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('the route table', () => {
  it('has routes with ids to sweep (the set-up routes among them)', () => {
    const keys = routesWithIds.map(key);
    expect(keys).toEqual(expect.arrayContaining(['GET /api/sites/:siteId', 'PATCH /api/limits/:limitId', 'PUT /api/permits/:permitId/document']));
  });
});

describe.each(routesWithIds.map((route) => [key(route), route] as const))('%s with an id of another organisation', (name, route) => {
  it('responds 404 and changes nothing', async () => {
    const path = route.path.replace(/:([A-Za-z]+)/g, (_m: string, param: string) => {
      const id = foreignIds[param];
      if (!id) throw new Error(`No foreign id for :${param}; add one to foreignIds in tenant-sweep.test.ts`);
      return id;
    });
    let body: unknown;
    if (route.body) {
      if (!(name in validBodies)) throw new Error(`No valid body for ${name}; add one to validBodies in sites/route-samples.ts`);
      body = validBodies[name];
      // the sample must pass validation, or a 400 would hide a missing tenant check
      expect(route.body.safeParse(body).success).toBe(true);
    }
    const res =
      route.method === 'get'
        ? await adminA.get(path)
        : route.method === 'delete'
          ? await adminA.delete(path)
          : await adminA.send(route.method, path, body as object | undefined);
    expect(res.status).toBe(404);
    expect(JSON.stringify(res.body)).not.toContain('B Works');
  });
});

describe('the same read routes with organisation A\'s own ids (control)', () => {
  it('answer 200, so the 404s above are about ownership', async () => {
    const ownIds: Record<string, string> = { ...aTree, userId: a.users.officer.id };
    const known = (r: AnyRoute) => paramNames(r.path).every((p) => p in ownIds);
    for (const route of routesWithIds.filter((r) => r.method === 'get' && known(r) && r.permission === 'site:read' && !r.path.endsWith('/document'))) {
      const path = route.path.replace(/:([A-Za-z]+)/g, (_m: string, param: string) => ownIds[param]);
      const res = await adminA.get(path);
      expect({ route: key(route), status: res.status }).toEqual({ route: key(route), status: 200 });
    }
  });
});

describe("organisation B's records after the sweep", () => {
  it('are unchanged', async () => {
    const bAdmin = await ApiClient.signedIn(t.app, b.users.admin.email, b.users.admin.password);
    const site = await bAdmin.get(`/api/sites/${bTree.siteId}`);
    expect(site.status).toBe(200);
    expect(site.body).toMatchObject({ name: 'B Works', version: 1, archivedAt: null });
    expect(site.body.units).toHaveLength(1);
    expect(site.body.stacks[0].channels).toHaveLength(1);
    const limit = await bAdmin.get(`/api/permits/${bTree.permitId}/limits`);
    expect(limit.body.items[0]).toMatchObject({ id: bTree.limitId, elv: 100, version: 1 });
  });
});
