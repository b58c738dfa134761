/**
 * Benchmark: one year of 1-minute NOx and O2 readings (525,600 each) → hourly values (15-minute
 * quadrant rule) → dry, corrected to 3 % O2 → evaluated against the IED Annex V set (monthly,
 * daily 110 %, 95 % of hours ≤ 200 %) and a rolling 30-day rule. Prints the median time of
 * several runs after warm-up and its ratio to a single pass that only sums the NOx values.
 *
 * Run: node --import tsx test/bench/calc-compliance.bench.ts
 */
import {
  ReadingStatusCode,
  aggregateHours,
  deriveHourlyValues,
  evaluateLimit,
  iedLcpRules,
  parseLimitRule,
  type ReadingColumns,
} from '../../packages/calc/src/index';

const MINUTES = 525_600;
const START = Date.UTC(2025, 0, 1) - 3_600_000; // local (Europe/Berlin) 2025-01-01 00:00
const TIME_ZONE = 'Europe/Berlin';

/** Deterministic pseudo-random numbers (mulberry32), so every run sees the same data. */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function generate(): { nox: ReadingColumns; o2: ReadingColumns } {
  const rnd = mulberry32(20261201);
  const t = new Float64Array(MINUTES);
  const noxV = new Float64Array(MINUTES);
  const o2V = new Float64Array(MINUTES);
  const noxS = new Uint8Array(MINUTES);
  const o2S = new Uint8Array(MINUTES);
  for (let i = 0; i < MINUTES; i++) {
    t[i] = START + i * 60_000;
    const hourOfYear = Math.floor(i / 60);
    const o2 = 4 + 2 * Math.sin(hourOfYear / 9) + rnd();
    o2V[i] = o2;
    noxV[i] = 55 + 20 * Math.sin(hourOfYear / 37) + 10 * rnd();
    // Invented events: a daily 10-minute calibration at 03:00, random analyser faults, a two-week outage.
    const minuteOfDay = i % 1440;
    let s: number = ReadingStatusCode.valid;
    if (minuteOfDay >= 180 && minuteOfDay < 190) s = ReadingStatusCode.calibration;
    else if (rnd() < 0.002) s = ReadingStatusCode.fault;
    if (i > 200_000 && i < 220_160) s = ReadingStatusCode['not-operating'];
    noxS[i] = s;
    o2S[i] = s === ReadingStatusCode.calibration ? ReadingStatusCode.valid : s;
  }
  return { nox: { t, value: noxV, status: noxS }, o2: { t, value: o2V, status: o2S } };
}

const data = generate();
const interval = { from: START, to: START + MINUTES * 60_000 };
const ied = iedLcpRules({ pollutant: 'NOx', elvMgPerNm3: 100, referenceO2Percent: 3 });
const rolling30 = parseLimitRule({
  id: 'nox-rolling-30-days',
  pollutant: 'NOx',
  elv: 100,
  unit: 'mg/Nm3',
  referenceO2Percent: 3,
  period: { kind: 'rolling-days', days: 30, operatingDaysOnly: true },
  criterion: { kind: 'every-period', factor: 1 },
  minData: { minValidHoursPerDay: 18, minValidDays: 22 },
});

function evaluateAll() {
  const nox = aggregateHours(data.nox, { rule: { kind: 'quadrants' }, intervalMinutes: 1, ...interval });
  const o2 = aggregateHours(data.o2, { rule: { kind: 'quadrants' }, intervalMinutes: 1, ...interval });
  const hourly = deriveHourlyValues({ pollutant: nox, o2 }, { pollutantUnit: 'mgPerNm3', pollutantBasis: 'dry', referenceO2Percent: 3 });
  return [...ied, rolling30].map((rule) => evaluateLimit(hourly, rule, interval, { timeZone: TIME_ZONE }));
}

function compliancePass(): number {
  let checksum = 0;
  for (const e of evaluateAll()) checksum += e.periods.length + e.exceedances.length + (e.verdict === 'compliant' ? 1 : 0);
  return checksum;
}

function sumPass(): number {
  const v = data.nox.value;
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i]!;
  return s;
}

function medianMs(fn: () => number, runs: number, warmups: number): { ms: number; sink: number } {
  let sink = 0;
  for (let i = 0; i < warmups; i++) sink += fn();
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    sink += fn();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return { ms: times[times.length >> 1]!, sink };
}

const full = medianMs(compliancePass, 7, 2);
const plain = medianMs(sumPass, 51, 5);
const ratio = full.ms / plain.ms;
console.log(
  `calc: compliance year of 1-min NOx+O2 (IED set + rolling 30 d)  ${full.ms.toFixed(0)} ms  ratio ${ratio.toFixed(0)}x vs plain sum pass (goal < 0.5 s)` +
    (full.ms < 500 ? '' : '  ABOVE GOAL'),
);
const evaluations = evaluateAll();
console.log(
  `  verdicts: ${evaluations.map((e) => `${e.rule.id} ${e.verdict}`).join(', ')}; data availability ${evaluations[0]!.availability.percent!.toFixed(1)} %, invalid days ${evaluations[0]!.invalidDays}`,
);
if (!Number.isFinite(full.sink + plain.sink)) process.exitCode = 1;
