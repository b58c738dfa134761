/**
 * Benchmark of the combustion half of @flueledger/calc:
 * 1. the per-reading series conversion ppm → mg/Nm3 → dry → reference O2 over 1,000,000
 *    readings, against a bare Float64Array loop doing the same arithmetic in the same run
 *    (goal ≤ 2×);
 * 2. one equilibrium adiabatic flame temperature (goal < 20 ms, median of several).
 * Run: node --import tsx test/bench/calc-combustion.bench.ts
 */
import {
  adiabaticFlameTemperature,
  convertSeries,
  correctSeriesToReferenceO2,
  mgPerNm3PerPpm,
  ppmSeriesToMgPerNm3,
  wetSeriesToDry,
  type Fuel,
} from '../../packages/calc/src/index';

const READINGS = 1_000_000;
const REFERENCE_O2_PERCENT = 3;
const AMBIENT_O2_PERCENT = 21;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

function timeMs(run: () => void, repeats: number): number {
  const times: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const start = performance.now();
    run();
    times.push(performance.now() - start);
  }
  return median(times);
}

// Invented readings: a deterministic pseudo-random series with 1 % missing values.
let seed = 12345;
const random = () => ((seed = (seed * 1103515245 + 12345) & 0x7fffffff) / 0x7fffffff);
const noxPpmWet = new Float64Array(READINGS);
const moisturePercent = new Float64Array(READINGS);
const o2PercentDry = new Float64Array(READINGS);
for (let i = 0; i < READINGS; i++) {
  noxPpmWet[i] = random() < 0.01 ? Number.NaN : 20 + 80 * random();
  moisturePercent[i] = 8 + 10 * random();
  o2PercentDry[i] = 2 + 8 * random();
}
const out = new Float64Array(READINGS);
const bareOut = new Float64Array(READINGS);
const mgPerPpm = mgPerNm3PerPpm('NOx');

// The reference: the same arithmetic as a plain loop over Float64Arrays, no validation.
function bareConversion(ppm: Float64Array, moisture: Float64Array, o2: Float64Array, result: Float64Array): void {
  const k = mgPerPpm * (AMBIENT_O2_PERCENT - REFERENCE_O2_PERCENT);
  for (let i = 0; i < ppm.length; i++) {
    result[i] = ((ppm[i]! / (1 - moisture[i]! / 100)) * k) / (AMBIENT_O2_PERCENT - o2[i]!);
  }
}
const bareLoop = (): void => bareConversion(noxPpmWet, moisturePercent, o2PercentDry, bareOut);

function seriesConversion(): void {
  convertSeries(
    noxPpmWet,
    { fromUnit: 'ppm', species: 'NOx', basis: 'wet', moisturePercent, measuredO2PercentDry: o2PercentDry, referenceO2Percent: REFERENCE_O2_PERCENT, ambientO2Percent: AMBIENT_O2_PERCENT },
    out,
  );
}

function chainedSeries(): void {
  ppmSeriesToMgPerNm3(noxPpmWet, 'NOx', undefined, out);
  wetSeriesToDry(out, moisturePercent, out);
  correctSeriesToReferenceO2(out, o2PercentDry, REFERENCE_O2_PERCENT, { ambientO2Percent: AMBIENT_O2_PERCENT }, out);
}

// Warm up (JIT) before timing.
for (let i = 0; i < 5; i++) {
  bareLoop();
  seriesConversion();
  chainedSeries();
}
// Both must compute the same numbers, or the comparison means nothing.
seriesConversion();
bareLoop();
for (let i = 0; i < READINGS; i += 997) {
  const a = out[i]!;
  const b = bareOut[i]!;
  if (!(Number.isNaN(a) && Number.isNaN(b)) && Math.abs(a - b) > 1e-9 * Math.abs(b)) throw new Error(`series and bare loop differ at ${i}: ${a} vs ${b}`);
}

// Interleave the runs so that load from other processes hits all of them alike; report medians.
const bareTimes: number[] = [];
const seriesTimes: number[] = [];
const chainedTimes: number[] = [];
for (let r = 0; r < 15; r++) {
  bareTimes.push(timeMs(bareLoop, 1));
  seriesTimes.push(timeMs(seriesConversion, 1));
  chainedTimes.push(timeMs(chainedSeries, 1));
}
const bareMs = median(bareTimes);
const seriesMs = median(seriesTimes);
const chainedMs = median(chainedTimes);
console.log(`calc: series conversion 1e6 readings  ${seriesMs.toFixed(1)} ms  ratio ${(seriesMs / bareMs).toFixed(2)}x vs bare loop ${bareMs.toFixed(1)} ms (goal ≤ 2x)`);
console.log(`calc: chained series calls 1e6 readings  ${chainedMs.toFixed(1)} ms  ratio ${(chainedMs / bareMs).toFixed(2)}x vs bare loop (three passes; informational)`);

const methane: Fuel = { kind: 'gas', composition: { CH4: 100 } };
for (let i = 0; i < 10; i++) adiabaticFlameTemperature(methane, { model: 'equilibrium' });
const flameTimes: number[] = [];
let flameK = 0;
for (let i = 0; i < 25; i++) {
  const start = performance.now();
  flameK = adiabaticFlameTemperature(methane, { model: 'equilibrium', equivalenceRatio: 0.8 + (i % 5) * 0.1 }).temperatureK;
  flameTimes.push(performance.now() - start);
}
console.log(`calc: equilibrium flame temperature  ${median(flameTimes).toFixed(2)} ms  median of ${flameTimes.length} (methane–air, φ 0.8–1.2; last ${flameK.toFixed(0)} K) (goal < 20 ms)`);
