import { DEFAULT_F_FACTORS, fFactors } from '@flueledger/calc';
import type { Knex } from 'knex';
import { ApiClient } from '../../test-support/api-client';
import { createOrganisation, type TestOrganisation } from '../../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../../test-support/test-app';
import { auditRows, buildSiteTree, type SiteTree } from '../sites/setup-fixtures';

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let tree: SiteTree;
let officer: ApiClient;

const methane = { CH4: 100 };
/** Wood chips as fired, 30 % moisture — invented but typical (common practice). */
const woodChips = { C: 35.0, H: 4.2, O: 29.0, N: 0.2, S: 0.02, moisture: 30.0, ash: 1.58 };

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  tree = await buildSiteTree(t.db, org, 'Fuels Works');
  officer = await ApiClient.signedIn(t.app, org.users.officer.email, org.users.officer.password);
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('POST /api/sites/:siteId/fuels', () => {
  it('computes F-factors of a gas from its composition, as the browser preview does', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/fuels`, {
      name: 'Methane',
      fuelType: 'natural_gas',
      analysis: { validFrom: '2026-01-01', composition: methane },
    });
    expect(res.status).toBe(201);
    const a = res.body.currentAnalysis;
    expect(res.body.kind).toBe('gas');
    expect(a).toMatchObject({ fFactorSource: 'computed', gcvSource: 'correlation', composition: methane, ultimate: null });
    const expected = fFactors({ kind: 'gas', composition: methane }, { estimateGcv: true });
    expect(a.fdDscfPerMMBtu).toBeCloseTo(expected.fdDscfPerMMBtu, 6);
    expect(a.fcScfPerMMBtu).toBeCloseTo(expected.fcScfPerMMBtu, 6);
    // Method 19 Table 19-2 natural gas: Fd 8710 dscf/MMBtu [pub]; pure methane lies within 2 %
    // of the default for pipeline gas (common practice).
    expect(Math.abs(a.fdDscfPerMMBtu / 8710 - 1)).toBeLessThan(0.02);
    // Fc = 10^6 × 0.321 × %C / GCV (Method 19 §12.3.2) with methane 74.87 % C and HHV 55.5 MJ/kg
    // = 23 861 Btu/lb (REFERENCES.md §6, [derived]) → 1007 scf/MMBtu [derived].
    expect(a.fcScfPerMMBtu).toBeGreaterThan(1007 * 0.99);
    expect(a.fcScfPerMMBtu).toBeLessThan(1007 * 1.01);
    // Methane GCV 39.8 MJ/Nm3 (ISO 6976 at 0 °C / 25 °C combustion, [memory]) within 1 %.
    expect(Math.abs(a.gcvMJPerNm3 / 39.8 - 1)).toBeLessThan(0.01);
    expect((await auditRows(t.db, org, res.body.id))[0]).toMatchObject({ action: 'fuel.created', before: null });
  });

  it('computes wood-chip F-factors from the ultimate analysis with a correlated GCV, and records that', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/fuels`, {
      name: 'Wood chips',
      fuelType: 'wood',
      analysis: { validFrom: '2026-01-01', ultimate: woodChips },
    });
    expect(res.status).toBe(201);
    const a = res.body.currentAnalysis;
    expect(a).toMatchObject({ gcvSource: 'correlation', fFactorSource: 'computed' });
    // Method 19 Table 19-2 wood: Fd 9240 dscf/MMBtu [pub]; a computed value within 5 % (common practice).
    expect(Math.abs(a.fdDscfPerMMBtu / 9240 - 1)).toBeLessThan(0.05);
  });

  it('stores the Method 19 Table 19-2 defaults when asked', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/fuels`, {
      name: 'Gas (defaults)',
      fuelType: 'natural_gas',
      analysis: { validFrom: '2026-01-01', fFactorSource: 'method19_default' },
    });
    expect(res.status).toBe(201);
    // Table 19-2: Fd 8710, Fc 1040 [pub]; Fw 10610 [memory]
    expect(res.body.currentAnalysis).toMatchObject({ fdDscfPerMMBtu: 8710, fcScfPerMMBtu: 1040, fwWscfPerMMBtu: DEFAULT_F_FACTORS['natural-gas'].fwWscfPerMMBtu, fFactorSource: 'method19_default' });
  });

  it('responds 400 when the gas composition does not sum to 100 %', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/fuels`, {
      name: 'Short gas',
      fuelType: 'natural_gas',
      analysis: { validFrom: '2026-01-01', composition: { CH4: 90, N2: 5 } },
    });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0]).toMatchObject({ path: 'analysis.composition' });
  });

  it('responds 400 when the kind does not match the fuel type', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/fuels`, { name: 'Odd', fuelType: 'wood', kind: 'gas' });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('kind');
  });

  it('responds 422 for an ultimate analysis on a gas, and for defaults of an "other" fuel', async () => {
    const gas = await officer.post(`/api/sites/${tree.siteId}/fuels`, {
      name: 'Confused gas',
      fuelType: 'natural_gas',
      analysis: { validFrom: '2026-01-01', ultimate: woodChips },
    });
    expect(gas.status).toBe(422);
    expect(gas.body.error.details[0].path).toBe('ultimate');
    const other = await officer.post(`/api/sites/${tree.siteId}/fuels`, {
      name: 'Mystery',
      fuelType: 'other_solid',
      analysis: { validFrom: '2026-01-01', fFactorSource: 'method19_default' },
    });
    expect(other.status).toBe(422);
    expect(other.body.error.details[0].path).toBe('fFactorSource');
  });
});

describe('POST /api/fuels/:fuelId/analyses', () => {
  it('keeps the history: a new analysis is a new row and becomes current from its date', async () => {
    const fuel = (await officer.post(`/api/sites/${tree.siteId}/fuels`, { name: 'History gas', fuelType: 'natural_gas', analysis: { validFrom: '2025-01-01', composition: methane } })).body;
    const second = await officer.post(`/api/fuels/${fuel.id}/analyses`, { validFrom: '2026-01-01', composition: { CH4: 92, C2H6: 4, N2: 3, CO2: 1 }, gcvMJPerNm3: 39.1 });
    expect(second.status).toBe(201);
    expect(second.body).toMatchObject({ gcvMJPerNm3: 39.1, gcvSource: 'measured' });
    await officer.post(`/api/fuels/${fuel.id}/analyses`, { validFrom: '2099-01-01', composition: methane });
    const history = await officer.get(`/api/fuels/${fuel.id}/analyses?sort=validFrom&order=asc`);
    expect(history.body.items.map((a: { validFrom: string }) => a.validFrom)).toEqual(['2025-01-01', '2026-01-01', '2099-01-01']);
    expect((await officer.get(`/api/fuels/${fuel.id}`)).body.currentAnalysis.id).toBe(second.body.id);
    expect((await auditRows(t.db, org, fuel.id)).at(-1)).toMatchObject({ action: 'fuel.analysis_added' });
  });
});

describe('PATCH /api/fuels/:fuelId', () => {
  it('renames; refuses a change between gas and solid (422); stale version → 409', async () => {
    const fuel = (await officer.post(`/api/sites/${tree.siteId}/fuels`, { name: 'Renamable', fuelType: 'natural_gas' })).body;
    expect(fuel.currentAnalysis).toBeNull();
    const ok = await officer.patch(`/api/fuels/${fuel.id}`, { name: 'Renamed', fuelType: 'propane', version: 1 });
    expect(ok.body).toMatchObject({ name: 'Renamed', fuelType: 'propane', version: 2 });
    const kind = await officer.patch(`/api/fuels/${fuel.id}`, { fuelType: 'wood', version: 2 });
    expect(kind.status).toBe(422);
    expect((await officer.patch(`/api/fuels/${fuel.id}`, { name: 'Late', version: 1 })).status).toBe(409);
  });
});

describe('POST /api/fuels/:fuelId/archive', () => {
  it('hides the fuel from the list unless includeArchived=true', async () => {
    const fuel = (await officer.post(`/api/sites/${tree.siteId}/fuels`, { name: 'Retired fuel', fuelType: 'fuel_oil' })).body;
    await officer.post(`/api/fuels/${fuel.id}/archive`);
    expect((await officer.get(`/api/sites/${tree.siteId}/fuels?limit=200`)).body.items.map((f: { id: string }) => f.id)).not.toContain(fuel.id);
    expect((await officer.get(`/api/sites/${tree.siteId}/fuels?limit=200&includeArchived=true`)).body.items.map((f: { id: string }) => f.id)).toContain(fuel.id);
  });
});
