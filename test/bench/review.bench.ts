/**
 * Benchmark: the data review of one stack for a month. Stores an invented month of 1-minute
 * readings for the eight channels of the demo stack (8 × 43,200 = 345,600 rows, inserted set-based
 * as a committed import leaves them), computes its hourly results as the import commit does (and
 * prints that time next to a plain aggregate query over the same rows, the baseline of this run),
 * then starts the API on a loopback port and sends a bounded number of review requests one after
 * the other, printing p50/p95/max latency (goal: p95 < 50 ms).
 *
 * Needs the database: `FL_PG_PORT=… bash infra/pg.sh start`, its URLs exported
 * (`eval "$(bash infra/pg.sh url | sed 's/^/export /')"`) and migrations applied. Leaves one
 * organisation named "Bench review …" behind.
 *
 * Run: node --conditions=source --import tsx test/bench/review.bench.ts [requests]
 */
import type { AddressInfo } from 'node:net';
import type { Knex } from 'knex';
import { createDemoStack } from '../../apps/api/src/modules/imports/import-fixtures';
import { CreateLimitBody } from '../../apps/api/src/modules/permits/limits.schemas';
import * as limits from '../../apps/api/src/modules/permits/limits.service';
import { recomputeForReadings } from '../../apps/api/src/modules/results/results.service';
import { asMember } from '../../apps/api/src/modules/sites/setup-fixtures';
import { asOwnerInTenant, createOrganisation } from '../../apps/api/src/test-support/fixtures';
import { createOwnerDb, createTestApp } from '../../apps/api/src/test-support/test-app';

const REQUESTS = Math.max(20, Math.min(2000, Number(process.argv[2] ?? 200)));
const WARM_UP = 10;
const MONTH_FROM = Date.UTC(2026, 9, 31, 23); // 2026-11-01 00:00 Europe/Berlin
const MONTH_TO = Date.UTC(2026, 10, 30, 23); // 2026-12-01 00:00 Europe/Berlin

if (!process.env.DATABASE_URL || !process.env.DATABASE_OWNER_URL) {
  console.log('review.bench: skipped — start the database and export DATABASE_URL and DATABASE_OWNER_URL (bash infra/pg.sh url)');
  process.exit(0);
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

async function storeMonth(owner: Knex, tenantId: string, userId: string, channelIds: Record<string, string>): Promise<number> {
  await owner.raw("select ensure_month_partition('readings', '2026-11-01')");
  let rows = 0;
  for (const [parameter, channelId] of Object.entries(channelIds)) {
    const [level, amplitude] = SIGNAL[parameter] ?? [1, 0];
    // A daily cycle plus a deterministic ripple; a calibration hour every day at 06:00 UTC.
    const result = await asOwnerInTenant(owner, tenantId, (trx) =>
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

async function main(): Promise<void> {
  const t = createTestApp();
  const owner = createOwnerDb();
  try {
    const org = await createOrganisation(owner, { name: `Bench review ${new Date().toISOString()}` });
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
    const rows = await storeMonth(owner, org.id, org.users.officer.id, stack.channelIds);
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

      const url = `${base}/api/stacks/${stack.stackId}/review?from=2026-11-01&to=2026-12-01`;
      const latencies: number[] = [];
      let bytes = 0;
      for (let i = 0; i < WARM_UP + REQUESTS; i++) {
        const t0 = performance.now();
        const res = await fetch(url, { headers: { cookie: cookieHeader(jar) } });
        const body = await res.text();
        const ms = performance.now() - t0;
        if (res.status !== 200) throw new Error(`review answered ${res.status}: ${body.slice(0, 300)}`);
        if (i >= WARM_UP) latencies.push(ms);
        bytes = body.length;
      }
      latencies.sort((a, b) => a - b);
      const p95 = percentile(latencies, 95);
      console.log(
        `GET review (one stack, one month, ${(bytes / 1024).toFixed(0)} KiB) × ${REQUESTS}: ` +
          `p50 ${percentile(latencies, 50).toFixed(1)} ms, p95 ${p95.toFixed(1)} ms, max ${latencies[latencies.length - 1]!.toFixed(1)} ms ` +
          `(goal p95 < 50 ms: ${p95 < 50 ? 'met' : 'NOT met'})`,
      );
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
