import ExcelJS from 'exceljs';
import type { Knex } from 'knex';
import { Readable } from 'node:stream';
import type { Response } from 'supertest';
import { ApiClient } from '../../test-support/api-client';
import { asOwnerInTenant, createOrganisation, type TestOrganisation } from '../../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../../test-support/test-app';
import { demoBoilerChannels, demoMonthRows, type DemoMonthOptions } from './demo-data';
import { createDemoStack, demoWorkbookBytes, type DemoStack } from './import-fixtures';
import { commitTestHooks } from './imports.service';
import { recomputeStack } from '../results/results.service';

jest.setTimeout(240_000);

const maxBytes = 4_000_000;
const month: DemoMonthOptions = { year: 2026, month: 10, timeZone: 'Europe/Berlin' };

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let other: TestOrganisation;
let stack: DemoStack;
let otherStack: DemoStack;
let officer: ApiClient;
let auditor: ApiClient;
let manager: ApiClient;
let otherOfficer: ApiClient;
let demoBytes: Buffer;

beforeAll(async () => {
  t = createTestApp({ env: { IMPORT_MAX_BYTES: String(maxBytes) } });
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  other = await createOrganisation(owner);
  stack = await createDemoStack(t.db, org, 'Northmoor Test Works');
  otherStack = await createDemoStack(t.db, other, 'Elsewhere Works');
  officer = await ApiClient.signedIn(t.app, org.users.officer.email, org.users.officer.password);
  auditor = await ApiClient.signedIn(t.app, org.users.auditor.email, org.users.auditor.password);
  manager = await ApiClient.signedIn(t.app, org.users.manager.email, org.users.manager.password);
  otherOfficer = await ApiClient.signedIn(t.app, other.users.officer.email, other.users.officer.password);
  demoBytes = await demoWorkbookBytes(month);
});

afterAll(async () => {
  commitTestHooks.onPhase = null;
  await t.close();
  await owner.destroy();
});

afterEach(() => {
  commitTestHooks.onPhase = null;
});

// ---- helpers ------------------------------------------------------------------------------------

async function upload(client: ApiClient, stackId: string, bytes: Buffer, fileName: string, fields: Record<string, string> = {}): Promise<Response> {
  let req = client.agent.post(`/api/stacks/${stackId}/imports`).set('X-XSRF-TOKEN', client.csrfToken ?? '');
  for (const [key, value] of Object.entries(fields)) req = req.field(key, value);
  return req.attach('file', bytes, fileName);
}

/** A small `;`-separated logger file for the NOx and O2 channels, local Berlin times. */
function csv(rows: string[][], header = ['Zeit', 'NOx [mg/Nm3] dry', 'O2 [%] dry']): Buffer {
  return Buffer.from([header, ...rows].map((r) => r.join(';')).join('\r\n'));
}

async function importCount(db: Knex, orgId: string, stackId: string): Promise<number> {
  return asOwnerInTenant(db, orgId, async (trx) => Number((await trx('imports').where({ tenant_id: orgId, stack_id: stackId }).count({ n: '*' }))[0]!.n));
}

interface ReadingRow {
  id: string;
  channel_id: string;
  t: Date;
  value: number | null;
  status: string;
  import_id: string | null;
  superseded_at: Date | null;
  superseded_by: string | null;
  reason: string | null;
}

async function readings(orgId: string, where: (qb: Knex.QueryBuilder) => void, current = true): Promise<ReadingRow[]> {
  return asOwnerInTenant(owner, orgId, async (trx) => {
    const qb = trx('readings').where({ tenant_id: orgId }).orderBy('id');
    if (current) qb.whereNull('superseded_at');
    where(qb);
    return (await qb.select('*')) as ReadingRow[];
  });
}

interface StoredHours {
  channels: { channel_id: string; hour_start: Date; value: number | null; status: string; coverage: number; readings_valid: number; readings_total: number; reason: string | null }[];
  limits: Record<string, unknown>[];
}

/** The stored hourly values of a stack's channels and limits (without their computation times). */
async function storedHours(trx: Knex.Transaction, channelIds: string[]): Promise<StoredHours> {
  const channels = (await trx('hourly_values')
    .whereIn('channel_id', channelIds)
    .orderBy(['channel_id', 'hour_start'])
    .select('channel_id', 'hour_start', 'value', 'status', 'coverage', 'readings_valid', 'readings_total', 'reason')) as StoredHours['channels'];
  const limits = (await trx('limit_hourly_values')
    .whereIn('channel_id', channelIds)
    .orderBy(['limit_id', 'hour_start'])
    .select('*')) as Record<string, unknown>[];
  for (const l of limits) delete l.computed_at;
  return { channels, limits };
}

/** Numbers equal to 1e-9 relative (a sum taken in another order may differ in its last bits). */
function roundedForCompare<T>(rows: T[]): T[] {
  return rows.map((row) => Object.fromEntries(Object.entries(row as object).map(([k, v]) => [k, typeof v === 'number' && !Number.isInteger(v) ? Number(v.toPrecision(10)) : v]))) as T[];
}

async function importState(orgId: string, importId: string): Promise<string> {
  return asOwnerInTenant(owner, orgId, async (trx) => (await trx('imports').where({ id: importId }).first('state')).state as string);
}

async function freshStack(name: string): Promise<DemoStack> {
  return createDemoStack(t.db, org, `${name} ${Math.random().toString(36).slice(2, 7)}`);
}

function buildXlsx(fill: (sheet: ExcelJS.Worksheet) => void): Promise<Buffer> {
  const workbook = new ExcelJS.Workbook();
  fill(workbook.addWorksheet('Data'));
  return workbook.xlsx.writeBuffer().then((b) => Buffer.from(b as ArrayBuffer));
}

// ---- a month of one-minute data -----------------------------------------------------------------

describe('a month of one-minute data (the demo workbook)', () => {
  let importId: string;

  it('uploads, parses and suggests a channel for every column', async () => {
    const res = await upload(officer, stack.stackId, demoBytes, 'northmoor-boiler2-2026-10.xlsx');
    expect(res.status).toBe(201);
    importId = res.body.id;
    // October 2026 in Berlin has 31 days plus the repeated hour when summer time ends.
    expect(res.body.rowCount).toBe(31 * 1440 + 60);
    expect(res.body.state).toBe('parsed');
    expect(res.body.timestampHeader).toBe('Time stamp');
    expect(res.body.headerRow).toBe(4);
    expect(res.body.intervalSeconds).toBe(60);
    const byHeader = Object.fromEntries(res.body.columns.map((c: { header: string; suggestedChannelId: string; mappedChannelId: string }) => [c.header, c]));
    for (const channel of demoBoilerChannels) {
      expect(byHeader[channel.header].suggestedChannelId).toBe(stack.channelIds[channel.parameter]);
      expect(byHeader[channel.header].mappedChannelId).toBe(stack.channelIds[channel.parameter]);
    }
    expect(res.body.problemCount).toBe(5);
    expect(res.body.notes.join(' ')).toMatch(/120 rows in the repeated hour/);
    expect(res.body.alreadyImported).toBeNull();
  });

  it('previews the text cells as problems with row, column and value', async () => {
    const res = await officer.get(`/api/imports/${importId}/preview`);
    expect(res.status).toBe(200);
    expect(res.body.problemCount).toBe(5);
    expect(res.body.problems[0]).toMatchObject({ column: 'F (H2O [%])', value: '----', code: 'text' });
    expect(res.body.overlap).toEqual({ new: expect.any(Number), unchanged: 0, conflicting: 0 });
    expect(res.body.span).toEqual({ from: '2026-09-30T22:00:00.000Z', to: '2026-10-31T23:00:00.000Z' });
    // The analyser outage is not a gap in time: its rows exist (with status fault).
    expect(res.body.gaps).toEqual([]);
    const nox = res.body.perChannel.find((c: { channelId: string }) => c.channelId === stack.channelIds.NOx);
    expect(nox.count).toBe(31 * 1440 + 60);
  });

  it('commits every cell and the stored values equal the generated ones exactly', async () => {
    const expected = new Map<string, { value: number | null; status: string }>();
    for (const row of demoMonthRows(month)) {
      demoBoilerChannels.forEach((channel, k) => {
        const value = row.values[k]!;
        if (typeof value === 'string') return; // "----": reported, not imported
        if (value === null && row.status === 'valid') return;
        expected.set(`${stack.channelIds[channel.parameter]}|${row.startUtcMs}`, { value, status: row.status });
      });
    }
    const res = await officer.post(`/api/imports/${importId}/commit`, {});
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ inserted: expected.size, unchanged: 0, superseded: 0, conflicts: 0, nothingNew: false });

    const stored = await readings(org.id, (qb) => qb.whereIn('channel_id', Object.values(stack.channelIds)));
    expect(stored).toHaveLength(expected.size);
    let mismatches = 0;
    for (const r of stored) {
      const want = expected.get(`${r.channel_id}|${r.t.getTime()}`);
      if (!want || want.value !== r.value || want.status !== r.status || r.import_id !== importId) mismatches++;
    }
    expect(mismatches).toBe(0);
    const draft = await officer.get(`/api/imports/${importId}`);
    expect(draft.body).toMatchObject({ state: 'committed', counts: { inserted: expected.size }, progress: { phase: 'done' } });
  });

  it('stores the hourly values a full recomputation from the stored readings gives', async () => {
    // The commit computed them from staging (nothing was stored in those hours before); a
    // recomputation reads the stored readings back. Compared in one transaction, rolled back.
    const channelIds = Object.values(stack.channelIds);
    const rollback = new Error('rollback');
    let committed: StoredHours | undefined;
    let recomputed: StoredHours | undefined;
    await asOwnerInTenant(owner, org.id, async (trx) => {
      committed = await storedHours(trx, channelIds);
      await recomputeStack({ tenantId: org.id, db: trx }, stack.stackId, { from: Date.UTC(2026, 8, 30), to: Date.UTC(2026, 10, 2) });
      recomputed = await storedHours(trx, channelIds);
      throw rollback;
    }).catch((error: unknown) => {
      if (error !== rollback) throw error;
    });
    // October local time is 31 days and one extra hour (the clocks go back): 745 hours a channel.
    expect(committed!.channels).toHaveLength(channelIds.length * 745);
    expect(committed!.limits.length).toBeGreaterThan(0);
    expect(roundedForCompare(committed!.channels)).toEqual(roundedForCompare(recomputed!.channels));
    expect(roundedForCompare(committed!.limits)).toEqual(roundedForCompare(recomputed!.limits));
  });

  it('changes nothing when the same file is imported again', async () => {
    const before = await readings(org.id, (qb) => qb.whereIn('channel_id', Object.values(stack.channelIds)), false);
    const res = await upload(officer, stack.stackId, demoBytes, 'again.xlsx');
    expect(res.status).toBe(201);
    expect(res.body.alreadyImported).toEqual({ importId, committedAt: expect.any(String) });
    const commit = await officer.post(`/api/imports/${res.body.id}/commit`, {});
    expect(commit.status).toBe(200);
    expect(commit.body).toMatchObject({ inserted: 0, superseded: 0, conflicts: 0, nothingNew: true });
    expect(commit.body.unchanged).toBe(before.length);
    const after = await readings(org.id, (qb) => qb.whereIn('channel_id', Object.values(stack.channelIds)), false);
    expect(after.map((r) => r.id)).toEqual(before.map((r) => r.id));
  });

  it('offers the problems as a workbook', async () => {
    const res = await officer.agent
      .get(`/api/imports/${importId}/problems.xlsx`)
      .buffer(true)
      .parse((response, callback) => {
        const chunks: Buffer[] = [];
        response.on('data', (c: Buffer) => chunks.push(c));
        response.on('end', () => callback(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toContain('spreadsheetml');
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.read(Readable.from([res.body as Buffer]));
    const sheet = workbook.getWorksheet('Problems')!;
    expect(sheet.rowCount).toBe(6);
    expect(sheet.getRow(2).getCell(3).value).toBe('----');
  });
});

// ---- bad input ----------------------------------------------------------------------------------

describe('POST /api/stacks/:stackId/imports with bad input', () => {
  let badStack: DemoStack;
  beforeAll(async () => {
    badStack = await freshStack('Bad Input Works');
  });

  async function expectRefused(res: Response, status: number, code: string, message: RegExp): Promise<void> {
    expect(res.status).toBe(status);
    expect(res.body.error.code).toBe(code);
    expect(res.body.error.message).toMatch(message);
    expect(await importCount(owner, org.id, badStack.stackId)).toBe(0);
  }

  it('responds 415 for a file that is not a workbook', async () => {
    const png = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c489', 'hex');
    await expectRefused(await upload(officer, badStack.stackId, png, 'picture.xlsx'), 415, 'not_a_workbook', /neither an Excel workbook/);
  });

  it('responds 422 for a corrupt workbook', async () => {
    await expectRefused(await upload(officer, badStack.stackId, demoBytes.subarray(0, 30_000), 'cut.xlsx'), 422, 'corrupt_workbook', /ends before the workbook does/);
  });

  it('responds 422 for a password-protected workbook', async () => {
    // A Compound File ([MS-CFB] header) holding an "EncryptedPackage" stream, as Excel writes one.
    const cfb = Buffer.alloc(4096);
    Buffer.from('d0cf11e0a1b11ae1', 'hex').copy(cfb, 0);
    Buffer.from('EncryptedPackage', 'utf16le').copy(cfb, 1024);
    await expectRefused(await upload(officer, badStack.stackId, cfb, 'locked.xlsx'), 422, 'password_protected', /password-protected workbook/);
  });

  it('responds 422 for an empty sheet', async () => {
    const empty = await buildXlsx(() => undefined);
    await expectRefused(await upload(officer, badStack.stackId, empty, 'empty.xlsx'), 422, 'empty_sheet', /no (worksheets|rows with data)/);
  });

  it('responds 422 when no column holds timestamps', async () => {
    const noTime = await buildXlsx((sheet) => {
      sheet.addRow(['Name', 'NOx [mg/Nm3]']);
      sheet.addRow(['first', 12.5]);
      sheet.addRow(['second', 13.5]);
    });
    await expectRefused(await upload(officer, badStack.stackId, noTime, 'no-time.xlsx'), 422, 'no_timestamp_column', /No timestamp column/);
  });

  it('responds 413 for a file over the size limit', async () => {
    const big = Buffer.alloc(maxBytes + 10_000, 'a');
    await expectRefused(await upload(officer, badStack.stackId, big, 'big.csv'), 413, 'file_too_large', /larger than/);
  });

  it('responds 400 without a file', async () => {
    const res = await officer.post(`/api/stacks/${badStack.stackId}/imports`, {});
    expect(res.status).toBe(400);
    expect(await importCount(owner, org.id, badStack.stackId)).toBe(0);
  });

  it('reports text in numeric cells per cell and imports the rest', async () => {
    const file = csv([
      ['01.10.2026 00:01', '61,5', '3,2'],
      ['01.10.2026 00:02', 'n/a', '3,3'],
      ['01.10.2026 00:03', '62,5', '#NV'],
      ['01.10.2026 00:04', '63', '3,1'],
    ]);
    const res = await upload(officer, badStack.stackId, file, 'text-cells.csv');
    expect(res.status).toBe(201);
    const preview = await officer.get(`/api/imports/${res.body.id}/preview`);
    expect(preview.body.problems).toEqual([
      { row: 3, column: 'B (NOx [mg/Nm3] dry)', columnIndex: 1, value: 'n/a', code: 'text', reason: 'Text "n/a" where a number is expected.' },
      { row: 4, column: 'C (O2 [%] dry)', columnIndex: 2, value: '#NV', code: 'text', reason: 'Text "#NV" where a number is expected.' },
    ]);
    const commit = await officer.post(`/api/imports/${res.body.id}/commit`, {});
    expect(commit.body.inserted).toBe(6);
    const nox = await readings(org.id, (qb) => qb.where('channel_id', badStack.channelIds.NOx));
    // 00:01 local summer time (UTC+2) is the end of the minute starting 22:00 UTC the day before.
    expect(nox.map((r) => [r.t.toISOString(), r.value])).toEqual([
      ['2026-09-30T22:00:00.000Z', 61.5],
      ['2026-09-30T22:02:00.000Z', 62.5],
      ['2026-09-30T22:03:00.000Z', 63],
    ]);
  });

  it('imports neither of two rows with the same time and different values, and identical ones once', async () => {
    const dupStack = await freshStack('Duplicate Works');
    const file = csv([
      ['02.10.2026 10:01', '50', '3'],
      ['02.10.2026 10:01', '51', '3'],
      ['02.10.2026 10:02', '52', '3'],
      ['02.10.2026 10:02', '52', '3'],
      ['02.10.2026 10:03', '53', '3'],
    ]);
    const res = await upload(officer, dupStack.stackId, file, 'dups.csv');
    expect(res.status).toBe(201);
    expect(res.body.duplicates).toBe(3);
    const preview = await officer.get(`/api/imports/${res.body.id}/preview`);
    expect(preview.body.problems.filter((p: { code: string }) => p.code === 'duplicate_timestamp').map((p: { row: number }) => p.row)).toEqual([2, 3, 5]);
    await officer.post(`/api/imports/${res.body.id}/commit`, {});
    const nox = await readings(org.id, (qb) => qb.where('channel_id', dupStack.channelIds.NOx));
    expect(nox.map((r) => r.value)).toEqual([52, 53]);
  });

  it('reports rows outside the declared period and does not import them', async () => {
    const periodStack = await freshStack('Period Works');
    const file = csv([
      ['01.10.2026 23:59', '40', '3'],
      ['02.10.2026 00:00', '41', '3'],
      ['02.10.2026 00:01', '42', '3'],
    ]);
    const res = await upload(officer, periodStack.stackId, file, 'period.csv', { periodFrom: '2026-10-01', periodTo: '2026-10-01' });
    expect(res.status).toBe(201);
    expect(res.body.period).toEqual({ from: '2026-10-01', to: '2026-10-01' });
    const preview = await officer.get(`/api/imports/${res.body.id}/preview`);
    expect(preview.body.problems).toEqual([expect.objectContaining({ row: 4, code: 'outside_period' })]);
    await officer.post(`/api/imports/${res.body.id}/commit`, {});
    const nox = await readings(org.id, (qb) => qb.where('channel_id', periodStack.channelIds.NOx));
    expect(nox.map((r) => r.value)).toEqual([40, 41]);

    const allOutside = await upload(officer, periodStack.stackId, file, 'period.csv', { periodFrom: '2026-11-01', periodTo: '2026-11-30' });
    expect(allOutside.status).toBe(422);
    expect(allOutside.body.error.code).toBe('all_outside_period');
  });

  it('reports a local time the clock skips and one it shows only once at the end of summer time', async () => {
    const dstStack = await freshStack('Clock Works');
    const file = csv([
      ['29.03.2026 02:30', '40', '3'],
      ['25.10.2026 02:30', '41', '3'],
      ['25.10.2026 03:30', '42', '3'],
    ]);
    const res = await upload(officer, dstStack.stackId, file, 'dst.csv');
    expect(res.status).toBe(201);
    const preview = await officer.get(`/api/imports/${res.body.id}/preview`);
    expect(preview.body.problems.map((p: { row: number; code: string }) => [p.row, p.code])).toEqual([
      [2, 'missing_local_time'],
      [3, 'ambiguous_local_time'],
    ]);
  });
});

// ---- mapping ------------------------------------------------------------------------------------

describe('PUT /api/imports/:importId/mapping', () => {
  it('reads the file again for interval-start times and remembers the map for the next file', async () => {
    const mapStack = await freshStack('Mapping Works');
    const file = csv([
      ['03.10.2026 10:00', '50', '3'],
      ['03.10.2026 10:01', '51', '3'],
    ], ['Zeit', 'Analyser 1 value', 'O2 [%] dry']);
    const res = await upload(officer, mapStack.stackId, file, 'map.csv');
    expect(res.body.columns.map((c: { suggestedChannelId: string | null }) => c.suggestedChannelId)).toEqual([null, mapStack.channelIds.O2]);
    const put = await officer.put(`/api/imports/${res.body.id}/mapping`, {
      columns: [{ index: 1, channelId: mapStack.channelIds.NOx }, { index: 2, channelId: mapStack.channelIds.O2 }],
      timestampColumn: 0,
      intervalConvention: 'interval_start',
      saveAsStackMap: true,
    });
    expect(put.status).toBe(200);
    expect(put.body).toMatchObject({ state: 'mapped', intervalConvention: 'interval_start' });
    const preview = await officer.get(`/api/imports/${res.body.id}/preview`);
    expect(preview.body.sampleRows[0]).toMatchObject({ t: '2026-10-03T08:00:00.000Z', values: { [mapStack.channelIds.NOx]: 50 } });

    const next = await upload(officer, mapStack.stackId, file, 'map-next.csv');
    expect(next.body.intervalConvention).toBe('interval_start');
    expect(next.body.columns[0]).toMatchObject({ suggestedChannelId: mapStack.channelIds.NOx, suggestionSource: 'stack_map' });
  });

  it('responds 422 for a channel of another stack or one channel twice', async () => {
    const res = await upload(officer, stack.stackId, csv([['04.10.2026 10:00', '50', '3']]), 'bad-map.csv');
    const put = await officer.put(`/api/imports/${res.body.id}/mapping`, {
      columns: [{ index: 1, channelId: otherStack.channelIds.NOx }, { index: 2, channelId: stack.channelIds.O2 }],
      timestampColumn: 0,
      intervalConvention: 'interval_end',
    });
    expect(put.status).toBe(422);
    const twice = await officer.put(`/api/imports/${res.body.id}/mapping`, {
      columns: [{ index: 1, channelId: stack.channelIds.O2 }, { index: 2, channelId: stack.channelIds.O2 }],
      timestampColumn: 0,
      intervalConvention: 'interval_end',
    });
    expect(twice.status).toBe(422);
    expect(twice.body.error.details[0].path).toBe('columns.1.channelId');
  });
});

// ---- conflicts and rollback ---------------------------------------------------------------------

describe('an import that completes an hour begun by an earlier one', () => {
  it('stores the hour from the readings of both', async () => {
    const hourStack = await freshStack('Half Hour Works');
    // Interval-end times 10:01 … 11:00 local (UTC+2): readings start 08:00 … 08:59 UTC.
    const minute = (m: number) => `06.10.2026 ${m === 60 ? '11:00' : `10:${String(m).padStart(2, '0')}`}`;
    const firstHalf = csv(Array.from({ length: 30 }, (_, i) => [minute(i + 1), '50', '3']));
    const secondHalf = csv(Array.from({ length: 30 }, (_, i) => [minute(i + 31), '60', '3']));
    for (const [file, name] of [[firstHalf, 'first-half.csv'], [secondHalf, 'second-half.csv']] as const) {
      const res = await upload(officer, hourStack.stackId, file, name);
      expect(res.status).toBe(201);
      const commit = await officer.post(`/api/imports/${res.body.id}/commit`, {});
      expect(commit.body).toMatchObject({ inserted: 60, conflicts: 0 });
    }
    const hours = await asOwnerInTenant(owner, org.id, (trx) =>
      trx('hourly_values').where({ channel_id: hourStack.channelIds.NOx }).orderBy('hour_start').select('hour_start', 'value', 'readings_total', 'readings_valid', 'status'),
    );
    expect(hours).toEqual([{ hour_start: new Date('2026-10-06T08:00:00Z'), value: 55, readings_total: 60, readings_valid: 60, status: 'valid' }]);
  });
});

describe('conflicts and rollback', () => {
  let conflictStack: DemoStack;
  let firstId: string;
  let secondId: string;
  const first = csv([
    ['05.10.2026 10:01', '50', '3'],
    ['05.10.2026 10:02', '51', '3'],
  ]);
  const second = csv([
    ['05.10.2026 10:02', '57', '3'],
    ['05.10.2026 10:03', '52', '3'],
  ]);

  beforeAll(async () => {
    conflictStack = await freshStack('Conflict Works');
    firstId = (await upload(officer, conflictStack.stackId, first, 'first.csv')).body.id;
    expect((await officer.post(`/api/imports/${firstId}/commit`, {})).status).toBe(200);
  });

  it('shows a differing value as a conflict and refuses to commit without the explicit replace', async () => {
    const res = await upload(officer, conflictStack.stackId, second, 'second.csv');
    secondId = res.body.id;
    const preview = await officer.get(`/api/imports/${secondId}/preview`);
    expect(preview.body.overlap).toEqual({ new: 2, unchanged: 1, conflicting: 1 });
    const refused = await officer.post(`/api/imports/${secondId}/commit`, {});
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatchObject({ code: 'conflicts', details: { conflicts: 1 } });
    expect((await readings(org.id, (qb) => qb.where('channel_id', conflictStack.channelIds.NOx))).map((r) => r.value)).toEqual([50, 51]);
    const noReason = await officer.post(`/api/imports/${secondId}/commit`, { replaceConflicts: true });
    expect(noReason.status).toBe(400);
  });

  it('replaces with a reason: the old value is superseded, not changed', async () => {
    const res = await officer.post(`/api/imports/${secondId}/commit`, { replaceConflicts: true, reason: 'Logger re-export after span correction' });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ inserted: 3, unchanged: 1, superseded: 1, conflicts: 1, nothingNew: false });
    const all = await readings(org.id, (qb) => qb.where('channel_id', conflictStack.channelIds.NOx).andWhere('t', '2026-10-05T08:01:00Z'), false);
    expect(all.map((r) => [r.value, r.import_id, r.superseded_at !== null])).toEqual([
      [51, firstId, true],
      [57, secondId, false],
    ]);
    expect(all[0]!.superseded_by).toBe(all[1]!.id);
    expect(all[1]!.reason).toBe('Logger re-export after span correction');
  });

  it('names the committing officer as the author of both versions in the drill-down', async () => {
    const t0 = '2026-10-05T08:01:00.000Z';
    const res = await auditor.get(`/api/channels/${conflictStack.channelIds.NOx}/readings?from=${encodeURIComponent(t0)}&to=${encodeURIComponent('2026-10-05T08:02:00.000Z')}&includeSuperseded=true`);
    expect(res.status).toBe(200);
    expect(
      res.body.items.map((r: { importId: string; createdBy: string; createdByName: string; current: boolean }) => [r.importId, r.createdBy, r.createdByName, r.current]),
    ).toEqual([
      [firstId, org.users.officer.id, org.users.officer.name, false],
      [secondId, org.users.officer.id, org.users.officer.name, true],
    ]);
  });

  it('refuses to roll back the first import while the second replaced some of its values', async () => {
    const res = await officer.post(`/api/imports/${firstId}/rollback`, { reason: 'wrong stack' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('changed_later');
  });

  it('rolls back the second import: its values are withdrawn and the replaced value is current again', async () => {
    const res = await officer.post(`/api/imports/${secondId}/rollback`, { reason: 'Re-export was of the wrong day' });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ withdrawn: 3, restored: 1, state: 'rolled_back' });
    const nox = await readings(org.id, (qb) => qb.where('channel_id', conflictStack.channelIds.NOx));
    expect(nox.map((r) => [r.t.toISOString(), r.value, r.import_id])).toEqual([
      ['2026-10-05T08:00:00.000Z', 50, firstId],
      ['2026-10-05T08:01:00.000Z', 51, firstId],
    ]);
    // Nothing was deleted.
    const history = await readings(org.id, (qb) => qb.where('channel_id', conflictStack.channelIds.NOx), false);
    expect(history).toHaveLength(5);
    expect((await officer.post(`/api/imports/${secondId}/rollback`, { reason: 'again' })).status).toBe(409);
  });

  it('then rolls back the first import as a whole', async () => {
    const res = await officer.post(`/api/imports/${firstId}/rollback`, { reason: 'Wrong stack selected' });
    expect(res.status).toBe(200);
    expect(res.body.withdrawn).toBe(4);
    expect(await readings(org.id, (qb) => qb.whereIn('channel_id', Object.values(conflictStack.channelIds)))).toEqual([]);
    const draft = await officer.get(`/api/imports/${firstId}`);
    expect(draft.body).toMatchObject({ state: 'rolled_back', rollbackReason: 'Wrong stack selected' });
  });
});

// ---- failures in the middle of a commit ----------------------------------------------------------

describe('a commit that fails half-way', () => {
  const file = csv(Array.from({ length: 120 }, (_, i) => [`06.10.2026 ${String(10 + Math.floor((i + 1) / 60)).padStart(2, '0')}:${String((i + 1) % 60).padStart(2, '0')}`, String(40 + (i % 7)), '3,5']));

  it('leaves nothing when the commit throws after the values are staged and inserted', async () => {
    const crashStack = await freshStack('Crash Works');
    const id = (await upload(officer, crashStack.stackId, file, 'crash.csv')).body.id;
    commitTestHooks.onPhase = async (phase) => {
      if (phase === 'inserted') throw new Error('injected failure');
    };
    const res = await officer.post(`/api/imports/${id}/commit`, {});
    expect(res.status).toBe(500);
    expect(await readings(org.id, (qb) => qb.whereIn('channel_id', Object.values(crashStack.channelIds)), false)).toEqual([]);
    commitTestHooks.onPhase = null;
    await waitFor(async () => (await importState(org.id, id)) === 'failed');
    const retry = await officer.post(`/api/imports/${id}/commit`, {});
    expect(retry.status).toBe(200);
    expect(retry.body.inserted).toBe(240);
  });

  it('leaves nothing when the database connection is killed during the commit', async () => {
    const killStack = await freshStack('Lost Connection Works');
    const id = (await upload(officer, killStack.stackId, file, 'kill.csv')).body.id;
    let seenPhase: string | null = null;
    commitTestHooks.onPhase = async (phase, trx) => {
      if (phase !== 'staged') return;
      // While the commit runs, a poll (on another connection) sees its progress.
      seenPhase = (await officer.get(`/api/imports/${id}/progress`)).body.phase;
      const pid = (await trx.raw('select pg_backend_pid() as pid')).rows[0].pid;
      // Same role may signal its own backends: the app pool terminates the commit's connection.
      await t.db.raw('select pg_terminate_backend(?)', [pid]);
    };
    const res = await officer.post(`/api/imports/${id}/commit`, {});
    expect(res.status).toBeGreaterThanOrEqual(500);
    expect(seenPhase).toBe('compared');
    expect(await readings(org.id, (qb) => qb.whereIn('channel_id', Object.values(killStack.channelIds)), false)).toEqual([]);
    commitTestHooks.onPhase = null;
    await waitFor(async () => (await importState(org.id, id)) === 'failed');
    const retry = await officer.post(`/api/imports/${id}/commit`, {});
    expect(retry.status).toBe(200);
    expect(retry.body.inserted).toBe(240);
  });
});

async function waitFor(check: () => Promise<boolean>, timeoutMs = 5000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > until) throw new Error('condition not met in time');
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

// ---- template -----------------------------------------------------------------------------------

describe('GET /api/stacks/:stackId/template.xlsx', () => {
  it('is a workbook with a timestamp column and one column per channel, which imports back', async () => {
    const res = await auditor.agent
      .get(`/api/stacks/${stack.stackId}/template.xlsx`)
      .buffer(true)
      .parse((response, callback) => {
        const chunks: Buffer[] = [];
        response.on('data', (c: Buffer) => chunks.push(c));
        response.on('end', () => callback(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.read(Readable.from([res.body as Buffer]));
    const header = (workbook.getWorksheet('Data')!.getRow(1).values as unknown[]).slice(1);
    expect(header).toEqual(['Time stamp', 'NOx [mg/Nm3] dry', 'CO [mg/Nm3] dry', 'SO2 [mg/Nm3] dry', 'O2 [%] dry', 'H2O [%]', 'flow [Nm3/h]', 'temperature [degC]', 'load [MW]', 'Status']);
    // Filled in, it maps itself to the stack's channels.
    const filled = await buildXlsx((sheet) => {
      sheet.addRow(header);
      sheet.addRow([new Date(Date.UTC(2026, 9, 8, 12, 1)), 60, 8, 1, 3.5, 17, 40000, 130, 30, 'OK']);
    });
    const up = await upload(officer, stack.stackId, filled, 'template-filled.xlsx');
    expect(up.status).toBe(201);
    expect(up.body.columns.map((c: { suggestedChannelId: string }) => c.suggestedChannelId)).toEqual(
      ['NOx', 'CO', 'SO2', 'O2', 'H2O', 'flow', 'temperature', 'load'].map((p) => stack.channelIds[p]),
    );
  });
});

// ---- who may do what ----------------------------------------------------------------------------

describe('access', () => {
  let draftId: string;
  beforeAll(async () => {
    draftId = (await upload(officer, stack.stackId, csv([['07.10.2026 10:01', '50', '3']]), 'access.csv')).body.id;
  });

  it('answers 404 for another organisation’s stack and import ids', async () => {
    expect((await upload(otherOfficer, stack.stackId, csv([['07.10.2026 10:01', '50', '3']]), 'x.csv')).status).toBe(404);
    expect((await otherOfficer.get(`/api/stacks/${stack.stackId}/imports`)).status).toBe(404);
    expect((await otherOfficer.get(`/api/stacks/${stack.stackId}/template.xlsx`)).status).toBe(404);
    for (const path of ['', '/progress', '/preview', '/problems.xlsx']) {
      expect((await otherOfficer.get(`/api/imports/${draftId}${path}`)).status).toBe(404);
    }
    const mapping = { columns: [], timestampColumn: 0, intervalConvention: 'interval_end' };
    expect((await otherOfficer.put(`/api/imports/${draftId}/mapping`, mapping)).status).toBe(404);
    expect((await otherOfficer.post(`/api/imports/${draftId}/commit`, {})).status).toBe(404);
    expect((await otherOfficer.post(`/api/imports/${draftId}/rollback`, { reason: 'not mine' })).status).toBe(404);
    expect(await importState(org.id, draftId)).toBe('parsed');
  });

  it('refuses every change to the auditor (403) and lets them read', async () => {
    expect((await upload(auditor, stack.stackId, csv([['07.10.2026 10:01', '50', '3']]), 'x.csv')).status).toBe(403);
    const mapping = { columns: [], timestampColumn: 0, intervalConvention: 'interval_end' };
    expect((await auditor.put(`/api/imports/${draftId}/mapping`, mapping)).status).toBe(403);
    expect((await auditor.post(`/api/imports/${draftId}/commit`, {})).status).toBe(403);
    expect((await auditor.post(`/api/imports/${draftId}/rollback`, { reason: 'no' })).status).toBe(403);
    expect((await auditor.get(`/api/imports/${draftId}/preview`)).status).toBe(200);
    const list = await auditor.get(`/api/stacks/${stack.stackId}/imports?limit=2`);
    expect(list.status).toBe(200);
    expect(list.body.items).toHaveLength(2);
    expect(list.body.total).toBeGreaterThanOrEqual(4);
  });

  it('hides the imports of a site the manager is not listed on (404)', async () => {
    expect((await manager.get(`/api/imports/${draftId}`)).status).toBe(404);
    expect((await manager.get(`/api/stacks/${stack.stackId}/imports`)).status).toBe(404);
  });
});
