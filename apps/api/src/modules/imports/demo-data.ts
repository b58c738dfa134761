/**
 * An invented month of one-minute stack data for demonstrations, seeds and benchmarks — as a data
 * logger would export it: title lines, a header row with units, local wall-clock timestamps at the
 * end of each minute, one column per channel and a status column.
 *
 * Everything is made up (no plant's real data): a natural-gas boiler of about 48 MW thermal input
 * whose load follows a day/night and weekday pattern, with O2, flow and NOx following the load,
 * and CO2 (when the channel set has it) following O2 through the fuel's CO2max:
 * `CO2dry = CO2max · (20.9 − O2dry)/20.9` (REFERENCES.md §1, complete combustion).
 * The month carries the faults an officer meets in practice, at fixed, documented times:
 * - a calibration hour (status "calibration", analyser values show zero and span gas);
 * - an analyser outage (gas analyser cells blank, status "fault");
 * - a burner fault that drives NOx and CO above any usual limit for about 45 minutes;
 * - a few cells where the logger wrote "----" instead of a number;
 * - a slow span drift of the CO2 analyser over three and a half days (its reading falls to
 *   85 % of the true value, then the span is readjusted), which the logger does not notice —
 *   status stays "OK" — but the O2/CO2 plausibility check does;
 * - the end of summer time, when the wall clock shows 02:00–02:59 twice (if the zone has DST).
 *
 * Output is deterministic for a given seed: the same call writes the same numbers.
 */
import { PassThrough, type Writable } from 'node:stream';
import { tzOffset } from '@date-fns/tz';
import { type GaseousFuel, stoichiometry } from '@flueledger/calc';
import ExcelJS from 'exceljs';
import { LocalTimeConverter, formatWall, millisecondsInMinute } from './parse/local-time';

export interface DemoChannel {
  /** Column header as the logger writes it (with its unit, unless the file has a units row). */
  header: string;
  /** Written in a second header row under the names when the file has one. */
  unit?: string;
  parameter: 'NOx' | 'NO' | 'NO2' | 'SO2' | 'CO' | 'dust' | 'CO2' | 'O2' | 'H2O' | 'flow' | 'temperature' | 'pressure' | 'load';
  /** Decimal places written. */
  decimals: number;
  /** Served by the gas analyser (affected by calibration and outage). */
  analyser: boolean;
}

/**
 * The invented Northmoor mill's grid gas (H-gas) as its 2026 lab report gives it, mol % — the
 * analysis seeds/02_demo_setup.ts stores for Boiler 2's fuel, so the demo month's CO2 and the
 * review's plausibility check use the same CO2max.
 */
export const northmoorGridGas2026: GaseousFuel = {
  kind: 'gas',
  composition: { CH4: 93.2, C2H6: 3.6, C3H8: 0.8, C4H10: 0.3, CO2: 0.9, N2: 1.2 },
};

/** CO2max of that gas, % dry (about 11.96), from @flueledger/calc's stoichiometry (REFERENCES.md §1). */
export const northmoorGasCo2MaxPercentDry = stoichiometry(northmoorGridGas2026).co2MaxPercentDry;

/**
 * The logger columns of the invented Northmoor mill's Boiler 2 stack (names as its logger writes
 * them, units in a second header row): the seven monitored channels of the demo set-up plus SO2
 * and load, which the logger records but the stack has no channel for.
 */
export const northmoorBoiler2Channels: readonly DemoChannel[] = [
  { header: 'K2_NOX', unit: 'mg/Nm3', parameter: 'NOx', decimals: 1, analyser: true },
  { header: 'K2_CO', unit: 'mg/Nm3', parameter: 'CO', decimals: 1, analyser: true },
  { header: 'K2_SO2', unit: 'mg/Nm3', parameter: 'SO2', decimals: 2, analyser: true },
  { header: 'K2_O2', unit: '%', parameter: 'O2', decimals: 2, analyser: true },
  { header: 'K2_CO2', unit: '%', parameter: 'CO2', decimals: 2, analyser: true },
  { header: 'K2_H2O', unit: '%', parameter: 'H2O', decimals: 2, analyser: false },
  { header: 'K2_FLOW', unit: 'Nm3/h', parameter: 'flow', decimals: 0, analyser: false },
  { header: 'K2_TEMP', unit: '°C', parameter: 'temperature', decimals: 1, analyser: false },
  { header: 'K2_LOAD', unit: 'MW', parameter: 'load', decimals: 2, analyser: false },
];

/** The default channel set of the demo boiler stack (8 channels, units in the headers). */
export const demoBoilerChannels: readonly DemoChannel[] = [
  { header: 'NOx [mg/Nm3] dry', parameter: 'NOx', decimals: 1, analyser: true },
  { header: 'CO [mg/Nm3] dry', parameter: 'CO', decimals: 1, analyser: true },
  { header: 'SO2 [mg/Nm3] dry', parameter: 'SO2', decimals: 2, analyser: true },
  { header: 'O2 [%] dry', parameter: 'O2', decimals: 2, analyser: true },
  { header: 'H2O [%]', parameter: 'H2O', decimals: 2, analyser: false },
  { header: 'Flue gas flow [Nm3/h]', parameter: 'flow', decimals: 0, analyser: false },
  { header: 'Flue gas temperature [°C]', parameter: 'temperature', decimals: 1, analyser: false },
  { header: 'Load [MW]', parameter: 'load', decimals: 2, analyser: false },
];

export interface DemoMonthOptions {
  year: number;
  /** 1–12. */
  month: number;
  timeZone: string;
  channels?: readonly DemoChannel[];
  seed?: number;
  /** Write the faults listed above (default true); false gives a clean month (benchmarks). */
  faults?: boolean;
  /**
   * CO2max of the fuel, % dry, from which a CO2 channel follows O2 (default: the Northmoor grid
   * gas's, {@link northmoorGasCo2MaxPercentDry}).
   */
  co2MaxPercentDry?: number;
  /** Title lines above the header (default: a logger-style title). */
  titleLines?: string[];
}

export type DemoStatus = 'valid' | 'calibration' | 'fault';

export interface DemoRow {
  /** Wall-clock end of the minute, as written in the file (wall milliseconds). */
  wallMs: number;
  /** UTC start of the minute the row covers. */
  startUtcMs: number;
  status: DemoStatus;
  /** One per channel: a number, null (blank cell) or text written by the logger. */
  values: (number | null | string)[];
}

/** Where the faults of a demo month are, as local wall-clock ranges (end-of-minute labels). */
export interface DemoEvents {
  calibration: { from: string; to: string };
  outage: { from: string; to: string };
  spike: { from: string; to: string };
  textCells: { from: string; to: string; channel: string };
  /**
   * The CO2 analyser's span drift (null without a CO2 channel): the reading falls linearly from the
   * true value at `from` to `(100 + worstSpanErrorPercent) %` of it at `to`, then is right again.
   */
  co2Drift: { from: string; to: string; channel: string; worstSpanErrorPercent: number } | null;
  dstRepeatedHour: string | null;
}

/**
 * How far the CO2 analyser's span has drifted when it is readjusted, % of reading. Beyond the
 * review's 10 % plausibility tolerance (common practice) for about the drift's last day, so the
 * demo shows flagged hours and, before them, drifting hours the check rightly lets pass.
 */
export const co2DriftWorstSpanErrorPercent = -15;

/** CO2 span gas of the calibration hour, % (a typical bottle for a 0–20 % CO2 range). */
const co2SpanGasPercent = 16;

/** mulberry32: a small, fast, seedable generator (deterministic demo data, not cryptography). */
function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function round(value: number, decimals: number): number {
  const factor = 10 ** decimals;
  return Math.round(value * factor) / factor;
}

interface EventWindows {
  calibration: [number, number];
  outage: [number, number];
  spike: [number, number];
  textCells: [number, number];
  textChannel: number;
  co2Drift: [number, number];
}

/** Fault windows as wall-clock [from, to) of the minute-end label, on fixed days of the month. */
function eventWindows(year: number, monthIndex: number, channels: readonly DemoChannel[]): EventWindows {
  const at = (day: number, hour: number, minute: number): number => Date.UTC(year, monthIndex, day, hour, minute);
  const textChannel = Math.max(0, channels.findIndex((c) => c.parameter === 'H2O'));
  return {
    calibration: [at(7, 9, 1), at(7, 10, 1)],
    outage: [at(14, 13, 21), at(14, 16, 6)],
    spike: [at(21, 6, 11), at(21, 6, 56)],
    textCells: [at(9, 22, 14), at(9, 22, 19)],
    textChannel,
    // From a Friday's midnight to the Monday morning when the technician readjusts the span.
    co2Drift: [at(16, 0, 1), at(19, 10, 1)],
  };
}

/**
 * Generates the rows of a demo month, one per wall-clock minute label in the site's zone (a
 * repeated hour at the end of summer time gives repeated labels, as a logger writes them).
 */
export function* demoMonthRows(options: DemoMonthOptions): Generator<DemoRow> {
  const channels = options.channels ?? demoBoilerChannels;
  const seed = options.seed ?? 20261001;
  const random = seededRandom(seed);
  // CO2 draws from its own stream, so adding a CO2 column leaves every other column's numbers as
  // they were for the same seed.
  const co2Random = seededRandom(seed ^ 0x0c02c02);
  const co2Max = options.co2MaxPercentDry ?? northmoorGasCo2MaxPercentDry;
  const converter = new LocalTimeConverter(options.timeZone);
  const monthIndex = options.month - 1;
  const startUtc = firstInstantOfLocalDay(converter, Date.UTC(options.year, monthIndex, 1));
  const endUtc = firstInstantOfLocalDay(converter, Date.UTC(options.year, monthIndex + 1, 1));
  const windows = eventWindows(options.year, monthIndex, channels);
  const faults = options.faults ?? true;
  const inWindow = (wall: number, [from, to]: [number, number]): boolean => faults && wall >= from && wall < to;

  // Slowly varying disturbances (AR(1) processes) so neighbouring minutes look like a real signal.
  let noxDrift = 0;
  let o2Drift = 0;
  let coDrift = 0;
  let tempDrift = 0;
  const gaussian = gaussianFrom(random);
  const co2Gaussian = gaussianFrom(co2Random);

  for (let startMs = startUtc; startMs < endUtc; startMs += millisecondsInMinute) {
    const endMs = startMs + millisecondsInMinute;
    const wallMs = utcToWall(options.timeZone, endMs);
    const localHour = new Date(wallMs - millisecondsInMinute).getUTCHours() + new Date(wallMs - millisecondsInMinute).getUTCMinutes() / 60;
    const weekday = new Date(wallMs - millisecondsInMinute).getUTCDay();
    const weekend = weekday === 0 || weekday === 6;

    // Load (MW): high by day, lower at night and at weekends; 48 MW thermal input at most.
    const dayShape = 0.5 - 0.5 * Math.cos(((localHour - 4) / 24) * 2 * Math.PI);
    const loadMW = Math.min(47.5, (weekend ? 20 : 24) + (weekend ? 12 : 19) * dayShape + gaussian() * 0.35);
    noxDrift = 0.995 * noxDrift + gaussian() * 0.35;
    o2Drift = 0.99 * o2Drift + gaussian() * 0.02;
    coDrift = 0.97 * coDrift + gaussian() * 0.6;
    tempDrift = 0.995 * tempDrift + gaussian() * 0.08;
    const o2PercentDry = 5.2 - 0.045 * loadMW + o2Drift + gaussian() * 0.04;
    let noxMgPerNm3Dry = 52 + 0.55 * loadMW + noxDrift + gaussian() * 1.2;
    let coMgPerNm3Dry = Math.max(0.5, 9 + coDrift + gaussian() * 1.5 + (loadMW < 24 ? 6 : 0));
    const so2MgPerNm3Dry = Math.max(0, 1.1 + gaussian() * 0.25);
    const h2oPercentWet = 17.6 + (o2PercentDry - 3) * -0.55 + gaussian() * 0.08;
    const flowNm3PerHourWet = loadMW * 1180 * (21 / (21 - o2PercentDry)) + gaussian() * 150;
    const temperatureDegC = 112 + 0.55 * loadMW + tempDrift + gaussian() * 0.3;

    let status: DemoStatus = 'valid';
    const calibrating = inWindow(wallMs, windows.calibration);
    const outage = inWindow(wallMs, windows.outage);
    if (inWindow(wallMs, windows.spike)) {
      // Burner fault: flame instability, NOx and CO climb for ~45 minutes.
      const progress = (wallMs - windows.spike[0]) / (windows.spike[1] - windows.spike[0]);
      noxMgPerNm3Dry += 150 * Math.sin(Math.PI * progress) + 40;
      coMgPerNm3Dry += 400 * Math.sin(Math.PI * progress);
    }
    if (calibrating) status = 'calibration';
    if (outage) status = 'fault';
    // Span drift: the CO2 reading is the true value times a gain that falls linearly to
    // (100 + worst) % and snaps back when the span is readjusted.
    const co2Gain = inWindow(wallMs, windows.co2Drift)
      ? 1 + (co2DriftWorstSpanErrorPercent / 100) * ((wallMs - windows.co2Drift[0]) / (windows.co2Drift[1] - windows.co2Drift[0]))
      : 1;

    const values = channels.map((channel, k): number | null | string => {
      if (outage && channel.analyser) return null;
      if (channel.parameter === 'CO2') {
        // Own random stream (see above); NDIR noise of a few hundredths of a per cent.
        if (calibrating) {
          const span = wallMs - windows.calibration[0] >= 30 * millisecondsInMinute;
          return round((span ? co2SpanGasPercent : 0) + co2Gaussian() * 0.02, channel.decimals);
        }
        const co2PercentDry = (co2Max * (20.9 - o2PercentDry)) / 20.9;
        return round(co2Gain * co2PercentDry + co2Gaussian() * 0.03, channel.decimals);
      }
      if (calibrating && channel.analyser) {
        // Zero gas for the first half of the hour, span gas for the second.
        const span = wallMs - windows.calibration[0] >= 30 * millisecondsInMinute;
        const spanValue: Record<string, number> = { NOx: 160, CO: 80, SO2: 150, O2: 20.9 };
        return round((span ? spanValue[channel.parameter] ?? 0 : 0) + gaussian() * 0.2, channel.decimals);
      }
      if (k === windows.textChannel && inWindow(wallMs, windows.textCells)) return '----';
      const raw: Record<DemoChannel['parameter'], number> = {
        NOx: noxMgPerNm3Dry,
        NO: noxMgPerNm3Dry * 0.62,
        NO2: noxMgPerNm3Dry * 0.05,
        SO2: so2MgPerNm3Dry,
        CO: coMgPerNm3Dry,
        dust: Math.max(0, 0.8 + gaussian() * 0.2),
        CO2: (co2Max * (20.9 - o2PercentDry)) / 20.9,
        O2: o2PercentDry,
        H2O: h2oPercentWet,
        flow: flowNm3PerHourWet,
        temperature: temperatureDegC,
        pressure: 1008 + gaussian() * 0.5,
        load: loadMW,
      };
      return round(raw[channel.parameter], channel.decimals);
    });
    yield { wallMs, startUtcMs: startMs, status, values };
  }
}

/** Gaussian deviates (Box–Muller) from a uniform generator. */
function gaussianFrom(random: () => number): () => number {
  return () => {
    const u = Math.max(random(), 1e-12);
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
  };
}

/** Where the faults are, for README walkthroughs and tests. */
export function demoMonthEvents(options: DemoMonthOptions): DemoEvents {
  const channels = options.channels ?? demoBoilerChannels;
  const w = eventWindows(options.year, options.month - 1, channels);
  const co2Channel = channels.find((c) => c.parameter === 'CO2');
  const range = ([from, to]: [number, number]): { from: string; to: string } => ({ from: formatWall(from), to: formatWall(to - millisecondsInMinute) });
  let repeated: string | null = null;
  const converter = new LocalTimeConverter(options.timeZone);
  for (let day = 1; day <= 31 && repeated === null; day++) {
    const probe = Date.UTC(options.year, options.month - 1, day, 2, 30);
    if (new Date(probe).getUTCMonth() !== options.month - 1) break;
    for (let hour = 0; hour < 24; hour++) {
      const wall = Date.UTC(options.year, options.month - 1, day, hour, 30);
      if (converter.toUtc(wall).kind === 'ambiguous') {
        repeated = `${formatWall(Date.UTC(options.year, options.month - 1, day, hour, 0))}–${String(hour).padStart(2, '0')}:59`;
        break;
      }
    }
  }
  return {
    calibration: range(w.calibration),
    outage: range(w.outage),
    spike: range(w.spike),
    textCells: { ...range(w.textCells), channel: channels[w.textChannel]?.header ?? '' },
    co2Drift: co2Channel ? { ...range(w.co2Drift), channel: co2Channel.header, worstSpanErrorPercent: co2DriftWorstSpanErrorPercent } : null,
    dstRepeatedHour: repeated,
  };
}

/** The wall clock shown in `timeZone` at a UTC instant (wall milliseconds). */
function utcToWall(timeZone: string, utcMs: number): number {
  return utcMs + tzOffsetMinutes(timeZone, utcMs) * millisecondsInMinute;
}

const offsetCache = new Map<string, number>();
function tzOffsetMinutes(timeZone: string, utcMs: number): number {
  // Zones change offset on quarter hours of UTC at the finest: one Intl look-up per quarter hour.
  const key = `${timeZone}|${Math.floor(utcMs / 900_000)}`;
  let offset = offsetCache.get(key);
  if (offset === undefined) {
    offset = tzOffset(timeZone, new Date(utcMs));
    offsetCache.set(key, offset);
  }
  return offset;
}

/** The UTC instant at which the local calendar day `wallMidnightMs` begins. */
function firstInstantOfLocalDay(converter: LocalTimeConverter, wallMidnightMs: number): number {
  const result = converter.toUtc(wallMidnightMs);
  if (result.kind === 'unique') return result.utcMs;
  if (result.kind === 'ambiguous') return result.earlierUtcMs;
  // Midnight skipped (a few zones change at 00:00): the day begins at the first existing minute.
  return firstInstantOfLocalDay(converter, wallMidnightMs + millisecondsInMinute);
}

export interface WriteDemoWorkbookResult {
  rows: number;
  events: DemoEvents;
}

/**
 * Writes a demo month as .xlsx with exceljs's streaming writer (rows go to the stream as they are
 * made, so memory stays flat).
 */
export async function writeDemoWorkbook(stream: Writable, options: DemoMonthOptions): Promise<WriteDemoWorkbookResult> {
  const channels = options.channels ?? demoBoilerChannels;
  const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({ stream, useStyles: true, useSharedStrings: false, zip: { zlib: { level: 9 } } });
  workbook.creator = 'FlueLedger demo data generator';
  // Fixed document dates: the same options give the same workbook content.
  workbook.created = new Date(Date.UTC(options.year, options.month, 1, 6, 0));
  workbook.modified = workbook.created;
  const sheet = workbook.addWorksheet('Minute values');
  sheet.columns = [
    { key: 't', width: 18, style: { numFmt: 'yyyy-mm-dd hh:mm' } },
    ...channels.map((c) => ({ key: c.parameter, width: Math.max(12, c.header.length + 2) })),
    { key: 'status', width: 12 },
  ];
  const title = options.titleLines ?? [
    'Demo stack data logger export — one-minute averages (invented data)',
    `Period: ${options.year}-${String(options.month).padStart(2, '0')}, local time ${options.timeZone}, time stamp = end of minute`,
  ];
  for (const line of title) sheet.addRow([line]).commit();
  if (title.length > 0) sheet.addRow([]).commit();
  sheet.addRow(['Time stamp', ...channels.map((c) => c.header), 'Status']).commit();
  if (channels.some((c) => c.unit)) sheet.addRow(['local time', ...channels.map((c) => c.unit ?? ''), '']).commit();
  let rows = 0;
  for (const row of demoMonthRows(options)) {
    sheet.addRow([new Date(row.wallMs), ...row.values, row.status === 'valid' ? 'OK' : row.status === 'calibration' ? 'CAL' : 'FAULT']).commit();
    rows++;
  }
  sheet.commit();
  await workbook.commit();
  return { rows, events: demoMonthEvents(options) };
}

/** The same month as CSV text (`;`-separated, decimal commas, as many European loggers write). */
export function demoMonthCsv(options: DemoMonthOptions): string {
  const channels = options.channels ?? demoBoilerChannels;
  const lines = [['Time stamp', ...channels.map((c) => c.header), 'Status'].join(';')];
  for (const row of demoMonthRows(options)) {
    const d = new Date(row.wallMs);
    const pad = (n: number): string => String(n).padStart(2, '0');
    const stamp = `${pad(d.getUTCDate())}.${pad(d.getUTCMonth() + 1)}.${d.getUTCFullYear()} ${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())}`;
    const cells = row.values.map((v) => (v === null ? '' : typeof v === 'number' ? String(v).replace('.', ',') : v));
    lines.push([stamp, ...cells, row.status === 'valid' ? 'OK' : row.status === 'calibration' ? 'CAL' : 'FAULT'].join(';'));
  }
  return `${lines.join('\r\n')}\r\n`;
}

/** The demo month as .xlsx bytes (tests, benchmarks, and the seed when the example file is missing). */
export async function demoWorkbookBytes(options: DemoMonthOptions): Promise<Buffer> {
  const sink = new PassThrough();
  const chunks: Buffer[] = [];
  sink.on('data', (chunk: Buffer) => chunks.push(chunk));
  const ended = new Promise<void>((resolve, reject) => {
    sink.on('end', resolve);
    sink.on('error', reject);
  });
  await writeDemoWorkbook(sink, options);
  await ended;
  return Buffer.concat(chunks);
}
