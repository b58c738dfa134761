import type { Knex } from 'knex';
import { withScope } from '../../lib/db';
import { type TestOrganisation, asOwnerInTenant, createOrganisation } from '../../test-support/fixtures';
import { type TestApp, createOwnerDb, createTestApp } from '../../test-support/test-app';
import { type SiteTree, buildSiteTree } from '../sites/setup-fixtures';
import type { ChannelHourRow } from './channel-hours';
import type { LimitHourRow } from './limit-hours';
import { currentReadingSpans, ensureHourlyPartitions, loadChannelHours, loadLimitHours, replaceChannelHoursOf, replaceLimitHours } from './results.repo';

const H = 3_600_000;
/** Current readings at these instants: one in September, a run in November, one in December. */
const SEPTEMBER = Date.UTC(2026, 8, 10, 12);
const NOV_FIRST = Date.UTC(2026, 10, 2, 0);
const NOV_LAST = Date.UTC(2026, 10, 3, 23, 59);
const DECEMBER = Date.UTC(2026, 11, 5, 6);

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let tree: SiteTree;

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  tree = await buildSiteTree(t.db, org, 'Spans Works');
  for (const month of ['2026-09-01', '2026-11-01', '2026-12-01']) await owner.raw("select ensure_month_partition('readings', ?)", [month]);
  const instants = [SEPTEMBER, DECEMBER];
  for (let ms = NOV_FIRST; ms <= NOV_LAST; ms += 60_000) instants.push(ms);
  await asOwnerInTenant(owner, org.id, (trx) =>
    trx('readings').insert(instants.map((ms) => ({ tenant_id: org.id, channel_id: tree.channelId, t: new Date(ms), value: 50, status: 'valid', created_by: org.users.officer.id }))),
  );
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

const spanOf = (fromMs: number, toMs: number) =>
  withScope(t.db, { tenantId: org.id, userId: org.users.officer.id }, (db) => currentReadingSpans({ tenantId: org.id, db }, [tree.channelId], fromMs, toMs)).then((m) =>
    m.get(tree.channelId),
  );

describe('currentReadingSpans', () => {
  it('gives the exact first and last reading when the range holds them all', async () => {
    expect(await spanOf(Date.UTC(2026, 8, 1), Date.UTC(2027, 0, 1))).toEqual({ first: SEPTEMBER, last: DECEMBER });
  });

  it('gives a reading before the range and one after it when there are such (callers only clip with them)', async () => {
    const from = NOV_FIRST + 5 * H;
    const to = NOV_LAST - 5 * H;
    const span = (await spanOf(from, to))!;
    expect(span.first).toBeLessThan(from);
    expect(span.last).toBeGreaterThanOrEqual(to);
  });

  it('finds the nearest readings across months with nothing in between', async () => {
    // October holds nothing: the span seen from October reaches back to September and on to November.
    const span = (await spanOf(Date.UTC(2026, 9, 1), Date.UTC(2026, 10, 1)))!;
    expect(span.first).toBeLessThan(Date.UTC(2026, 9, 1));
    expect(span.last).toBeGreaterThanOrEqual(Date.UTC(2026, 10, 1));
  });

  it('gives the real last reading before a range after all data, and the real first after a range before it', async () => {
    expect((await spanOf(Date.UTC(2027, 0, 1), Date.UTC(2027, 1, 1)))!.last).toBe(DECEMBER);
    expect((await spanOf(Date.UTC(2026, 7, 1), Date.UTC(2026, 8, 1)))!.first).toBe(SEPTEMBER);
  });

  it('leaves out a channel without current readings', async () => {
    const other = await withScope(t.db, { tenantId: org.id, userId: org.users.officer.id }, (db) =>
      currentReadingSpans({ tenantId: org.id, db }, ['00000000-0000-4000-8000-000000000000'], Date.UTC(2026, 10, 1), Date.UTC(2026, 11, 1)),
    );
    expect(other.size).toBe(0);
  });
});

describe('hourly writes read back field for field', () => {
  const OCTOBER = Date.UTC(2026, 9, 1);
  const scope = <T>(work: (s: { tenantId: string; db: Knex.Transaction }) => Promise<T>) =>
    withScope(t.db, { tenantId: org.id, userId: org.users.officer.id }, (db) => work({ tenantId: org.id, db }));

  it('stores every field of channel hours: nulls, counts, coverage, reasons', async () => {
    const rows: ChannelHourRow[] = [
      { hourStart: OCTOBER, value: 61.25, status: 'valid', coverage: 1, readingsValid: 60, readingsTotal: 60, reason: null },
      { hourStart: OCTOBER + H, value: 0.1 + 0.2, status: 'valid', coverage: 0.75, readingsValid: 45, readingsTotal: 58, reason: null },
      { hourStart: OCTOBER + 2 * H, value: null, status: 'invalid', coverage: 0.2, readingsValid: 12, readingsTotal: 60, reason: 'Kalibrierung — calibration ✓' },
      { hourStart: OCTOBER + 3 * H, value: -0.5, status: 'substituted', coverage: 0, readingsValid: 0, readingsTotal: 0, reason: '' },
    ];
    const stored = await scope(async (s) => {
      await ensureHourlyPartitions(s, OCTOBER, OCTOBER + 4 * H);
      await replaceChannelHoursOf(s, [tree.channelId], OCTOBER, OCTOBER + 4 * H, new Map([[tree.channelId, rows]]));
      return loadChannelHours(s, [tree.channelId], OCTOBER, OCTOBER + 4 * H);
    });
    expect(stored.map(({ channelId, computedAt, ...row }) => (channelId === tree.channelId && computedAt > 0 ? row : null))).toEqual(rows);
  });

  it('stores every field of limit hours, nulls included', async () => {
    const rows: LimitHourRow[] = [
      { hourStart: OCTOBER, value: 182.4, status: 'valid', reason: null, o2PercentDry: 3.2, coverage: 1, dryMgPerNm3: 190.1, massKgPerHour: 12.5, channelId: tree.channelId },
      { hourStart: OCTOBER + H, value: null, status: 'invalid', reason: 'O2 missing', o2PercentDry: null, coverage: null, dryMgPerNm3: null, massKgPerHour: null, channelId: tree.channelId },
    ];
    const stored = await scope(async (s) => {
      await ensureHourlyPartitions(s, OCTOBER, OCTOBER + 2 * H);
      await replaceLimitHours(s, tree.limitId, OCTOBER, OCTOBER + 2 * H, rows);
      return loadLimitHours(s, [tree.limitId], OCTOBER, OCTOBER + 2 * H);
    });
    expect(stored.map(({ limitId, computedAt, ...row }) => (limitId === tree.limitId && computedAt > 0 ? row : null))).toEqual(rows);
  });
});
