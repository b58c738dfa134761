/**
 * Import benchmark: a month of one-minute data for 8 channels (44,640 rows) as .xlsx, through the
 * API end to end (upload → mapping → commit, supertest against createApp, real PostgreSQL), and
 * — in the same run, on the same database — a plain COPY of the same values as CSV into a plain
 * table. Prints both times and their ratio (goal ≤ 3×).
 *
 *   node --import tsx test/bench/import.bench.ts
 *
 * Starts its own private cluster (port 54349, fresh data folder) and stops it at the end.
 */
import { spawnSync } from 'node:child_process';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import knex from 'knex';
import pg from 'pg';
import { from as copyFrom } from 'pg-copy-streams';

const port = process.env.FL_BENCH_PG_PORT ?? '54349';
const pgEnv = { ...process.env, FL_PG_PORT: port, FL_PG_FRESH: '1', FL_PG_FSYNC: process.env.FL_PG_FSYNC ?? 'on' };

function pgScript(command: 'start' | 'stop' | 'url'): string {
  const result = spawnSync('bash', ['infra/pg.sh', command], { env: pgEnv, encoding: 'utf8' });
  if (result.status !== 0) throw new Error(`infra/pg.sh ${command} failed: ${result.stderr}`);
  return result.stdout;
}

function seconds(ms: number): string {
  return `${(ms / 1000).toFixed(2)} s`;
}

async function main(): Promise<void> {
  pgScript('start');
  for (const line of pgScript('url').trim().split('\n')) {
    const at = line.indexOf('=');
    process.env[line.slice(0, at)] = line.slice(at + 1);
  }
  process.env.NODE_ENV = 'test';
  process.env.LOG_LEVEL = 'silent';

  // Loaded after the environment points at the private cluster.
  const { knexConfig } = await import('../../knexfile');
  const { createOrganisation } = await import('../../apps/api/src/test-support/fixtures');
  const { createOwnerDb, createTestApp } = await import('../../apps/api/src/test-support/test-app');
  const { ApiClient } = await import('../../apps/api/src/test-support/api-client');
  const { createDemoStack } = await import('../../apps/api/src/modules/imports/import-fixtures');
  const { demoBoilerChannels, demoMonthRows, demoWorkbookBytes } = await import('../../apps/api/src/modules/imports/demo-data');

  const migrator = knex(knexConfig);
  await migrator.migrate.latest();
  await migrator.destroy();

  const app = createTestApp({ env: { IMPORT_MAX_BYTES: String(50 * 1024 * 1024) } });
  const owner = createOwnerDb();
  try {
    const org = await createOrganisation(owner, { name: 'Bench Organisation' });
    const stack = await createDemoStack(app.db, org, 'Bench Works');
    // December: 31 days and no clock change at the fixture site (Europe/Berlin): 44,640 rows.
    const month = { year: 2026, month: 12, timeZone: 'Europe/Berlin', faults: false, titleLines: [] };
    const workbook = await demoWorkbookBytes(month);
    const rows = [...demoMonthRows(month)];
    console.log(`data: ${rows.length} rows × ${demoBoilerChannels.length} channels, workbook ${(workbook.length / 1024 / 1024).toFixed(1)} MB`);

    const officer = await ApiClient.signedIn(app.app, org.users.officer.email, org.users.officer.password);

    // ---- through the API ----
    const started = performance.now();
    const uploaded = await officer.agent
      .post(`/api/stacks/${stack.stackId}/imports`)
      .set('X-XSRF-TOKEN', officer.csrfToken ?? '')
      .attach('file', workbook, 'bench.xlsx');
    if (uploaded.status !== 201) throw new Error(`upload: ${uploaded.status} ${JSON.stringify(uploaded.body)}`);
    const afterUpload = performance.now();
    const mapping = await officer.put(`/api/imports/${uploaded.body.id}/mapping`, {
      columns: uploaded.body.columns.map((c: { index: number; suggestedChannelId: string | null }) => ({ index: c.index, channelId: c.suggestedChannelId })),
      timestampColumn: uploaded.body.timestampColumn,
      intervalConvention: 'interval_end',
      saveAsStackMap: true,
    });
    if (mapping.status !== 200) throw new Error(`mapping: ${mapping.status} ${JSON.stringify(mapping.body)}`);
    const afterMapping = performance.now();
    const committed = await officer.post(`/api/imports/${uploaded.body.id}/commit`, {});
    if (committed.status !== 200) throw new Error(`commit: ${committed.status} ${JSON.stringify(committed.body)}`);
    const finished = performance.now();
    const apiMs = finished - started;
    const expectedCells = rows.length * demoBoilerChannels.length;
    if (committed.body.inserted !== expectedCells) throw new Error(`inserted ${committed.body.inserted}, expected ${expectedCells}: ${JSON.stringify(committed.body)} ${JSON.stringify(uploaded.body.counts)} ${uploaded.body.rowCount}`);

    // ---- baseline: plain COPY of the same values as CSV into a plain table ----
    const channelIds = demoBoilerChannels.map((c) => stack.channelIds[c.parameter]!);
    const lines: string[] = [];
    for (const row of rows) {
      const t = new Date(row.startUtcMs).toISOString();
      row.values.forEach((value, k) => lines.push(`${channelIds[k]},${t},${value}`));
    }
    const csv = `${lines.join('\n')}\n`;
    const client = new pg.Client({ connectionString: process.env.DATABASE_OWNER_URL });
    await client.connect();
    await client.query('create table bench_plain_copy (channel_id uuid, t timestamptz, value double precision)');
    const copyStarted = performance.now();
    await pipeline(Readable.from([csv]), client.query(copyFrom('COPY bench_plain_copy FROM STDIN (FORMAT csv)')));
    const copyMs = performance.now() - copyStarted;
    const copied = Number((await client.query('select count(*) as n from bench_plain_copy')).rows[0].n);
    await client.end();
    if (copied !== expectedCells) throw new Error(`plain COPY stored ${copied} rows, expected ${expectedCells}`);

    console.log(`import through the API: ${seconds(apiMs)} (upload + parse ${seconds(afterUpload - started)}, mapping ${seconds(afterMapping - afterUpload)}, commit ${seconds(finished - afterMapping)}) for ${expectedCells} readings`);
    console.log(`plain COPY of the same values as CSV: ${seconds(copyMs)}`);
    console.log(`ratio: ${(apiMs / copyMs).toFixed(1)}× (goal ≤ 3×)`);
  } finally {
    await app.close();
    await owner.destroy();
    pgScript('stop');
  }
}

main().catch((error: unknown) => {
  console.error('[bench] import failed:', error);
  try {
    pgScript('stop');
  } catch {
    // already stopped
  }
  process.exit(1);
});
