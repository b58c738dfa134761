import type { Knex } from 'knex';
import { randomUUID } from 'node:crypto';
import { isMutating } from '../lib/csrf';
import { listRoutes } from '../routes';
import { ApiClient } from '../test-support/api-client';
import { createOrganisation, testPassword, type TestOrganisation } from '../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../test-support/test-app';

// Every route that changes tenant data, straight from the route table: a new module's routes are
// swept automatically.
const mutatingRoutes = listRoutes().filter((r) => isMutating(r.method) && !r.sessionOnly);

function fillParams(path: string): string {
  return path.replace(/:([A-Za-z0-9_]+)/g, () => randomUUID());
}

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let auditor: ApiClient;

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  auditor = await ApiClient.signedIn(t.app, org.users.auditor.email, testPassword);
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('an auditor', () => {
  it('has mutating routes to be refused (the sweep is not empty)', () => {
    expect(mutatingRoutes.length).toBeGreaterThan(0);
  });

  it.each(mutatingRoutes.map((r) => [`${r.method} ${r.path}`, r] as const))('gets 403 from %s', async (_name, route) => {
    const method = route.method.toLowerCase() as 'post' | 'put' | 'patch' | 'delete';
    const res = await auditor.send(method, fillParams(route.path), method === 'delete' ? undefined : {});
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('forbidden');
  });

  it('still reads the audit trail and the members', async () => {
    expect((await auditor.get('/api/audit-log')).status).toBe(200);
    expect((await auditor.get('/api/members')).status).toBe(200);
  });
});
