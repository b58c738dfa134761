import type { Knex } from 'knex';
import { ApiClient } from '../../test-support/api-client';
import { asOwnerInTenant, createOrganisation, type TestOrganisation } from '../../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../../test-support/test-app';
import { purgeStaleWork } from '../../jobs/purge-stale-work';
import { createDemoStack, type DemoStack } from './import-fixtures';
import { commitTestHooks, importBatching } from './imports.service';

// Staging (import_columns): the parsed file, kept between upload and commit. These checks are the
// ones the staged form itself must pass: the preview's figures come from it, it is rebuilt from
// the stored file when it is gone, it goes with the commit, and housekeeping clears what is left.

jest.setTimeout(120_000);

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let officer: ApiClient;

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  officer = await ApiClient.signedIn(t.app, org.users.officer.email, org.users.officer.password);
});

afterEach(() => {
  commitTestHooks.onPhase = null;
});

afterAll(async () => {
  commitTestHooks.onPhase = null;
  await t.close();
  await owner.destroy();
});

async function freshStack(name: string): Promise<DemoStack> {
  return createDemoStack(t.db, org, `${name} ${Math.random().toString(36).slice(2, 7)}`);
}

/** A `;`-separated logger file for the NOx and O2 channels: local Berlin wall-clock minute ends. */
function csv(rows: string[][]): Buffer {
  return Buffer.from([['Zeit', 'NOx [mg/Nm3] dry', 'O2 [%] dry'], ...rows].map((r) => r.join(';')).join('\r\n'));
}

async function upload(stackId: string, bytes: Buffer, fileName: string): Promise<string> {
  const res = await officer.agent.post(`/api/stacks/${stackId}/imports`).set('X-XSRF-TOKEN', officer.csrfToken ?? '').attach('file', bytes, fileName);
  expect(res.status).toBe(201);
  return res.body.id as string;
}

async function stagedParts(importId: string): Promise<number> {
  return asOwnerInTenant(owner, org.id, async (trx) => Number((await trx('import_columns').where({ import_id: importId }).count({ n: '*' }))[0]!.n));
}

// Six minutes with a gap of two after the third, one NOx cell blank. In October 2026 Berlin is
// UTC+2 and each label is the END of its minute, so 10:01 local is the minute from 08:00 UTC.
const withGap = csv([
  ['07.10.2026 10:01', '40', '3,5'],
  ['07.10.2026 10:02', '42,5', '3,6'],
  ['07.10.2026 10:03', '', '3,7'],
  ['07.10.2026 10:06', '47', '3,4'],
  ['07.10.2026 10:07', '41', '3,5'],
  ['07.10.2026 10:08', '44', '3,3'],
]);

describe('the preview of a staged file', () => {
  it('shows the first rows, per channel counts, min, max and mean, and the gap', async () => {
    const stack = await freshStack('Preview Works');
    const id = await upload(stack.stackId, withGap, 'gap.csv');
    const res = await officer.get(`/api/imports/${id}/preview`);
    expect(res.status).toBe(200);
    expect(res.body.sampleRows[0]).toEqual({ row: 2, t: '2026-10-07T08:00:00.000Z', status: 'valid', values: { [stack.channelIds.NOx!]: 40, [stack.channelIds.O2!]: 3.5 } });
    expect(res.body.sampleRows[2].values[stack.channelIds.NOx!]).toBeNull();
    expect(res.body.sampleRows.map((r: { row: number }) => r.row)).toEqual([2, 3, 4, 5, 6, 7]);
    const nox = res.body.perChannel.find((c: { channelId: string }) => c.channelId === stack.channelIds.NOx);
    // NOx: five numbers, 40 … 47, mean (40 + 42.5 + 47 + 41 + 44) / 5 = 42.9.
    expect(nox).toMatchObject({ count: 5, valid: 5, invalid: 0, min: 40, max: 47 });
    expect(nox.mean).toBeCloseTo(42.9, 12);
    const o2 = res.body.perChannel.find((c: { channelId: string }) => c.channelId === stack.channelIds.O2);
    expect(o2).toMatchObject({ count: 6, valid: 6, min: 3.3, max: 3.7 });
    // The minutes ending 10:04 and 10:05 are missing: from 08:03 to 08:05 UTC.
    expect(res.body.gaps).toEqual([{ from: '2026-10-07T08:03:00.000Z', to: '2026-10-07T08:05:00.000Z' }]);
    expect(res.body.overlap).toEqual({ new: 11, unchanged: 0, conflicting: 0 });
  });
});

describe('when staging is gone (a database crash empties the unlogged table)', () => {
  it('rebuilds it from the stored file: the preview and the commit are those of the file', async () => {
    const stack = await freshStack('Crash Recovery Works');
    const id = await upload(stack.stackId, withGap, 'lost-staging.csv');
    const before = (await officer.get(`/api/imports/${id}/preview`)).body;
    expect(await stagedParts(id)).toBe(3);
    await asOwnerInTenant(owner, org.id, (trx) => trx('import_columns').where({ import_id: id }).delete());
    expect(await stagedParts(id)).toBe(0);

    const after = (await officer.get(`/api/imports/${id}/preview`)).body;
    expect(after.perChannel).toEqual(before.perChannel);
    expect(after.sampleRows).toEqual(before.sampleRows);
    expect(await stagedParts(id)).toBe(3);

    await asOwnerInTenant(owner, org.id, (trx) => trx('import_columns').where({ import_id: id }).delete());
    const commit = await officer.post(`/api/imports/${id}/commit`, {});
    expect(commit.status).toBe(200);
    expect(commit.body).toMatchObject({ inserted: 11, conflicts: 0 });
    // Committed: the staging goes with the commit.
    expect(await stagedParts(id)).toBe(0);
  });
});

describe('a commit that fails between two channels', () => {
  it('ends with the failure as its last progress note (no progress note lands after it), and stores nothing', async () => {
    const stack = await freshStack('Failing Works');
    const id = await upload(stack.stackId, withGap, 'fails.csv');
    commitTestHooks.onPhase = async (phase) => {
      if (phase === 'channel_inserted') throw new Error('injected failure after the first channel');
    };
    const res = await officer.post(`/api/imports/${id}/commit`, {});
    expect(res.status).toBe(500);
    commitTestHooks.onPhase = null;
    const progressOf = () => asOwnerInTenant(owner, org.id, async (trx) => (await trx('imports').where({ id }).first('state', 'progress_phase')) as { state: string; progress_phase: string });
    for (let attempt = 0; attempt < 100 && (await progressOf()).state !== 'failed'; attempt++) await new Promise((resolve) => setTimeout(resolve, 50));
    // Give a straggling note time to land, if one could.
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(await progressOf()).toEqual({ state: 'failed', progress_phase: 'failed' });
    const stored = await asOwnerInTenant(owner, org.id, (trx) => trx('readings').whereIn('channel_id', Object.values(stack.channelIds)).count({ n: '*' }));
    expect(Number(stored[0]!.n)).toBe(0);
  });
});

describe('a file sent to the database in several pieces', () => {
  const usual = importBatching.readingsPerStatement;
  beforeEach(() => {
    // Four readings a statement: NOx's five readings go in two pieces, O2's six in two.
    importBatching.readingsPerStatement = 4;
  });
  afterEach(() => {
    importBatching.readingsPerStatement = usual;
  });

  it('stores every reading once, then compares a second file piece by piece', async () => {
    const stack = await freshStack('Pieces Works');
    const first = await upload(stack.stackId, withGap, 'pieces.csv');
    const commit = await officer.post(`/api/imports/${first}/commit`, {});
    expect(commit.body).toMatchObject({ inserted: 11, unchanged: 0, conflicts: 0 });
    const stored = await asOwnerInTenant(owner, org.id, (trx) =>
      trx('readings').whereIn('channel_id', [stack.channelIds.NOx, stack.channelIds.O2]).whereNull('superseded_at').orderBy(['channel_id', 't']).select('channel_id', 't', 'value'),
    );
    const values = (channelId: string) => stored.filter((r: { channel_id: string }) => r.channel_id === channelId).map((r: { value: number }) => r.value);
    expect(values(stack.channelIds.NOx!)).toEqual([40, 42.5, 47, 41, 44]);
    expect(values(stack.channelIds.O2!)).toEqual([3.5, 3.6, 3.7, 3.4, 3.5, 3.3]);
    const progress = (await officer.get(`/api/imports/${first}/progress`)).body;
    expect(progress).toMatchObject({ phase: 'done', done: 11, total: 11 });

    // The same minutes again, one O2 value changed, and one minute more.
    const second = await upload(
      stack.stackId,
      csv([
        ['07.10.2026 10:01', '40', '3,5'],
        ['07.10.2026 10:02', '42,5', '3,6'],
        ['07.10.2026 10:03', '', '3,7'],
        ['07.10.2026 10:06', '47', '3,9'],
        ['07.10.2026 10:07', '41', '3,5'],
        ['07.10.2026 10:08', '44', '3,3'],
        ['07.10.2026 10:09', '45', '3,2'],
      ]),
      'pieces-again.csv',
    );
    expect((await officer.get(`/api/imports/${second}/preview`)).body.overlap).toEqual({ new: 2, unchanged: 10, conflicting: 1 });
    const refused = await officer.post(`/api/imports/${second}/commit`, {});
    expect(refused.status).toBe(409);
    const replaced = await officer.post(`/api/imports/${second}/commit`, { replaceConflicts: true, reason: 'O2 analyser re-read after calibration' });
    expect(replaced.body).toMatchObject({ inserted: 3, unchanged: 10, superseded: 1, conflicts: 1 });
  });
});

describe('housekeeping', () => {
  it('clears the staging of a draft left longer than the cutoff and keeps a recent one', async () => {
    const stack = await freshStack('Housekeeping Works');
    const old = await upload(stack.stackId, withGap, 'old-draft.csv');
    const recent = await upload(stack.stackId, withGap, 'recent-draft.csv');
    await asOwnerInTenant(owner, org.id, (trx) => trx('imports').where({ id: old }).update({ uploaded_at: trx.raw("now() - interval '8 days'") }));
    // Another instance may hold the job's lock for a moment: try again until this one ran.
    for (let attempt = 0; attempt < 50 && !(await purgeStaleWork(owner)).ran; attempt++) await new Promise((resolve) => setTimeout(resolve, 100));
    expect(await stagedParts(old)).toBe(0);
    expect(await stagedParts(recent)).toBe(3);
  });
});

describe('the month a commit loads first', () => {
  it('has planner statistics when the commit ends (its size, not "empty")', async () => {
    const stack = await freshStack('Statistics Works');
    // A February no other test (and no earlier run on this database) writes: its partition is new.
    const year = 2040 + Math.floor(Math.random() * 60);
    const rows = Array.from({ length: 600 }, (_, i) => {
      const minute = i + 1;
      return [`03.02.${year} ${String(10 + Math.floor(minute / 60)).padStart(2, '0')}:${String(minute % 60).padStart(2, '0')}`, String(40 + (i % 9)), '3,5'];
    });
    const id = await upload(stack.stackId, csv(rows), 'february.csv');
    const commit = await officer.post(`/api/imports/${id}/commit`, {});
    expect(commit.body.inserted).toBe(1200);
    const reltuples = await owner.raw('select reltuples from pg_class where relname = ?', [`readings_y${year}m02`]);
    expect(Number(reltuples.rows[0].reltuples)).toBeGreaterThanOrEqual(1200);
    // With column statistics the planner expects about the channel's 600 readings of the month;
    // without, it would take default selectivities for the channel and the time range (0.5 % of
    // the table each: no rows at all).
    const plan = await asOwnerInTenant(owner, org.id, (trx) =>
      trx.raw(
        `explain (format json) select * from readings
          where tenant_id = ? and channel_id = ? and t >= ? and t < ? and superseded_at is null`,
        [org.id, stack.channelIds.NOx, `${year}-02-01`, `${year}-03-01`],
      ),
    );
    const estimated = (plan.rows[0]['QUERY PLAN'] as { Plan: { 'Plan Rows': number } }[])[0]!.Plan['Plan Rows'];
    expect(estimated).toBeGreaterThan(100);
    expect(estimated).toBeLessThanOrEqual(1200);
  });
});
