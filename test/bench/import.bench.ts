/**
 * Import benchmark: a month of one-minute data for 8 channels (44,640 rows) as .xlsx, through the
 * API end to end (upload → mapping → commit, supertest against createApp, real PostgreSQL), and
 * — in the same run, on the same database — a plain COPY of the same values as CSV into a plain
 * table. Prints both times and their ratio (goal ≤ 3×), for each of three trials (three months,
 * each into empty month partitions) and for the median trial.
 *
 * Honest by construction: both sides get the same 357,120 values; both are warmed up first (a
 * month's workbook through the API into another stack and month, that month's COPY into another
 * table), so neither pays for module loading or JIT; in each trial the COPY runs before and
 * after the API import and the trial's ratio uses their mean, so a change in machine load during
 * the run does not favour either side; the median trial is the result. Before each timed step the
 * bench waits until autovacuum is idle (it analyses what the previous step loaded). The database runs with fsync on (the default) for both.
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
    // Months of 31 days without a clock change at the fixture site (Europe/Berlin): 44,640 rows each.
    // Each trial imports its own month, so every trial loads into month partitions of the same
    // (empty) state.
    const trialMonths = [
      { year: 2026, month: 12 },
      { year: 2027, month: 1 },
      { year: 2027, month: 7 },
    ].map((m) => ({ ...m, timeZone: 'Europe/Berlin', faults: false, titleLines: [] }));
    const trialData = await Promise.all(
      trialMonths.map(async (m) => ({ month: m, workbook: await demoWorkbookBytes(m), rows: [...demoMonthRows(m)] })),
    );
    const { rows, workbook } = trialData[0]!;
    for (const trial of trialData) if (trial.rows.length !== rows.length) throw new Error(`a trial month has ${trial.rows.length} rows, not ${rows.length}`);
    console.log(`data: ${rows.length} rows × ${demoBoilerChannels.length} channels per month, workbook ${(workbook.length / 1024 / 1024).toFixed(1)} MB; ${trialData.length} trials`);

    const officer = await ApiClient.signedIn(app.app, org.users.officer.email, org.users.officer.password);
    const channelIds = demoBoilerChannels.map((c) => stack.channelIds[c.parameter]!);
    const expectedCells = rows.length * demoBoilerChannels.length;

    /** upload → mapping (the suggestion, saved as the stack's map) → commit; times of each phase. */
    async function importThroughApi(stackId: string, bytes: Buffer, name: string) {
      const started = performance.now();
      const uploaded = await officer.agent
        .post(`/api/stacks/${stackId}/imports`)
        .set('X-XSRF-TOKEN', officer.csrfToken ?? '')
        .attach('file', bytes, name);
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
      return {
        body: committed.body as { inserted: number },
        uploadMs: afterUpload - started,
        mappingMs: afterMapping - afterUpload,
        commitMs: finished - afterMapping,
        totalMs: finished - started,
      };
    }

    const client = new pg.Client({ connectionString: process.env.DATABASE_OWNER_URL });
    await client.connect();
    let copyTables = 0;
    /** A plain COPY of channel_id,t,value lines as CSV into a fresh plain table; its time. */
    async function plainCopy(csv: string, expected: number): Promise<number> {
      const table = `bench_plain_copy_${++copyTables}`;
      await client.query(`create table ${table} (channel_id uuid, t timestamptz, value double precision)`);
      const copyStarted = performance.now();
      await pipeline(Readable.from([csv]), client.query(copyFrom(`COPY ${table} FROM STDIN (FORMAT csv)`)));
      const copyMs = performance.now() - copyStarted;
      const copied = Number((await client.query(`select count(*) as n from ${table}`)).rows[0].n);
      if (copied !== expected) throw new Error(`plain COPY stored ${copied} rows, expected ${expected}`);
      return copyMs;
    }
    function csvOf(valueRows: { startUtcMs: number; values: (number | null | string)[] }[], ids: string[]): string {
      const lines: string[] = [];
      for (const row of valueRows) {
        const t = new Date(row.startUtcMs).toISOString();
        row.values.forEach((value, k) => lines.push(`${ids[k]},${t},${value}`));
      }
      return `${lines.join('\n')}\n`;
    }

    // ---- warm-up: a whole month through the API (another stack, another month) and its COPY ----
    // A day was not enough: the first month-sized import still ran the parser and the commit's
    // encoders before the JIT had optimised them (0.6–0.7 s of parsing against 0.35 s after).
    const warmStack = await createDemoStack(app.db, org, 'Warm-up Works');
    const warmMonth = { ...trialMonths[0]!, month: 11 };
    const warmRows = [...demoMonthRows(warmMonth)];
    const warm = await importThroughApi(warmStack.stackId, await demoWorkbookBytes(warmMonth), 'warm-up.xlsx');
    if (warm.body.inserted !== warmRows.length * demoBoilerChannels.length) throw new Error(`warm-up inserted ${warm.body.inserted}`);
    await plainCopy(csvOf(warmRows, demoBoilerChannels.map((c) => warmStack.channelIds[c.parameter]!)), warmRows.length * demoBoilerChannels.length);

    // ---- trials: the same values as CSV for COPY (before and after the API import) and as .xlsx ----
    const trials: { label: string; api: Awaited<ReturnType<typeof importThroughApi>>; copyMs: number; ratio: number }[] = [];
    /**
     * Waits (up to 30 s) until no autovacuum worker runs: a load is followed by autovacuum's
     * analyse of the loaded table, and whichever side is timed next would otherwise share the
     * machine with it.
     */
    async function settle(): Promise<void> {
      for (let waited = 0; waited < 30_000; waited += 100) {
        const busy = await client.query("select count(*)::int as n from pg_stat_activity where backend_type = 'autovacuum worker'");
        if (busy.rows[0].n === 0) return;
        await new Promise((resolve) => setTimeout(resolve, 100));
      }
    }

    for (const trial of trialData) {
      const label = `${trial.month.year}-${String(trial.month.month).padStart(2, '0')}`;
      const csv = csvOf(trial.rows, channelIds);
      await settle();
      const copyBeforeMs = await plainCopy(csv, expectedCells);
      await settle();
      const api = await importThroughApi(stack.stackId, trial.workbook, `bench-${label}.xlsx`);
      if (api.body.inserted !== expectedCells) throw new Error(`inserted ${api.body.inserted}, expected ${expectedCells}: ${JSON.stringify(api.body)}`);
      await settle();
      const copyAfterMs = await plainCopy(csv, expectedCells);
      const copyMs = (copyBeforeMs + copyAfterMs) / 2;
      trials.push({ label, api, copyMs, ratio: api.totalMs / copyMs });
      console.log(
        `trial ${label}: import ${seconds(api.totalMs)} (upload + parse + staging ${seconds(api.uploadMs)}, mapping ${seconds(api.mappingMs)}, ` +
          `commit ${seconds(api.commitMs)}); plain COPY ${seconds(copyBeforeMs)} before, ${seconds(copyAfterMs)} after; ratio ${(api.totalMs / copyMs).toFixed(2)}×`,
      );
    }
    await client.end();

    // The median trial (by its ratio to the COPYs next to it): one slow moment of the machine
    // during one trial does not decide the result either way.
    const median = [...trials].sort((x, y) => x.ratio - y.ratio)[Math.floor(trials.length / 2)]!;
    console.log(`plain COPY of the same ${expectedCells} values as CSV (median trial ${median.label}): ${seconds(median.copyMs)} (mean of before and after)`);
    console.log(
      `import: month of 1-min data, ${demoBoilerChannels.length} channels (${rows.length.toLocaleString('en-US')} rows) via API  ${seconds(median.api.totalMs)}  ` +
        `ratio ${median.ratio.toFixed(1)}× vs plain COPY (goal ≤ 3×; median of ${trials.length} trials)`,
    );
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
