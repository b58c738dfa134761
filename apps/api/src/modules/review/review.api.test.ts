import type { Knex } from 'knex';
import { randomBytes } from 'node:crypto';
import { CreateChannelBody } from '../channels/channels.schemas';
import * as channels from '../channels/channels.service';
import { onReadingsChanged } from '../readings/readings.hooks';
import { asMember, buildSiteTree, type SiteTree } from '../sites/setup-fixtures';
import { ApiClient } from '../../test-support/api-client';
import { asOwnerInTenant, createOrganisation, type TestOrganisation } from '../../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../../test-support/test-app';

// A natural-gas boiler stack in Europe/Berlin with NOx, O2 and CO2 analysers logging every
// minute for three local days (2–4 November 2026, CET = UTC+1):
//   - NOx 60 mg/Nm3 dry, O2 8 % dry, CO2 7.3 % dry — except
//   - 3 November (local) NOx 150 mg/Nm3: the spike day;
//   - 2 November 09:00–10:00 UTC the O2 analyser reports a fault;
//   - 4 November 06:00–07:00 UTC the CO2 analyser reads 5.0 % (drift).
// Readings are inserted as the schema owner (as a committed import would leave them) and the
// hourly results computed through the readings hook, as the import commit does.

const MIN = 60_000;
const H = 3_600_000;
const FROM = Date.UTC(2026, 10, 1, 23); // 2026-11-02 00:00 Berlin
const DAYS = 3;
const SPIKE_DAY = { from: Date.UTC(2026, 10, 2, 23), to: Date.UTC(2026, 10, 3, 23) };
const O2_FAULT_HOUR = Date.UTC(2026, 10, 2, 9);
const CO2_DRIFT_HOUR = Date.UTC(2026, 10, 4, 6);

/** O2 correction E_ref = E·(21 − O2ref)/(21 − O2) (REFERENCES.md §4, EU form with 21 %). */
const corrected = (mg: number, o2: number, ref: number) => (mg * (21 - ref)) / (21 - o2);

/**
 * CO2max of the fixture gas (CH4 95, C2H6 3, N2 1.5, CO2 0.5 mol %), worked by hand per mole of
 * fuel (REFERENCES.md §1 [derived]): CO2 = 0.95 + 2·0.03 + 0.005 = 1.015; O2 demand = 2·0.95 +
 * 3.5·0.03 = 2.005; N2 = 2.005·0.79/0.21 + 0.015 = 7.5576; dry flue gas 8.5726 → 11.840 % dry.
 */
const CO2_MAX_FIXTURE_GAS = (100 * 1.015) / (1.015 + (2.005 * 0.79) / 0.21 + 0.015);

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let other: TestOrganisation;
let tree: SiteTree;
let o2Id: string;
let co2Id: string;
let limitId: string;
let importId: string;
let officer: ApiClient;
let auditor: ApiClient;
let manager: ApiClient;
let otherAdmin: ApiClient;

async function insertReadings(channelId: string, at: (ms: number) => { value: number | null; status: string }): Promise<void> {
  const ts: string[] = [];
  const values: (number | null)[] = [];
  const statuses: string[] = [];
  for (let ms = FROM; ms < FROM + DAYS * 24 * H; ms += MIN) {
    const r = at(ms);
    ts.push(new Date(ms).toISOString());
    values.push(r.value);
    statuses.push(r.status);
  }
  await asOwnerInTenant(owner, org.id, (trx) =>
    trx.raw(
      `insert into readings (tenant_id, channel_id, t, value, status, import_id, created_by)
       select ?, ?, u.t, u.v, u.s, ?, ? from unnest(?::timestamptz[], ?::float8[], ?::text[]) as u(t, v, s)`,
      [org.id, channelId, importId, org.users.officer.id, ts, values, statuses] as unknown as Knex.RawBinding[],
    ),
  );
}

const reviewPath = (query = '?from=2026-11-02&to=2026-11-05') => `/api/stacks/${tree.stackId}/review${query}`;
const review = (client: ApiClient, query?: string) => client.get(reviewPath(query));

// The hourly series travels as columns on a regular UTC grid (hour i starts at fromMs + i·stepMs),
// statuses and reasons as indexes into legends, and statuses, reasons and coverages as their
// exceptions (entry i is values[k] where at[k] = i, else usual). `hourOf` reads one hour back out.
type Sparse = { usual: number | null; at: number[]; values: (number | null)[] };
type Columns = { value: (number | null)[]; status: Sparse; reason: Sparse; coverage?: Sparse };
const entry = (c: Sparse, i: number) => {
  const k = c.at.indexOf(i);
  return k < 0 ? c.usual : c.values[k]!;
};
type HourlyColumns = {
  fromMs: number;
  stepMs: number;
  count: number;
  statusLegend: string[];
  reasonLegend: string[];
  channels: Record<string, Columns>;
  limits: Record<string, Columns>;
};
type HourEntry = { value: number | null; status: string; reason: string | null; coverage?: number | null };
function hourOf(body: { hourly: HourlyColumns }, ms: number): { hourStart: string; channels: Record<string, HourEntry>; limits: Record<string, HourEntry> } {
  const h = body.hourly;
  const i = (ms - h.fromMs) / h.stepMs;
  if (!(Number.isInteger(i) && i >= 0 && i < h.count)) throw new Error(`${new Date(ms).toISOString()} is not an hour of the review`);
  const at = (columns: Record<string, Columns>) => {
    const out: Record<string, HourEntry> = {};
    for (const [id, c] of Object.entries(columns)) {
      const status = entry(c.status, i);
      if (status === null) continue; // no stored hour
      const reason = h.reasonLegend[entry(c.reason, i)!]!;
      out[id] = {
        value: c.value[i]!,
        status: h.statusLegend[status]!,
        reason: reason === 'none' ? null : reason,
        ...(c.coverage ? { coverage: entry(c.coverage, i) } : {}),
      };
    }
    return out;
  };
  return { hourStart: new Date(h.fromMs + i * h.stepMs).toISOString(), channels: at(h.channels), limits: at(h.limits) };
}

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  other = await createOrganisation(owner);
  tree = await buildSiteTree(t.db, org, 'Review Works');
  await buildSiteTree(t.db, other, 'Other Works');
  await asMember(t.db, org, 'officer', async (ctx) => {
    o2Id = (await channels.createChannel(ctx, tree.stackId, CreateChannelBody.parse({ parameter: 'O2', unit: '%', basis: 'dry', conditions: 'standard', intervalMinutes: 1 }))).id;
    co2Id = (await channels.createChannel(ctx, tree.stackId, CreateChannelBody.parse({ parameter: 'CO2', unit: '%', basis: 'dry', conditions: 'standard', intervalMinutes: 1 }))).id;
  });
  officer = await ApiClient.signedIn(t.app, org.users.officer.email, org.users.officer.password);
  auditor = await ApiClient.signedIn(t.app, org.users.auditor.email, org.users.auditor.password);
  manager = await ApiClient.signedIn(t.app, org.users.manager.email, org.users.manager.password);
  otherAdmin = await ApiClient.signedIn(t.app, other.users.admin.email, other.users.admin.password);

  // The limit under test: NOx daily average ≤ 110 % of 100 mg/Nm3 at 3 % O2, validated (−20 %).
  const created = await officer.post(`/api/permits/${tree.permitId}/limits`, {
    stackId: tree.stackId,
    pollutant: 'NOx',
    elv: 100,
    unit: 'mg/Nm3',
    referenceO2Percent: 3,
    ambientO2Percent: 21,
    basis: 'dry',
    period: 'day',
    criterion: { type: 'every_period', factor: 1.1 },
    confidenceIntervalPercent: 20,
  });
  expect(created.status).toBe(201);
  limitId = created.body.id;

  // The import the readings came from.
  importId = (
    await asOwnerInTenant(owner, org.id, (trx) =>
      trx('imports')
        .insert({
          tenant_id: org.id,
          stack_id: tree.stackId,
          file_name: 'logger-2026-11.xlsx',
          sha256: randomBytes(32).toString('hex'),
          size_bytes: 1234,
          format: 'xlsx',
          uploaded_by: org.users.officer.id,
          timestamp_column: 0,
          timestamp_header: 'Time',
          state: 'committed',
          committed_at: new Date(),
          committed_by: org.users.officer.id,
        })
        .returning('id'),
    )
  )[0].id;
  await owner.raw("select ensure_month_partition('readings', '2026-11-01')");
  await insertReadings(tree.channelId, (ms) => ({ value: ms >= SPIKE_DAY.from && ms < SPIKE_DAY.to ? 150 : 60, status: 'valid' }));
  await insertReadings(o2Id, (ms) => (ms >= O2_FAULT_HOUR && ms < O2_FAULT_HOUR + H ? { value: null, status: 'fault' } : { value: 8, status: 'valid' }));
  await insertReadings(co2Id, (ms) => ({ value: ms >= CO2_DRIFT_HOUR && ms < CO2_DRIFT_HOUR + H ? 5 : 7.3, status: 'valid' }));
  await asMember(t.db, org, 'officer', (ctx) =>
    onReadingsChanged(ctx, { channelIds: [tree.channelId, o2Id, co2Id], from: new Date(FROM), to: new Date(FROM + DAYS * 24 * H) }),
  );
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('GET /api/stacks/:stackId/review', () => {
  it('shows hourly values equal to an independent computation (dry, corrected to the reference O2)', async () => {
    const res = await review(officer);
    expect(res.status).toBe(200);
    expect(res.body.timeZone).toBe('Europe/Berlin');
    expect(res.body.from).toBe('2026-11-01T23:00:00.000Z');
    expect(res.body.to).toBe('2026-11-04T23:00:00.000Z');
    expect(res.body.hourly).toMatchObject({ fromMs: FROM, stepMs: H, count: 72 });
    // Every full column holds one entry per hour of the grid; every sparse one names hours of it, ascending.
    for (const group of [res.body.hourly.channels, res.body.hourly.limits]) {
      for (const columns of Object.values(group) as Columns[]) {
        expect(columns.value).toHaveLength(72);
        for (const sparse of [columns.status, columns.reason, ...(columns.coverage ? [columns.coverage] : [])]) {
          expect(sparse.at).toHaveLength(sparse.values.length);
          expect(sparse.at.every((i, k) => i >= 0 && i < 72 && (k === 0 || i > sparse.at[k - 1]!))).toBe(true);
        }
      }
    }
    expect(Object.keys(res.body.hourly.channels).sort()).toEqual([tree.channelId, o2Id, co2Id].sort());
    expect(Object.keys(res.body.hourly.limits)).toContain(limitId);
    const normal = hourOf(res.body, Date.UTC(2026, 10, 2, 12));
    expect(normal.channels[tree.channelId]).toMatchObject({ value: 60, status: 'valid', coverage: 1, reason: null });
    expect(normal.limits[limitId].status).toBe('valid');
    expect(normal.limits[limitId].value).toBeCloseTo(corrected(60, 8, 3), 6); // 83.08
    // REFERENCES.md §4 check value [derived]: 150 mg/Nm3 at 8 % O2 → 207.69 mg/Nm3 at 3 %.
    const spike = hourOf(res.body, Date.UTC(2026, 10, 3, 12));
    expect(spike.limits[limitId].value).toBeCloseTo(207.69, 2);
  });

  it('makes an hour with invalid O2 invalid for the O2-referenced limit, while the NOx hour stays valid', async () => {
    const res = await review(officer);
    const hour = hourOf(res.body, O2_FAULT_HOUR);
    expect(hour.channels[o2Id]).toMatchObject({ status: 'invalid', reason: 'fault', value: null });
    expect(hour.channels[tree.channelId]).toMatchObject({ status: 'valid', value: 60 });
    expect(hour.limits[limitId]).toMatchObject({ status: 'invalid', reason: 'o2_invalid', value: null });
  });

  it('gives an exceedance verdict with the spike day as its event, and availability over the operating hours', async () => {
    const res = await review(officer);
    const result = res.body.limits.find((l: { limit: { id: string } }) => l.limit.id === limitId);
    expect(result.verdict).toBe('exceedance');
    expect(result.threshold).toBe(110);
    expect(result.exceedances).toHaveLength(1);
    const event = result.exceedances[0];
    expect(event.start).toBe(new Date(SPIKE_DAY.from).toISOString());
    expect(event.end).toBe(new Date(SPIKE_DAY.to).toISOString());
    // Validated daily average = 207.69 − 20 % of the ELV (IED Annex V Part 3 point 10).
    expect(event.peak).toBeCloseTo(corrected(150, 8, 3) - 20, 6);
    expect(event.percentOfElv).toBeCloseTo(corrected(150, 8, 3) - 20, 6);
    expect(result.availabilityPercent).toBeCloseTo((100 * 71) / 72, 6);
    expect(result.invalidDays).toBe(0);
    expect(result.limit.summary).toEqual(expect.any(String));
    // Daily series in the local calendar: three days, the spike day above the threshold.
    expect(res.body.daily.dayStart).toEqual(['2026-11-01T23:00:00.000Z', '2026-11-02T23:00:00.000Z', '2026-11-03T23:00:00.000Z']);
    expect(res.body.daily.dayEnd).toEqual(['2026-11-02T23:00:00.000Z', '2026-11-03T23:00:00.000Z', '2026-11-04T23:00:00.000Z']);
    expect(res.body.daily.limits[limitId].validatedValue[1]).toBeCloseTo(corrected(150, 8, 3) - 20, 6);
    expect(res.body.daily.statusLegend[res.body.daily.limits[limitId].status[1]]).toBe('valid');
    expect(res.body.daily.channels[tree.channelId].value[0]).toBe(60);
  });

  it('flags the hour whose CO2 does not fit the O2 and the fuel’s CO2max', async () => {
    const res = await review(officer);
    expect(res.body.plausibilityCheck.co2MaxPercentDry).toBeCloseTo(CO2_MAX_FIXTURE_GAS, 2);
    expect(res.body.plausibilityCheck.hoursChecked).toBe(71);
    expect(res.body.plausibility).toHaveLength(1);
    const flag = res.body.plausibility[0];
    expect(flag.hourStart).toBe(new Date(CO2_DRIFT_HOUR).toISOString());
    // CO2 = CO2max·(20.9 − O2)/20.9 (REFERENCES.md §1).
    const expected = (CO2_MAX_FIXTURE_GAS * (20.9 - 8)) / 20.9;
    expect(flag.expectedCo2PercentDry).toBeCloseTo(expected, 2);
    expect(flag.deviationPercent).toBeCloseTo((100 * (5 - expected)) / expected, 1);
  });

  it('defaults to the local month of the latest data', async () => {
    const res = await review(officer, '');
    expect(res.status).toBe(200);
    expect(res.body.from).toBe('2026-10-31T23:00:00.000Z');
    expect(res.body.to).toBe('2026-11-30T23:00:00.000Z');
  });

  it('refuses a period longer than a quarter or ending before it starts', async () => {
    expect((await review(officer, '?from=2026-01-01&to=2026-12-01')).status).toBe(400);
    expect((await review(officer, '?from=2026-11-05&to=2026-11-02')).status).toBe(400);
  });

  it('is readable by the auditor', async () => {
    expect((await review(auditor)).status).toBe(200);
  });

  it('answers 304 to a client that holds the current answer, and 200 to one that holds another', async () => {
    const first = await review(officer);
    const etag = first.headers['etag'];
    expect(etag).toMatch(/^"[^"]+"$/); // a strong tag
    expect(first.headers['cache-control']).toBe('private, no-cache');
    const again = await officer.agent.get(reviewPath()).set('If-None-Match', etag);
    expect(again.status).toBe(304);
    expect(again.text ?? '').toBe('');
    expect(again.headers['etag']).toBe(etag);
    const stale = await officer.agent.get(reviewPath()).set('If-None-Match', '"another"');
    expect(stale.status).toBe(200);
    expect(stale.body.hourly.count).toBe(72);
    // Another period is another answer.
    expect((await review(officer, '?from=2026-11-02&to=2026-11-04')).headers['etag']).not.toBe(etag);
  });

  it('sends hours with nothing stored as null statuses (a period reaching past the data)', async () => {
    const res = await review(officer, '?from=2026-11-01&to=2026-11-03');
    expect(res.status).toBe(200);
    const h = res.body.hourly as HourlyColumns;
    const c = h.channels[tree.channelId]!;
    const firstStored = (FROM - h.fromMs) / h.stepMs;
    expect(firstStored).toBeGreaterThan(0);
    for (let i = 0; i < h.count; i++) {
      expect(entry(c.status, i) === null).toBe(i < firstStored);
      expect(c.value[i] === null).toBe(i < firstStored);
    }
    expect(hourOf(res.body, FROM - H).channels[tree.channelId]).toBeUndefined();
    expect(hourOf(res.body, FROM).channels[tree.channelId]).toMatchObject({ status: 'valid', coverage: 1 });
  });

  it('adds how each limit hour was derived (O2, mass rate) only when asked', async () => {
    const plain = await review(officer);
    expect(plain.body.hourly.limits[limitId]).not.toHaveProperty('o2PercentDry');
    const detailed = await review(officer, '?from=2026-11-02&to=2026-11-05&derivation=true');
    expect(detailed.status).toBe(200);
    expect(detailed.headers['etag']).not.toBe(plain.headers['etag']);
    const columns = detailed.body.hourly.limits[limitId];
    const i = (Date.UTC(2026, 10, 2, 12) - detailed.body.hourly.fromMs) / H;
    expect(columns.o2PercentDry).toHaveLength(72);
    expect(columns.o2PercentDry[i]).toBeCloseTo(8, 6); // the O2 analyser's 8 % dry
    expect(columns.massKgPerHour).toHaveLength(72);
    expect(columns.value[i]).toBeCloseTo(corrected(60, 8, 3), 6);
  });

  it('recomputes the limit hours when the limit changes (read after the change)', async () => {
    const tagBefore = (await review(officer)).headers['etag'];
    const before = await officer.get(`/api/permits/${tree.permitId}/limits`);
    const version = before.body.items.find((l: { id: string }) => l.id === limitId).version;
    const patched = await officer.patch(`/api/limits/${limitId}`, { referenceO2Percent: 6, version });
    expect(patched.status).toBe(200);
    const res = await officer.agent.get(reviewPath()).set('If-None-Match', tagBefore);
    expect(res.status).toBe(200); // the client's copy is out of date
    expect(res.headers['etag']).not.toBe(tagBefore);
    expect(hourOf(res.body, Date.UTC(2026, 10, 2, 12)).limits[limitId].value).toBeCloseTo(corrected(60, 8, 6), 6); // 69.23
    const back = await officer.patch(`/api/limits/${limitId}`, { referenceO2Percent: 3, version: patched.body.version });
    expect(back.status).toBe(200);
    const again = await review(officer);
    expect(hourOf(again.body, Date.UTC(2026, 10, 2, 12)).limits[limitId].value).toBeCloseTo(corrected(60, 8, 3), 6);
  });

  it('waits for an import or correction of the stack in progress before recomputing stale hours', async () => {
    const before = await officer.get(`/api/permits/${tree.permitId}/limits`);
    const version = before.body.items.find((l: { id: string }) => l.id === limitId).version;
    const patched = await officer.patch(`/api/limits/${limitId}`, { referenceO2Percent: 6, version });
    expect(patched.status).toBe(200);
    // Another writer of the stack's readings holds the stack's lock (as an import commit does).
    let release!: () => void;
    const held = new Promise<void>((resolve) => (release = resolve));
    let locked!: () => void;
    const lockTaken = new Promise<void>((resolve) => (locked = resolve));
    const writer = owner.transaction(async (trx) => {
      await trx.raw("select pg_advisory_xact_lock(hashtextextended('readings:' || ?, 0))", [tree.stackId]);
      locked();
      await held;
    });
    await lockTaken;
    let settled = false;
    const pending = review(officer).then((res) => {
      settled = true;
      if (res.status !== 200) throw new Error(`review answered ${res.status}: ${JSON.stringify(res.body)}`);
      return res;
    });
    try {
      await new Promise((resolve) => setTimeout(resolve, 400));
      expect(settled).toBe(false);
    } finally {
      release();
      await writer;
    }
    const res = await pending;
    expect(res.status).toBe(200);
    expect(hourOf(res.body, Date.UTC(2026, 10, 2, 12)).limits[limitId].value).toBeCloseTo(corrected(60, 8, 6), 6);
    const back = await officer.patch(`/api/limits/${limitId}`, { referenceO2Percent: 3, version: patched.body.version });
    expect(back.status).toBe(200);
    expect((await review(officer)).status).toBe(200);
  });
});

describe('a manager', () => {
  it('sees the review and readings only of sites they are a member of', async () => {
    expect((await review(manager)).status).toBe(404);
    expect((await manager.get(`/api/channels/${tree.channelId}/readings`)).status).toBe(404);
    const admin = await ApiClient.signedIn(t.app, org.users.admin.email, org.users.admin.password);
    expect((await admin.put(`/api/sites/${tree.siteId}/members`, { userIds: [org.users.manager.id] })).status).toBe(200);
    expect((await review(manager)).status).toBe(200);
    expect((await manager.get(`/api/channels/${tree.channelId}/readings`)).status).toBe(200);
  });

  it('cannot correct readings (403)', async () => {
    const res = await manager.post(`/api/channels/${tree.channelId}/corrections`, {
      from: '2026-11-02T00:00:00Z',
      to: '2026-11-02T01:00:00Z',
      action: 'invalidate',
      reason: 'Not allowed',
    });
    expect(res.status).toBe(403);
  });
});

describe('POST /api/channels/:channelId/corrections', () => {
  const spikeHour = Date.UTC(2026, 10, 3, 12);
  const body = {
    from: new Date(spikeHour).toISOString(),
    to: new Date(spikeHour + H).toISOString(),
    action: 'substitute',
    valuePerReading: 60,
    reason: 'Analyser spike: sample line contaminated, value from the parallel measurement',
  };

  it('is refused to the auditor (403) and leaves the readings alone', async () => {
    const res = await auditor.post(`/api/channels/${tree.channelId}/corrections`, body);
    expect(res.status).toBe(403);
    const hour = hourOf((await review(officer)).body, spikeHour);
    expect(hour.channels[tree.channelId].value).toBe(150);
  });

  it('needs a reason, and a value for a substitution', async () => {
    const noReason = await officer.post(`/api/channels/${tree.channelId}/corrections`, { ...body, reason: '' });
    expect(noReason.status).toBe(400);
    const noValue = await officer.post(`/api/channels/${tree.channelId}/corrections`, { ...body, valuePerReading: undefined });
    expect(noValue.status).toBe(400);
  });

  it('substitutes with new superseding rows, audits it and changes the hourly values', async () => {
    const tagBefore = (await review(officer)).headers['etag'];
    const res = await officer.post(`/api/channels/${tree.channelId}/corrections`, body);
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ action: 'substitute', superseded: 60, inserted: 60, valuePerReading: 60, hoursRecomputed: 1 });

    const after = await officer.agent.get(reviewPath()).set('If-None-Match', tagBefore);
    expect(after.status).toBe(200);
    expect(after.headers['etag']).not.toBe(tagBefore);
    const hour = hourOf(after.body, spikeHour);
    expect(hour.channels[tree.channelId]).toMatchObject({ value: 60, status: 'substituted' });
    expect(hour.limits[limitId].value).toBeCloseTo(corrected(60, 8, 3), 6);
    expect(hour.limits[limitId].status).toBe('substituted');

    const audit = await asMember(t.db, org, 'admin', (ctx) =>
      ctx.db('audit_log').where({ tenant_id: org.id, entity_id: tree.channelId, action: 'readings.substituted' }).select('actor_user_id', 'before', 'after'),
    );
    expect(audit).toHaveLength(1);
    expect(audit[0].actor_user_id).toBe(org.users.officer.id);
    expect(audit[0].after).toMatchObject({ reason: body.reason, superseded: 60, inserted: 60 });
    expect(audit[0].before.readingsByStatus).toEqual([{ status: 'valid', readings: 60, min: 150, max: 150 }]);
  });

  it('keeps the raw rows queryable through the drill-down, with their import', async () => {
    const range = `from=${encodeURIComponent(body.from)}&to=${encodeURIComponent(body.to)}`;
    const current = await auditor.get(`/api/channels/${tree.channelId}/readings?${range}`);
    expect(current.status).toBe(200);
    expect(current.body.items).toHaveLength(60);
    expect(current.body.items.every((r: { status: string; reason: string; current: boolean }) => r.status === 'substituted' && r.reason === body.reason && r.current)).toBe(true);
    expect(current.body.hours).toEqual([expect.objectContaining({ hourStart: body.from, value: 60, status: 'substituted', readingsTotal: 60 })]);

    const all = await auditor.get(`/api/channels/${tree.channelId}/readings?${range}&includeSuperseded=true`);
    expect(all.body.items).toHaveLength(120);
    const raw = all.body.items.filter((r: { current: boolean }) => !r.current);
    expect(raw).toHaveLength(60);
    const replacement = new Map(all.body.items.filter((r: { current: boolean }) => r.current).map((r: { t: string; id: string }) => [r.t, r.id]));
    // The correction's rows name the officer who made it.
    for (const r of all.body.items.filter((item: { current: boolean }) => item.current)) {
      expect(r).toMatchObject({ importId: null, createdBy: org.users.officer.id, createdByName: org.users.officer.name });
    }
    for (const r of raw) {
      expect(r).toMatchObject({ value: 150, status: 'valid', importId, reason: null });
      expect(r.supersededAt).toEqual(expect.any(String));
      expect(r.supersededBy).toBe(replacement.get(r.t));
    }
    expect(all.body.imports).toEqual([expect.objectContaining({ id: importId, fileName: 'logger-2026-11.xlsx', state: 'committed' })]);
  });

  it('invalidates a range: the O2 hour becomes invalid and so does the limit hour', async () => {
    const hourStart = Date.UTC(2026, 10, 4, 3);
    const res = await officer.post(`/api/channels/${o2Id}/corrections`, {
      from: new Date(hourStart).toISOString(),
      to: new Date(hourStart + H).toISOString(),
      action: 'invalidate',
      reason: 'O2 analyser failed its span check',
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ superseded: 60, inserted: 60 });
    const hour = hourOf((await review(officer)).body, hourStart);
    expect(hour.channels[o2Id]).toMatchObject({ status: 'invalid', value: null });
    expect(hour.limits[limitId]).toMatchObject({ status: 'invalid', reason: 'o2_invalid' });
    // Invalidating the same range again finds nothing left to invalidate.
    const again = await officer.post(`/api/channels/${o2Id}/corrections`, {
      from: new Date(hourStart).toISOString(),
      to: new Date(hourStart + H).toISOString(),
      action: 'invalidate',
      reason: 'O2 analyser failed its span check',
    });
    expect(again.status).toBe(422);
  });

  it('fills a gap when substituting beyond the stored readings', async () => {
    const gapFrom = FROM + DAYS * 24 * H; // after the last reading
    const res = await officer.post(`/api/channels/${co2Id}/corrections`, {
      from: new Date(gapFrom).toISOString(),
      to: new Date(gapFrom + 30 * MIN).toISOString(),
      action: 'substitute',
      valuePerReading: 7.3,
      reason: 'CO2 logger offline; value from the fuel balance',
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ superseded: 0, inserted: 30 });
  });
});

describe('another organisation', () => {
  it('gets 404 from every review route and changes nothing', async () => {
    expect((await review(otherAdmin)).status).toBe(404);
    expect((await otherAdmin.get(`/api/channels/${tree.channelId}/readings`)).status).toBe(404);
    const res = await otherAdmin.post(`/api/channels/${tree.channelId}/corrections`, {
      from: '2026-11-02T00:00:00Z',
      to: '2026-11-02T01:00:00Z',
      action: 'invalidate',
      reason: 'Intrusion',
    });
    expect(res.status).toBe(404);
    const hour = hourOf((await review(officer)).body, Date.UTC(2026, 10, 2, 0));
    expect(hour.channels[tree.channelId]).toMatchObject({ value: 60, status: 'valid' });
  });
});
