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

const o2 = { parameter: 'O2', unit: '%', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 25, intervalMinutes: 1, sourceLabel: 'O2_DRY' };

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  tree = await buildSiteTree(t.db, org, 'Channels Works');
  officer = await ApiClient.signedIn(t.app, org.users.officer.email, org.users.officer.password);
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('POST /api/stacks/:stackId/channels', () => {
  it('adds a channel, audited', async () => {
    const res = await officer.post(`/api/stacks/${tree.stackId}/channels`, o2);
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ ...o2, stackId: tree.stackId, version: 1 });
    expect((await auditRows(t.db, org, res.body.id))[0]).toMatchObject({ action: 'channel.created', after: { parameter: 'O2' } });
  });

  it('responds 409 for a second live channel of the same parameter and basis', async () => {
    const res = await officer.post(`/api/stacks/${tree.stackId}/channels`, { ...o2, sourceLabel: 'O2_B' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('channel_exists');
  });

  it('accepts the same parameter on the other basis', async () => {
    const res = await officer.post(`/api/stacks/${tree.stackId}/channels`, { ...o2, basis: 'wet', sourceLabel: 'O2_WET' });
    expect(res.status).toBe(201);
  });

  it('responds 400 for a unit that does not fit the parameter', async () => {
    const res = await officer.post(`/api/stacks/${tree.stackId}/channels`, { ...o2, parameter: 'dust', unit: 'ppm' });
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([expect.objectContaining({ path: 'unit', message: 'dust is reported in mg/Nm3, ug/Nm3' })]);
  });

  it('accepts US units: flow in scfh, temperature in °F (and not scfh for a gas concentration)', async () => {
    for (const body of [
      { ...o2, parameter: 'flow', unit: 'scfh', basis: 'wet', rangeMin: 0, rangeMax: 5_000_000, sourceLabel: 'FLOW_SCFH' },
      { ...o2, parameter: 'temperature', unit: 'degF', basis: 'wet', conditions: 'actual', rangeMin: 32, rangeMax: 650, sourceLabel: 'TEMP_F' },
    ]) {
      const res = await officer.post(`/api/stacks/${tree.stackId}/channels`, body);
      expect(res.status).toBe(201);
      expect(res.body.unit).toBe(body.unit);
    }
    expect((await officer.post(`/api/stacks/${tree.stackId}/channels`, { ...o2, parameter: 'SO2', unit: 'scfh' })).status).toBe(400);
  });

  it('responds 400 for an inverted range', async () => {
    const res = await officer.post(`/api/stacks/${tree.stackId}/channels`, { ...o2, parameter: 'CO', unit: 'mg/Nm3', rangeMin: 100, rangeMax: 10 });
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toEqual(['rangeMax']);
  });

  it('responds 400 for an interval of 7 minutes', async () => {
    const res = await officer.post(`/api/stacks/${tree.stackId}/channels`, { ...o2, parameter: 'CO', unit: 'mg/Nm3', intervalMinutes: 7 });
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toEqual(['intervalMinutes']);
  });
});

describe('PATCH /api/channels/:channelId', () => {
  it('changes the range; a stale version gets 409', async () => {
    const res = await officer.patch(`/api/channels/${tree.channelId}`, { rangeMax: 500, version: 1 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ rangeMax: 500, version: 2 });
    expect((await auditRows(t.db, org, tree.channelId)).at(-1)).toMatchObject({ action: 'channel.updated', before: { rangeMax: 400 }, after: { rangeMax: 500 } });
    expect((await officer.patch(`/api/channels/${tree.channelId}`, { rangeMax: 600, version: 1 })).status).toBe(409);
  });

  it('responds 422 when the change makes the unit unfit for the stored parameter', async () => {
    const res = await officer.patch(`/api/channels/${tree.channelId}`, { unit: 'degC', version: 2 });
    expect(res.status).toBe(422);
    expect(res.body.error.details[0].path).toBe('unit');
  });
});

describe('POST /api/channels/:channelId/archive', () => {
  it('frees the parameter for a new channel and hides the old one from the list', async () => {
    const co = (await officer.post(`/api/stacks/${tree.stackId}/channels`, { ...o2, parameter: 'CO', unit: 'mg/Nm3', sourceLabel: 'CO' })).body;
    expect((await officer.post(`/api/channels/${co.id}/archive`, {})).status).toBe(200);
    const list = await officer.get(`/api/stacks/${tree.stackId}/channels`);
    expect(list.body.items.map((c: { id: string }) => c.id)).not.toContain(co.id);
    expect((await officer.get(`/api/stacks/${tree.stackId}/channels?includeArchived=true`)).body.items.map((c: { id: string }) => c.id)).toContain(co.id);
    expect((await officer.post(`/api/stacks/${tree.stackId}/channels`, { ...o2, parameter: 'CO', unit: 'mg/Nm3', sourceLabel: 'CO_NEW' })).status).toBe(201);
  });
});
