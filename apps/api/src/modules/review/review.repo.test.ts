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
