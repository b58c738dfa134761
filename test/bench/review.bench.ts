/**
 * Benchmark: the data review of one stack for a month. Stores an invented month of 1-minute
 * readings for the eight channels of the demo stack (8 × 43,200 = 345,600 rows, inserted set-based
 * as a committed import leaves them), computes its hourly results as the import commit does (and
 * prints that time next to a plain aggregate query over the same rows, the baseline of this run),
 * then starts the API on a loopback port and sends a bounded number of review requests one after
 * the other, each a full 200 answer read and decoded as a browser would (JSON.parse), printing
 * p50/p95/max latency (goal: p95 < 50 ms). The machine may be shared: between review requests it
 * also times `GET /api/health` (public, one query) and `GET /api/me` (signed in, same session and
 * transaction pipeline as the review), so the ratio to those says more than the bare figure.
 * The first review after the hourly results were written builds the month documents the later
 * ones read (modules/review/review.repo.ts); its time is printed apart.
 * Conditional requests (If-None-Match → 304) are timed apart and do not count in the p95.
 *
 * Starts its own private cluster (port 54348, fresh data folder, migrated here) and stops it at
 * the end, so it runs on a fresh machine: `npm run bench review`, or
 *
 *   node --import tsx test/bench/review.bench.ts [requests]
 */
import { spawnSync } from 'node:child_process';
import type { AddressInfo } from 'node:net';
import type { Knex } from 'knex';

const REQUESTS = Math.max(20, Math.min(2000, Number(process.argv[2] ?? 200)));
const WARM_UP = 10;
const CONDITIONAL_REQUESTS = 20;
const MONTH_FROM = Date.UTC(2026, 9, 31, 23); // 2026-11-01 00:00 Europe/Berlin
const MONTH_TO = Date.UTC(2026, 10, 30, 23); // 2026-12-01 00:00 Europe/Berlin

const port = process.env.FL_BENCH_REVIEW_PG_PORT ?? '54348';
const pgEnv = { ...process.env, FL_PG_PORT: port, FL_PG_FRESH: '1', FL_PG_FSYNC: process.env.FL_PG_FSYNC ?? 'on' };

function pgScript(command: 'start' | 'stop' | 'url'): string {
  const result = spawnSync('bash', ['infra/pg.sh', command], { env: pgEnv, encoding: 'utf8' });
  if (result.status !== 0) throw new Error(`infra/pg.sh ${command} failed: ${result.stderr}`);
  return result.stdout;
}

/** Per-parameter level and amplitude of the invented signal (units of the demo channels). */
const SIGNAL: Record<string, [number, number]> = {
  NOx: [70, 15],
  CO: [20, 10],
  SO2: [5, 2],
  O2: [4, 0.8],
  H2O: [17, 1.5],
  flow: [52_000, 6_000],
  temperature: [140, 8],
  load: [38, 6],
};

type Fixtures = typeof import('../../apps/api/src/test-support/fixtures');

async function storeMonth(
  fixtures: Fixtures,
  owner: Knex,
  tenantId: string,
  userId: string,
  channelIds: Record<string, string>,
): Promise<number> {
  await owner.raw("select ensure_month_partition('readings', '2026-11-01')");
  let rows = 0;
  for (const [parameter, channelId] of Object.entries(channelIds)) {
    const [level, amplitude] = SIGNAL[parameter] ?? [1, 0];
    // A daily cycle plus a deterministic ripple; a calibration hour every day at 06:00 UTC.
    const result = await fixtures.asOwnerInTenant(owner, tenantId, (trx) =>
      trx.raw(
        `insert into readings (tenant_id, channel_id, t, value, status, created_by)
         select ?, ?, g.t,
                ? + ? * sin(extract(epoch from g.t) / 13751.0) + ? * 0.1 * sin(extract(epoch from g.t) / 97.0),
                case when extract(hour from g.t at time zone 'UTC') = 6 and extract(minute from g.t) < 20 then 'calibration' else 'valid' end,
                ?
           from generate_series(?::timestamptz, ?::timestamptz - interval '1 minute', interval '1 minute') as g(t)`,
        [tenantId, channelId, level, amplitude, amplitude, userId, new Date(MONTH_FROM).toISOString(), new Date(MONTH_TO).toISOString()],
      ),
    );
    rows += result.rowCount ?? 0;
  }
  return rows;
}

function cookieHeader(jar: Map<string, string>): string {
  return [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
}

function remember(jar: Map<string, string>, res: Response): void {
  for (const c of res.headers.getSetCookie()) {
    const [pair] = c.split(';');
    const at = pair!.indexOf('=');
    jar.set(pair!.slice(0, at).trim(), pair!.slice(at + 1));
  }
}

function percentile(sorted: readonly number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;
}

/** Latencies of one kind of request, in ms. */
class Timings {
  readonly ms: number[] = [];
  add(ms: number): void {
    this.ms.push(ms);
  }
  stats(): { p50: number; p95: number; max: number } {
    const sorted = [...this.ms].sort((a, b) => a - b);
    return { p50: percentile(sorted, 50), p95: percentile(sorted, 95), max: sorted[sorted.length - 1]! };
  }
  line(): string {
    const s = this.stats();
    return `p50 ${s.p50.toFixed(1)} ms, p95 ${s.p95.toFixed(1)} ms, max ${s.max.toFixed(1)} ms`;
  }
}

/** One request, its body read and (when JSON) decoded, timed. */
async function timed(url: string, headers: Record<string, string>, expectStatus: number): Promise<{ ms: number; bytes: number; res: Response }> {
  const t0 = performance.now();
  const res = await fetch(url, { headers });
  const text = await res.text();
  if (text && (res.headers.get('content-type') ?? '').includes('json')) JSON.parse(text);
  const ms = performance.now() - t0;
  if (res.status !== expectStatus) throw new Error(`${url} answered ${res.status} (expected ${expectStatus}): ${text.slice(0, 300)}`);
  return { ms, bytes: Buffer.byteLength(text), res };
}

async function main(): Promise<void> {
  pgScript('start');
  try {
    for (const line of pgScript('url').trim().split('\n')) {
      const at = line.indexOf('=');
      process.env[line.slice(0, at)] = line.slice(at + 1);
    }
    process.env.NODE_ENV = 'test';
    process.env.LOG_LEVEL = 'silent';
    await run();
  } finally {
    pgScript('stop');
  }
}

async function run(): Promise<void> {
  // Loaded after the environment points at the private cluster.
  const { default: knex } = await import('knex');
  const { knexConfig } = await import('../../knexfile');
  const { createDemoStack } = await import('../../apps/api/src/modules/imports/import-fixtures');
  const { CreateLimitBody } = await import('../../apps/api/src/modules/permits/limits.schemas');
  const limits = await import('../../apps/api/src/modules/permits/limits.service');
  const { recomputeForReadings } = await import('../../apps/api/src/modules/results/results.service');
  const { asMember } = await import('../../apps/api/src/modules/sites/setup-fixtures');
  const fixtures = await import('../../apps/api/src/test-support/fixtures');
  const { createOwnerDb, createTestApp } = await import('../../apps/api/src/test-support/test-app');

  const migrator = knex(knexConfig);
  await migrator.migrate.latest();
  await migrator.destroy();

  const t = createTestApp();
  const owner = createOwnerDb();
  try {
    const org = await fixtures.createOrganisation(owner, { name: 'Bench review' });
    const stack = await createDemoStack(t.db, org, 'Bench Works');
    await asMember(t.db, org, 'officer', async (ctx) => {
      const permitId = (await ctx.db('permits').where({ tenant_id: org.id }).first('id')).id as string;
      for (const body of [
        { stackId: stack.stackId, pollutant: 'NOx', elv: 100, unit: 'mg/Nm3', referenceO2Percent: 3, period: 'month', confidenceIntervalPercent: 20 },
        { stackId: stack.stackId, pollutant: 'NOx', elv: 100, unit: 'mg/Nm3', referenceO2Percent: 3, period: 'hour', criterion: { type: 'share_of_periods', factor: 2, share: 0.95 }, confidenceIntervalPercent: 20 },
        { stackId: stack.stackId, pollutant: 'CO', elv: 100, unit: 'mg/Nm3', referenceO2Percent: 3, period: 'day', criterion: { type: 'every_period', factor: 1.1 }, confidenceIntervalPercent: 10 },
        { stackId: stack.stackId, pollutant: 'SO2', elv: 35, unit: 'mg/Nm3', referenceO2Percent: 3, period: 'rolling_days', periodLength: 30 },
        { stackId: stack.stackId, pollutant: 'NOx', elv: 40, unit: 'kg/h', period: 'day' },
      ]) {
        await limits.createLimit(ctx, permitId, CreateLimitBody.parse(body));
      }
    });

    let started = performance.now();
    const rows = await storeMonth(fixtures, owner, org.id, org.users.officer.id, stack.channelIds);
    console.log(`stored ${rows.toLocaleString('en')} readings (8 channels, one month of 1-minute data) in ${(performance.now() - started).toFixed(0)} ms`);

    started = performance.now();
    await asMember(t.db, org, 'officer', (ctx) =>
      recomputeForReadings(ctx, { channelIds: Object.values(stack.channelIds), from: new Date(MONTH_FROM), to: new Date(MONTH_TO) }),
    );
    const recomputeMs = performance.now() - started;
    started = performance.now();
    await asMember(t.db, org, 'officer', (ctx) =>
      ctx.db.raw(
        `select channel_id, date_trunc('hour', t) as h, avg(value) filter (where status = 'valid'), count(*)
           from readings where tenant_id = ? and t >= ? and t < ? and superseded_at is null group by 1, 2`,
        [org.id, new Date(MONTH_FROM).toISOString(), new Date(MONTH_TO).toISOString()],
      ),
    );
    const baselineMs = performance.now() - started;
    console.log(
      `hourly results (8 channels, 6 limits, 720 h) computed in ${recomputeMs.toFixed(0)} ms; ` +
        `plain SQL hourly aggregate of the same rows ${baselineMs.toFixed(0)} ms (ratio ${(recomputeMs / baselineMs).toFixed(2)}×)`,
    );

    const server = t.app.listen(0, '127.0.0.1');
    await new Promise<void>((resolve) => server.once('listening', () => resolve()));
    const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    try {
      const jar = new Map<string, string>();
      remember(jar, await fetch(`${base}/api/auth/csrf`));
      const login = await fetch(`${base}/api/auth/login`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', cookie: cookieHeader(jar), 'x-xsrf-token': decodeURIComponent(jar.get('XSRF-TOKEN') ?? '') },
        body: JSON.stringify({ email: org.users.officer.email, password: org.users.officer.password }),
      });
      if (login.status !== 200) throw new Error(`sign-in failed: ${login.status} ${await login.text()}`);
      remember(jar, login);
      const signedIn = { cookie: cookieHeader(jar) };

      const url = `${base}/api/stacks/${stack.stackId}/review?from=2026-11-01&to=2026-12-01`;
      const review = new Timings();
      const health = new Timings();
      const me = new Timings();
      let bytes = 0;
      let etag: string | null = null;
      let firstMs = 0;
      // Interleaved, so a burst of load from elsewhere on the machine hits all three alike.
      for (let i = 0; i < WARM_UP + REQUESTS; i++) {
        const r = await timed(url, signedIn, 200);
        const h = await timed(`${base}/api/health`, {}, 200);
        const m = await timed(`${base}/api/me`, signedIn, 200);
        if (i === 0) firstMs = r.ms;
        if (i < WARM_UP) continue;
        review.add(r.ms);
        health.add(h.ms);
        me.add(m.ms);
        bytes = r.bytes;
        etag = r.res.headers.get('etag');
      }
      const p95 = review.stats().p95;
      console.log(`first review after the hourly results were written (builds the month documents it reads, not counted below): ${firstMs.toFixed(1)} ms`);
      console.log(`GET /api/health × ${REQUESTS}: ${health.line()}`);
      console.log(`GET /api/me × ${REQUESTS}: ${me.line()}`);
      console.log(
        `GET review (one stack, one month, ${(bytes / 1024).toFixed(0)} KiB, full 200 answers) × ${REQUESTS}: ${review.line()} ` +
          `(goal p95 < 50 ms: ${p95 < 50 ? 'met' : 'NOT met'}; p95 ${(p95 / me.stats().p95).toFixed(1)}× that of /api/me, ` +
          `${(p95 / health.stats().p95).toFixed(1)}× that of /api/health)`,
      );
      // Only our own strong tag promises a 304 (Express's weak body hash is computed after the work).
      if (etag && !etag.startsWith('W/')) {
        const conditional = new Timings();
        for (let i = 0; i < CONDITIONAL_REQUESTS; i++) conditional.add((await timed(url, { ...signedIn, 'if-none-match': etag }, 304)).ms);
        console.log(`GET review with If-None-Match (304, not counted above) × ${CONDITIONAL_REQUESTS}: ${conditional.line()}`);
      }
    } finally {
      await new Promise<void>((resolve) => server.close(() => resolve()));
    }
  } finally {
    await t.close();
    await owner.destroy();
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
