import type { Knex } from 'knex';
import { ApiClient } from '../../test-support/api-client';
import { createOrganisation, createUser, type TestOrganisation } from '../../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../../test-support/test-app';
import { auditRows } from './setup-fixtures';

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let officer: ApiClient;
let admin: ApiClient;

const northmoor = { name: 'Riverside Mill', timeZone: 'Europe/Berlin', country: 'DE', regime: 'eu_ied', address: 'Mill Lane 1' };

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  officer = await ApiClient.signedIn(t.app, org.users.officer.email, org.users.officer.password);
  admin = await ApiClient.signedIn(t.app, org.users.admin.email, org.users.admin.password);
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('POST /api/sites', () => {
  it('adds a site and records it in the audit trail', async () => {
    const res = await officer.post('/api/sites', northmoor);
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ ...northmoor, version: 1, archivedAt: null });
    const audit = await auditRows(t.db, org, res.body.id);
    expect(audit).toEqual([expect.objectContaining({ action: 'site.created', before: null, actor_user_id: org.users.officer.id })]);
    expect(audit[0].after).toMatchObject({ name: 'Riverside Mill', timeZone: 'Europe/Berlin' });
  });

  it('stores the canonical spelling of a time zone and an upper-case country', async () => {
    const res = await officer.post('/api/sites', { ...northmoor, name: 'Lower case', timeZone: 'america/denver', country: 'us' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ timeZone: 'America/Denver', country: 'US' });
  });

  describe('when the body is not valid', () => {
    it('responds 400 naming each bad field', async () => {
      const res = await officer.post('/api/sites', { name: '', timeZone: 'Mars/Olympus', country: 'XX', regime: 'eu' });
      expect(res.status).toBe(400);
      const paths = res.body.error.details.map((d: { path: string }) => d.path).sort();
      expect(paths).toEqual(['country', 'name', 'regime', 'timeZone']);
    });

    it('refuses a UTC offset instead of an IANA zone', async () => {
      const res = await officer.post('/api/sites', { ...northmoor, timeZone: '+01:00' });
      expect(res.status).toBe(400);
      expect(res.body.error.details[0].path).toBe('timeZone');
    });
  });
});

describe('PATCH /api/sites/:siteId', () => {
  it('changes the site, bumps the version and audits before/after', async () => {
    const created = (await officer.post('/api/sites', { ...northmoor, name: 'Patch Me' })).body;
    const res = await officer.patch(`/api/sites/${created.id}`, { name: 'Patched', version: 1 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ name: 'Patched', version: 2 });
    const audit = await auditRows(t.db, org, created.id);
    expect(audit.map((a) => a.action)).toEqual(['site.created', 'site.updated']);
    expect(audit[1].before).toMatchObject({ name: 'Patch Me', version: 1 });
    expect(audit[1].after).toMatchObject({ name: 'Patched', version: 2 });
  });

  it('responds 409 stale_version when the version is out of date, and changes nothing', async () => {
    const created = (await officer.post('/api/sites', { ...northmoor, name: 'Contested' })).body;
    await officer.patch(`/api/sites/${created.id}`, { name: 'First writer', version: 1 });
    const res = await officer.patch(`/api/sites/${created.id}`, { name: 'Second writer', version: 1 });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('stale_version');
    expect((await officer.get(`/api/sites/${created.id}`)).body.name).toBe('First writer');
  });

  it('responds 400 without a version', async () => {
    const created = (await officer.post('/api/sites', { ...northmoor, name: 'No version' })).body;
    const res = await officer.patch(`/api/sites/${created.id}`, { name: 'x' });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('version');
  });

  it('responds 400 for an id that is not a uuid', async () => {
    const res = await officer.patch('/api/sites/not-a-uuid', { name: 'x', version: 1 });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0]).toMatchObject({ location: 'params', path: 'siteId' });
  });

  it('responds 404 for an unknown id', async () => {
    const res = await officer.patch('/api/sites/7d0c8f0e-1111-4222-8333-444455556666', { name: 'x', version: 1 });
    expect(res.status).toBe(404);
  });
});

describe('GET /api/sites', () => {
  let archivedId: string;
  beforeAll(async () => {
    const res = await officer.post('/api/sites', { ...northmoor, name: 'Zz Archived Works' });
    archivedId = res.body.id;
    const archived = await officer.post(`/api/sites/${archivedId}/archive`, {});
    expect(archived.status).toBe(200);
    expect(archived.body.archivedAt).not.toBeNull();
  });

  it('hides archived sites unless includeArchived=true', async () => {
    const plain = await officer.get('/api/sites?limit=200');
    expect(plain.body.items.map((s: { id: string }) => s.id)).not.toContain(archivedId);
    const all = await officer.get('/api/sites?limit=200&includeArchived=true');
    expect(all.body.items.map((s: { id: string }) => s.id)).toContain(archivedId);
    expect(all.body.total).toBe(plain.body.total + 1);
  });

  it('pages, sorts and searches', async () => {
    const page = await officer.get('/api/sites?limit=1&offset=0&sort=name&order=desc&includeArchived=true');
    expect(page.body.items).toHaveLength(1);
    expect(page.body.items[0].name).toBe('Zz Archived Works');
    expect(page.body.total).toBeGreaterThan(1);
    const byName = await officer.get('/api/sites?q=patched');
    expect(byName.body).toMatchObject({ total: 1, items: [{ name: 'Patched' }] });
  });

  it('treats % and _ in the search text literally', async () => {
    const res = await officer.get('/api/sites?q=%25');
    expect(res.body.total).toBe(0);
  });

  it('responds 400 for an unknown sort field or a limit above 200', async () => {
    expect((await officer.get('/api/sites?sort=password')).status).toBe(400);
    expect((await officer.get('/api/sites?limit=500')).status).toBe(400);
  });

  it('refuses changes to an archived site with 409', async () => {
    const res = await officer.patch(`/api/sites/${archivedId}`, { name: 'Revived', version: 2 });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('archived');
  });
});

describe('PUT /api/sites/:siteId/members', () => {
  it('sets the members who see a site and audits the change', async () => {
    const site = (await officer.post('/api/sites', { ...northmoor, name: 'Members Works' })).body;
    const res = await admin.put(`/api/sites/${site.id}/members`, { userIds: [org.users.manager.id] });
    expect(res.status).toBe(200);
    expect(res.body.items).toEqual([expect.objectContaining({ userId: org.users.manager.id, role: 'manager' })]);
    expect((await officer.get(`/api/sites/${site.id}/members`)).body.items).toHaveLength(1);
    const audit = await auditRows(t.db, org, site.id);
    expect(audit.at(-1)).toMatchObject({ action: 'site.members_replaced', before: { userIds: [] }, after: { userIds: [org.users.manager.id] } });
  });

  it('responds 422 for a user who is not a member of the organisation', async () => {
    const site = (await officer.post('/api/sites', { ...northmoor, name: 'Strangers Works' })).body;
    const stranger = await createUser(owner);
    const res = await admin.put(`/api/sites/${site.id}/members`, { userIds: [org.users.manager.id, stranger.id] });
    expect(res.status).toBe(422);
    expect(res.body.error.details).toEqual([expect.objectContaining({ path: 'userIds.1' })]);
  });

  it('is refused to an officer (403): access is the administrator\'s decision', async () => {
    const site = (await officer.post('/api/sites', { ...northmoor, name: 'Officer Works' })).body;
    expect((await officer.put(`/api/sites/${site.id}/members`, { userIds: [] })).status).toBe(403);
  });
});

describe('GET /api/sites/:siteId', () => {
  it('includes units, stacks with channels, fuels and counts', async () => {
    const site = (await officer.post('/api/sites', { ...northmoor, name: 'Detail Works' })).body;
    const unit = (await officer.post(`/api/sites/${site.id}/units`, { name: 'B1', unitType: 'boiler', ratedThermalInputMWth: 10, inServiceFrom: '2015-01-01' })).body;
    const stack = (await officer.post(`/api/sites/${site.id}/stacks`, { name: 'S1', unitIds: [unit.id] })).body;
    await officer.post(`/api/stacks/${stack.id}/channels`, { parameter: 'O2', unit: '%', basis: 'dry', conditions: 'standard', intervalMinutes: 1 });
    await officer.post(`/api/sites/${site.id}/permits`, { reference: 'D-1', authority: 'Authority', effectiveFrom: '2025-01-01' });
    const res = await officer.get(`/api/sites/${site.id}`);
    expect(res.status).toBe(200);
    expect(res.body.units.map((u: { name: string }) => u.name)).toEqual(['B1']);
    expect(res.body.stacks[0]).toMatchObject({ name: 'S1', unitIds: [unit.id], channels: [expect.objectContaining({ parameter: 'O2' })] });
    expect(res.body.counts).toEqual({ units: 1, stacks: 1, channels: 1, fuels: 0, permits: 1 });
  });
});
