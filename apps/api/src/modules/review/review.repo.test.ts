import type { Knex } from 'knex';
import { withScope } from '../../lib/db';
import { type TestOrganisation, asOwnerInTenant, createOrganisation } from '../../test-support/fixtures';
import { type TestApp, createOwnerDb, createTestApp } from '../../test-support/test-app';
import { type SiteTree, buildSiteTree } from '../sites/setup-fixtures';
import { HOUR_REASON_LEGEND, HOUR_STATUS_LEGEND, loadStoredHours } from './review.repo';

const H = 3_600_000;
const FROM = Date.UTC(2026, 10, 2, 0);

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let tree: SiteTree;

/** Hour offsets stored for the channel: 0–4 and 7–9 (hours 5 and 6 missing). */
const STORED = [0, 1, 2, 3, 4, 7, 8, 9];
/** Hour 2 is invalid (fault, half covered), hour 8 is substituted; the others valid and fully covered. */
const row = (k: number) => ({
  hour_start: new Date(FROM + k * H),
  value: k === 2 ? null : 10 + k / 3,
  status: k === 2 ? 'invalid' : k === 8 ? 'substituted' : 'valid',
  reason: k === 2 ? 'fault' : null,
  coverage: k === 2 ? 0.5 : 1,
});

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  tree = await buildSiteTree(t.db, org, 'Repo Works');
  await owner.raw("select ensure_month_partition('hourly_values', '2026-11-01')");
  await asOwnerInTenant(owner, org.id, (trx) =>
    trx('hourly_values').insert(STORED.map((k) => ({ tenant_id: org.id, channel_id: tree.channelId, ...row(k) }))),
  );
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

const read = (columns: boolean) =>
  withScope(t.db, { tenantId: org.id, userId: org.users.officer.id }, (db) =>
    loadStoredHours({ tenantId: org.id, db }, { channelIds: [tree.channelId], limitRanges: [], fromMs: FROM, toMs: FROM + 12 * H, columns }),
  );

describe('loadStoredHours', () => {
  describe('when a channel has a gap, an invalid and a substituted hour', () => {
    it('gives every stored hour with its offset, value, status, reason and coverage', async () => {
      const hours = (await read(true)).channels.get(tree.channelId)!;
      expect(hours.i).toEqual(STORED);
      expect(hours.value).toEqual(STORED.map((k) => row(k).value));
      expect(hours.status!.map((code) => HOUR_STATUS_LEGEND[code])).toEqual(STORED.map((k) => row(k).status));
      expect(hours.reason!.map((code) => HOUR_REASON_LEGEND[code])).toEqual(STORED.map((k) => row(k).reason ?? 'none'));
      expect(hours.coverage).toEqual(STORED.map((k) => row(k).coverage));
      expect(hours).toMatchObject({ count: STORED.length, countInPeriod: STORED.length, last: FROM + 9 * H });
    });
  });

  describe('when the hours are one unbroken run', () => {
    it('gives the offsets of the run', async () => {
      const from = FROM + 7 * H;
      const hours = (
        await withScope(t.db, { tenantId: org.id, userId: org.users.officer.id }, (db) =>
          loadStoredHours({ tenantId: org.id, db }, { channelIds: [tree.channelId], limitRanges: [], fromMs: from, toMs: from + 3 * H, columns: true }),
        )
      ).channels.get(tree.channelId)!;
      expect(hours.i).toEqual([0, 1, 2]);
      expect(hours.value).toEqual([7, 8, 9].map((k) => row(k).value));
      expect(hours.status!.map((code) => HOUR_STATUS_LEGEND[code])).toEqual(['valid', 'substituted', 'valid']);
      expect(hours.coverage).toEqual([1, 1, 1]);
    });
  });

  describe('when only the markers are asked for', () => {
    it('gives no hour', async () => {
      const hours = (await read(false)).channels.get(tree.channelId)!;
      expect(hours).toEqual({ count: STORED.length, countInPeriod: STORED.length, oldest: expect.any(Number), newest: expect.any(Number), last: FROM + 9 * H });
    });
  });
});

describe('the built month documents', () => {
  const scoped = <T>(work: (db: Knex.Transaction) => Promise<T>) => withScope(t.db, { tenantId: org.id, userId: org.users.officer.id }, work);
  const readRange = (from: number, to: number) =>
    scoped((db) => loadStoredHours({ tenantId: org.id, db }, { channelIds: [tree.channelId], limitRanges: [], fromMs: from, toMs: to, columns: true }));
  const documents = () =>
    asOwnerInTenant(owner, org.id, (trx) =>
      trx('hourly_columns as d')
        .leftJoin('hourly_column_versions as v', function joinVersion() {
          this.on('v.tenant_id', 'd.tenant_id').andOn('v.kind', 'd.kind').andOn('v.series_id', 'd.series_id').andOn('v.month_start', 'd.month_start');
        })
        .where({ 'd.tenant_id': org.id, 'd.series_id': tree.channelId })
        .select('d.version', 'v.version as current'),
    );
  /** Another hour stored for the channel (committed), as a recompute would store it. */
  const storeHour = (k: number, value: number) =>
    asOwnerInTenant(owner, org.id, (trx) => trx('hourly_values').insert({ tenant_id: org.id, channel_id: tree.channelId, ...row(k), value }));
  const deleteHour = (k: number) =>
    asOwnerInTenant(owner, org.id, (trx) => trx('hourly_values').where({ tenant_id: org.id, channel_id: tree.channelId, hour_start: new Date(FROM + k * H) }).delete());

  it('stores the document a read built, for the version it read', async () => {
    await read(true);
    const docs = await documents();
    expect(docs.length).toBeGreaterThan(0);
    for (const d of docs) expect(Number(d.version)).toBe(Number(d.current ?? 0));
  });

  it('shows an hour written after the document was built (the write bumps the version)', async () => {
    await read(true);
    await storeHour(5, 42.5);
    try {
      const hours = (await read(true)).channels.get(tree.channelId)!;
      expect(hours.i).toEqual([0, 1, 2, 3, 4, 5, 7, 8, 9]);
      expect(hours.value![5]).toBe(42.5);
    } finally {
      await deleteHour(5);
    }
    const after = (await read(true)).channels.get(tree.channelId)!;
    expect(after.i).toEqual(STORED);
  });

  it('never serves a document built from a snapshot older than a committed write', async () => {
    // The reader's snapshot is taken before the write commits; it builds and stores its document
    // after the write committed. A later reader must still see the write.
    await deleteHour(6).catch(() => undefined);
    const release = { go: () => undefined as void };
    const writerDone = new Promise<void>((resolve) => (release.go = resolve));
    const stale = t.db.transaction(
      async (db) => {
        await db.raw("select set_config('app.tenant_id', ?, true), set_config('app.user_id', ?, true)", [org.id, org.users.officer.id]);
        await db.raw('select 1 from hourly_values limit 1'); // the snapshot
        await writerDone;
        return loadStoredHours({ tenantId: org.id, db }, { channelIds: [tree.channelId], limitRanges: [], fromMs: FROM, toMs: FROM + 12 * H, columns: true });
      },
      { isolationLevel: 'repeatable read' },
    );
    await new Promise((resolve) => setTimeout(resolve, 50));
    await storeHour(6, 61);
    release.go();
    try {
      const old = (await stale).channels.get(tree.channelId)!;
      expect(old.i).toEqual(STORED); // its own snapshot, without hour 6
      const fresh = (await read(true)).channels.get(tree.channelId)!;
      expect(fresh.i).toEqual([0, 1, 2, 3, 4, 6, 7, 8, 9]);
      expect(fresh.value![5]).toBe(61);
    } finally {
      await deleteHour(6);
    }
  });

  it('gives the markers of the hours in the range only (computed at different times)', async () => {
    await asOwnerInTenant(owner, org.id, (trx) =>
      trx('hourly_values')
        .where({ tenant_id: org.id, channel_id: tree.channelId })
        .whereIn('hour_start', [new Date(FROM + 8 * H), new Date(FROM + 9 * H)])
        .update({ computed_at: trx.raw("now() + interval '1 hour'") }),
    );
    const rows = await asOwnerInTenant(owner, org.id, (trx) =>
      trx('hourly_values').where({ tenant_id: org.id, channel_id: tree.channelId }).orderBy('hour_start').select('hour_start', 'computed_at'),
    );
    const early = (await readRange(FROM, FROM + 5 * H)).channels.get(tree.channelId)!;
    const inEarly = rows.filter((r) => r.hour_start.getTime() < FROM + 5 * H).map((r) => r.computed_at.getTime());
    // Markers keep the database's microseconds; a Date has whole milliseconds.
    expect(early).toMatchObject({ count: 5, last: FROM + 4 * H });
    expect([Math.floor(early.oldest), Math.floor(early.newest)]).toEqual([Math.min(...inEarly), Math.max(...inEarly)]);
    const late = (await readRange(FROM + 8 * H, FROM + 10 * H)).channels.get(tree.channelId)!;
    expect(Math.floor(late.newest)).toBe(rows.find((r) => r.hour_start.getTime() === FROM + 9 * H)!.computed_at.getTime());
    expect(late.newest).toBeGreaterThan(early.newest);
  });

  it('reads a range across a UTC month boundary from both months', async () => {
    const boundary = Date.UTC(2026, 11, 1);
    await owner.raw("select ensure_month_partition('hourly_values', '2026-12-01')");
    await asOwnerInTenant(owner, org.id, (trx) =>
      trx('hourly_values').insert([-2, -1, 0, 1].map((k) => ({ tenant_id: org.id, channel_id: tree.channelId, hour_start: new Date(boundary + k * H), value: 100 + k, status: 'valid', coverage: 1 }))),
    );
    const hours = (await readRange(boundary - 2 * H, boundary + 2 * H)).channels.get(tree.channelId)!;
    expect(hours.i).toEqual([0, 1, 2, 3]);
    expect(hours.value).toEqual([98, 99, 100, 101]);
  });

  it('refuses to truncate the hourly results (no version could be bumped)', async () => {
    await expect(owner.raw('truncate hourly_values')).rejects.toThrow(/cannot be truncated/);
  });
});
