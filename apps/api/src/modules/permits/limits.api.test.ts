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
let turbineId: string;

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  tree = await buildSiteTree(t.db, org, 'Limits Works');
  otherSite = await buildSiteTree(t.db, org, 'Elsewhere Works');
  officer = await ApiClient.signedIn(t.app, org.users.officer.email, org.users.officer.password);
  turbineId = (await officer.post(`/api/sites/${tree.siteId}/units`, { name: 'GT', unitType: 'gas_turbine', ratedThermalInputMWth: 9, inServiceFrom: '2020-01-01', fuelIds: [tree.fuelId] })).body.id;
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('POST /api/permits/:permitId/limits', () => {
  it('pre-fills reference O2 from the regime, unit and fuel: 3 % for a gas boiler (IED Annex V Part 1)', async () => {
    const res = await officer.post(`/api/permits/${tree.permitId}/limits`, { stackId: tree.stackId, pollutant: 'CO', elv: 100, unit: 'mg/Nm3', period: 'day' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ referenceO2Percent: 3, ambientO2Percent: 21, basis: 'dry', effectiveFrom: '2025-01-01', nearMissPercent: 90, excludeStatuses: ['startup-shutdown'] });
    expect(res.body.summary).toBe('CO ≤ 100 mg/Nm3, dry, 3 % O2, daily average, every day ≤ ELV');
    expect((await auditRows(t.db, org, res.body.id))[0]).toMatchObject({ action: 'limit.created', before: null });
  });

  it('pre-fills 15 % O2 for a gas turbine (IED Annex V Part 1) and keeps a given value', async () => {
    const prefilled = await officer.post(`/api/permits/${tree.permitId}/limits`, { unitId: turbineId, pollutant: 'NOx', elv: 50, unit: 'mg/Nm3', period: 'day' });
    expect(prefilled.body.referenceO2Percent).toBe(15);
    const given = await officer.post(`/api/permits/${tree.permitId}/limits`, { unitId: turbineId, pollutant: 'CO', elv: 100, unit: 'mg/Nm3', period: 'day', referenceO2Percent: 11 });
    expect(given.body.referenceO2Percent).toBe(11);
  });

  it('responds 400 naming the field: both a stack and a unit, a rolling period without length, a share above 1', async () => {
    const both = await officer.post(`/api/permits/${tree.permitId}/limits`, { stackId: tree.stackId, unitId: tree.unitId, pollutant: 'NOx', elv: 100, unit: 'mg/Nm3', period: 'day' });
    expect(both.status).toBe(400);
    expect(both.body.error.details[0].path).toBe('stackId');
    const rolling = await officer.post(`/api/permits/${tree.permitId}/limits`, { stackId: tree.stackId, pollutant: 'NOx', elv: 100, unit: 'mg/Nm3', period: 'rolling_days' });
    expect(rolling.body.error.details[0].path).toBe('periodLength');
    const share = await officer.post(`/api/permits/${tree.permitId}/limits`, { stackId: tree.stackId, pollutant: 'NOx', elv: 100, unit: 'mg/Nm3', period: 'hour', criterion: { type: 'share_of_periods', share: 95, factor: 2 } });
    expect(share.status).toBe(400);
    expect(share.body.error.details[0].path).toBe('criterion.share');
  });

  it('responds 400 for O2 as a pollutant and for a reference O2 on a lb/MMBtu limit', async () => {
    expect((await officer.post(`/api/permits/${tree.permitId}/limits`, { stackId: tree.stackId, pollutant: 'O2', elv: 3, unit: 'mg/Nm3', period: 'day' })).status).toBe(400);
    const res = await officer.post(`/api/permits/${tree.permitId}/limits`, { stackId: tree.stackId, pollutant: 'NOx', elv: 0.2, unit: 'lb/MMBtu', period: 'day', referenceO2Percent: 3 });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('referenceO2Percent');
  });

  it('responds 422 for a stack of another site', async () => {
    const res = await officer.post(`/api/permits/${tree.permitId}/limits`, { stackId: otherSite.stackId, pollutant: 'NOx', elv: 100, unit: 'mg/Nm3', period: 'day' });
    expect(res.status).toBe(422);
    expect(res.body.error.details[0].path).toBe('stackId.0');
  });
});

describe('PATCH /api/limits/:limitId', () => {
  it('changes the rule, recomputes the summary, audits before/after; stale → 409', async () => {
    const res = await officer.patch(`/api/limits/${tree.limitId}`, { period: 'hour', criterion: { type: 'share_of_periods', share: 0.95, factor: 2 }, version: 1 });
    expect(res.status).toBe(200);
    expect(res.body.summary).toBe('NOx ≤ 100 mg/Nm3, dry, 3 % O2, hourly average, validated (\u221220 %), 95 % of hours ≤ 200 % of ELV');
    const audit = await auditRows(t.db, org, tree.limitId);
    expect(audit.at(-1)).toMatchObject({ action: 'limit.updated', before: { period: 'day' }, after: { period: 'hour', version: 2 } });
    const stale = await officer.patch(`/api/limits/${tree.limitId}`, { elv: 90, version: 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale_version');
  });

  it('moves between rolling and fixed periods, dropping the window length', async () => {
    const created = (await officer.post(`/api/permits/${tree.permitId}/limits`, { stackId: tree.stackId, pollutant: 'SO2', elv: 35, unit: 'mg/Nm3', period: 'rolling_days', periodLength: 30, operatingPeriodsOnly: false })).body;
    expect(created.summary).toContain('30-day rolling average');
    const res = await officer.patch(`/api/limits/${created.id}`, { period: 'month', version: 1 });
    expect(res.body).toMatchObject({ period: 'month', periodLength: null });
  });

  it('keeps minValidHoursPerDay and minData in step', async () => {
    const res = await officer.patch(`/api/limits/${tree.limitId}`, { minValidHoursPerDay: 18, version: 2 });
    expect(res.body).toMatchObject({ minValidHoursPerDay: 18, minData: { minValidHoursPerDay: 18 } });
  });
});

describe('POST /api/limits/:limitId/archive', () => {
  it('hides the limit from the list and the permit unless includeArchived=true', async () => {
    const l = (await officer.post(`/api/permits/${tree.permitId}/limits`, { stackId: tree.stackId, pollutant: 'dust', elv: 5, unit: 'mg/Nm3', period: 'day' })).body;
    await officer.post(`/api/limits/${l.id}/archive`);
    expect((await officer.get(`/api/permits/${tree.permitId}/limits`)).body.items.map((x: { id: string }) => x.id)).not.toContain(l.id);
    expect((await officer.get(`/api/permits/${tree.permitId}/limits?includeArchived=true`)).body.items.map((x: { id: string }) => x.id)).toContain(l.id);
    expect((await officer.get(`/api/permits/${tree.permitId}`)).body.limits.map((x: { id: string }) => x.id)).not.toContain(l.id);
  });
});

describe('GET /api/limit-defaults', () => {
  it('answers the IED default for a biomass boiler: 6 % O2', async () => {
    const res = await officer.get('/api/limit-defaults?regime=eu_ied&unitType=boiler&fuelKind=solid');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ referenceO2Percent: 6, ambientO2Percent: 21 });
  });

  it('responds 400 without a regime', async () => {
    const res = await officer.get('/api/limit-defaults?unitType=boiler');
    expect(res.status).toBe(400);
    expect(res.body.error.details[0]).toMatchObject({ location: 'query', path: 'regime' });
  });
});
