import type { Knex } from 'knex';
import { can } from '../auth/permissions';
import { isMutating } from '../lib/csrf';
import { apiRoutes } from '../routes';
import type { AnyRoute } from '../routing/route';
import { ApiClient } from '../test-support/api-client';
import { createOrganisation, type TestOrganisation } from '../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../test-support/test-app';
import { validBodies } from './sites/route-samples';
import { asMember, buildSiteTree, type SiteTree } from './sites/setup-fixtures';
import * as sites from './sites/sites.service';

// Roles, swept over the route table with the organisation's own ids: the auditor changes
// nothing (403 on every mutating route), a plant manager changes no set-up data, and a manager
// sees only the sites they are a member of (404 for the others, exactly like a foreign id).

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let own: SiteTree;
let other: SiteTree;
let auditor: ApiClient;
let manager: ApiClient;

const key = (route: AnyRoute) => `${route.method.toUpperCase()} ${route.path}`;
const tenantActionRoutes = apiRoutes.filter(
  (r) => r.permission !== 'public' && r.permission !== 'authenticated' && r.sessionOnly !== true,
);
const mutating = tenantActionRoutes.filter((r) => isMutating(r.method));
const setUpReads = tenantActionRoutes.filter((r) => r.method === 'get' && r.permission === 'site:read' && /:(site|unit|stack|channel|fuel|permit|limit)Id/.test(r.path) && !r.path.endsWith('/document'));

function fill(route: AnyRoute, ids: Record<string, string>): string {
  return route.path.replace(/:([A-Za-z]+)/g, (_m: string, p: string) => {
    if (!ids[p]) throw new Error(`No id for :${p} in role-sweep.test.ts`);
    return ids[p];
  });
}

function call(client: ApiClient, route: AnyRoute, ids: Record<string, string>) {
  const path = fill(route, ids);
  if (route.method === 'get') return client.get(path);
  if (route.method === 'delete') return client.delete(path);
  if (route.body && !(key(route) in validBodies)) throw new Error(`No valid body for ${key(route)} in route-samples.ts`);
  return client.send(route.method, path, validBodies[key(route)] as object | undefined);
}

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  own = await buildSiteTree(t.db, org, 'Managed Works');
  other = await buildSiteTree(t.db, org, 'Other Works');
  await asMember(t.db, org, 'admin', (ctx) => sites.replaceMembers(ctx, own.siteId, [org.users.manager.id]));
  auditor = await ApiClient.signedIn(t.app, org.users.auditor.email, org.users.auditor.password);
  manager = await ApiClient.signedIn(t.app, org.users.manager.email, org.users.manager.password);
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

// The permission is checked before the id is looked up, so routes of other modules get an id
// that exists nowhere: their 403 must not depend on it.
const nowhere = '00000000-0000-4000-8000-00000000dead';
const ownIds = () => ({ importId: nowhere, ...own, userId: org.users.officer.id });

describe.each(mutating.map((r) => [key(r), r] as const))('%s', (_name, route) => {
  it('responds 403 to the auditor', async () => {
    const res = await call(auditor, route, ownIds());
    expect(res.status).toBe(403);
  });

  if (!can('manager', route.permission)) {
    it("responds 403 to a plant manager, even on the manager's own site", async () => {
      const res = await call(manager, route, ownIds());
      expect(res.status).toBe(403);
    });
  }
});

describe('a plant manager', () => {
  it('lists only the sites they are a member of', async () => {
    const res = await manager.get('/api/sites');
    expect(res.status).toBe(200);
    expect(res.body.items.map((s: { id: string }) => s.id)).toEqual([own.siteId]);
    expect(res.body.total).toBe(1);
  });

  it.each(setUpReads.map((r) => [key(r), r] as const))('reads %s on their site (200) but not on another site (404)', async (_n, route) => {
    expect((await call(manager, route, ownIds())).status).toBe(200);
    expect((await call(manager, route, { ...other, userId: org.users.officer.id })).status).toBe(404);
  });
});

describe('the auditor', () => {
  it('sees every site of the organisation', async () => {
    const res = await auditor.get('/api/sites?sort=name');
    expect(res.body.items.map((s: { name: string }) => s.name)).toEqual(['Managed Works', 'Other Works']);
  });
});
