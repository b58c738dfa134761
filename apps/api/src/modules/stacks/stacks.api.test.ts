import type { Knex } from 'knex';
import { ApiClient } from '../../test-support/api-client';
import { createOrganisation, type TestOrganisation } from '../../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../../test-support/test-app';
import { auditRows, buildSiteTree, type SiteTree } from '../sites/setup-fixtures';

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let tree: SiteTree;
let otherSite: SiteTree;
let officer: ApiClient;

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  tree = await buildSiteTree(t.db, org, 'Stacks Works');
  otherSite = await buildSiteTree(t.db, org, 'Elsewhere Works');
  officer = await ApiClient.signedIn(t.app, org.users.officer.email, org.users.officer.password);
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('POST /api/sites/:siteId/stacks', () => {
  it('can add a stack that several units exhaust through', async () => {
    const unit2 = (await officer.post(`/api/sites/${tree.siteId}/units`, { name: 'Boiler B', unitType: 'boiler', ratedThermalInputMWth: 8, inServiceFrom: '2019-01-01' })).body;
    const res = await officer.post(`/api/sites/${tree.siteId}/stacks`, { name: 'Common stack', heightM: 60, diameterM: 2.4, unitIds: [tree.unitId, unit2.id] });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ name: 'Common stack', heightM: 60, diameterM: 2.4, version: 1 });
    expect([...res.body.unitIds].sort()).toEqual([tree.unitId, unit2.id].sort());
    expect((await auditRows(t.db, org, res.body.id))[0].action).toBe('stack.created');
  });

  it('responds 400 for a negative height', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/stacks`, { name: 'Bad', heightM: -3 });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('heightM');
  });

  it('refuses a unit of another site (422)', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/stacks`, { name: 'Mixed', unitIds: [otherSite.unitId] });
    expect(res.status).toBe(422);
    expect(res.body.error.details[0].path).toBe('unitIds.0');
  });
});

describe('GET /api/stacks/:stackId', () => {
  it('includes the live channels', async () => {
    const res = await officer.get(`/api/stacks/${tree.stackId}`);
    expect(res.status).toBe(200);
    expect(res.body.channels).toEqual([expect.objectContaining({ id: tree.channelId, parameter: 'NOx', unit: 'mg/Nm3', basis: 'dry' })]);
  });
});

describe('PATCH /api/stacks/:stackId', () => {
  it('changes the stack; a stale version gets 409 stale_version', async () => {
    const stack = (await officer.post(`/api/sites/${tree.siteId}/stacks`, { name: 'To rename' })).body;
    const ok = await officer.patch(`/api/stacks/${stack.id}`, { name: 'Renamed', heightM: null, version: 1 });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ name: 'Renamed', heightM: null, version: 2 });
    const audit = await auditRows(t.db, org, stack.id);
    expect(audit[1]).toMatchObject({ action: 'stack.updated', before: { name: 'To rename' }, after: { name: 'Renamed' } });
    const stale = await officer.patch(`/api/stacks/${stack.id}`, { name: 'Again', version: 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale_version');
  });
});

describe('POST /api/stacks/:stackId/archive', () => {
  it('archives instead of deleting: the stack leaves the list, keeps its channels', async () => {
    const stack = (await officer.post(`/api/sites/${tree.siteId}/stacks`, { name: 'Retired stack' })).body;
    await officer.post(`/api/stacks/${stack.id}/channels`, { parameter: 'CO', unit: 'mg/Nm3', basis: 'dry', conditions: 'standard', intervalMinutes: 15 });
    const res = await officer.post(`/api/stacks/${stack.id}/archive`);
    expect(res.status).toBe(200);
    const list = await officer.get(`/api/sites/${tree.siteId}/stacks`);
    expect(list.body.items.map((s: { id: string }) => s.id)).not.toContain(stack.id);
    const all = await officer.get(`/api/sites/${tree.siteId}/stacks?includeArchived=true`);
    expect(all.body.items.map((s: { id: string }) => s.id)).toContain(stack.id);
    expect((await officer.get(`/api/stacks/${stack.id}`)).body.channels).toHaveLength(1);
    expect((await auditRows(t.db, org, stack.id)).at(-1)).toMatchObject({ action: 'stack.archived', before: { archivedAt: null } });
  });
});
