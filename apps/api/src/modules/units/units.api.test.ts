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

const boiler = { name: 'Boiler 7', unitType: 'boiler', ratedThermalInputMWth: 48, inServiceFrom: '2012-04-01' };

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  tree = await buildSiteTree(t.db, org, 'Units Works');
  otherSite = await buildSiteTree(t.db, org, 'Elsewhere Works');
  officer = await ApiClient.signedIn(t.app, org.users.officer.email, org.users.officer.password);
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('POST /api/sites/:siteId/units', () => {
  it('adds a unit with the fuels it burns, audited', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/units`, { ...boiler, fuelIds: [tree.fuelId] });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ ...boiler, siteId: tree.siteId, fuelIds: [tree.fuelId], inServiceTo: null, version: 1 });
    expect((await auditRows(t.db, org, res.body.id))[0]).toMatchObject({ action: 'emission_unit.created', before: null });
  });

  it('responds 400 for a rated thermal input of 0 and an unknown unit type', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/units`, { ...boiler, ratedThermalInputMWth: 0, unitType: 'furnace' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['ratedThermalInputMWth', 'unitType']);
  });

  it('responds 400 when the unit leaves service before it enters it', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/units`, { ...boiler, inServiceTo: '2011-01-01' });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('inServiceTo');
  });

  it("responds 422 for a fuel of another site", async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/units`, { ...boiler, fuelIds: [otherSite.fuelId] });
    expect(res.status).toBe(422);
    expect(res.body.error.details[0].path).toBe('fuelIds.0');
  });
});

describe('PATCH /api/units/:unitId', () => {
  it('changes the unit and its fuels; a stale version gets 409', async () => {
    const unit = (await officer.post(`/api/sites/${tree.siteId}/units`, { ...boiler, name: 'Boiler 8' })).body;
    const res = await officer.patch(`/api/units/${unit.id}`, { ratedThermalInputMWth: 50.5, fuelIds: [tree.fuelId], version: 1 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ ratedThermalInputMWth: 50.5, fuelIds: [tree.fuelId], version: 2 });
    const audit = await auditRows(t.db, org, unit.id);
    expect(audit[1]).toMatchObject({ action: 'emission_unit.updated', before: { ratedThermalInputMWth: 48, fuelIds: [] }, after: { ratedThermalInputMWth: 50.5 } });
    const stale = await officer.patch(`/api/units/${unit.id}`, { name: 'Late', version: 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale_version');
  });

  it('responds 422 when the new end date is before the stored start', async () => {
    const unit = (await officer.post(`/api/sites/${tree.siteId}/units`, { ...boiler, name: 'Boiler 9' })).body;
    const res = await officer.patch(`/api/units/${unit.id}`, { inServiceTo: '2000-01-01', version: 1 });
    expect(res.status).toBe(422);
    expect(res.body.error.details[0].path).toBe('inServiceTo');
  });
});

describe('POST /api/units/:unitId/archive', () => {
  it('hides the unit from the list unless includeArchived=true', async () => {
    const unit = (await officer.post(`/api/sites/${tree.siteId}/units`, { ...boiler, name: 'Old Boiler' })).body;
    expect((await officer.post(`/api/units/${unit.id}/archive`, { version: 1 })).status).toBe(200);
    const ids = (q: string) => officer.get(`/api/sites/${tree.siteId}/units${q}`).then((r) => r.body.items.map((u: { id: string }) => u.id));
    expect(await ids('')).not.toContain(unit.id);
    expect(await ids('?includeArchived=true')).toContain(unit.id);
    expect((await officer.get(`/api/units/${unit.id}`)).body.archivedAt).not.toBeNull();
  });

  it('responds 409 when archiving with a stale version', async () => {
    const unit = (await officer.post(`/api/sites/${tree.siteId}/units`, { ...boiler, name: 'Contested Boiler' })).body;
    await officer.patch(`/api/units/${unit.id}`, { name: 'Renamed', version: 1 });
    expect((await officer.post(`/api/units/${unit.id}/archive`, { version: 1 })).status).toBe(409);
  });
});

describe('GET /api/sites/:siteId/units', () => {
  it('sorts by rated thermal input', async () => {
    const res = await officer.get(`/api/sites/${tree.siteId}/units?sort=ratedThermalInputMWth&order=asc`);
    const inputs = res.body.items.map((u: { ratedThermalInputMWth: number }) => u.ratedThermalInputMWth);
    expect(inputs).toEqual([...inputs].sort((x, y) => x - y));
    expect(inputs[0]).toBe(20);
  });
});
