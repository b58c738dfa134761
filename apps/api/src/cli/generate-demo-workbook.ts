// Writes the invented demo month of one-minute stack data as a logger-style workbook.
//   node --import tsx apps/api/src/cli/generate-demo-workbook.ts [output.xlsx]
// Default: examples/northmoor-boiler2-2026-10.xlsx (October 2026, Europe/Berlin: includes the end
// of summer time), the file the README walks through and seeds/03_demo_readings.ts imports.
import { createWriteStream, mkdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { northmoorBoiler2Channels, northmoorGasCo2MaxPercentDry, writeDemoWorkbook } from '../modules/imports/demo-data';

export const demoExampleFile = path.join('examples', 'northmoor-boiler2-2026-10.xlsx');

export const northmoorDemoMonth = {
  year: 2026,
  month: 10,
  timeZone: 'Europe/Berlin',
  channels: northmoorBoiler2Channels,
  seed: 20261001,
  // The seeded 2026 analysis of the mill's grid gas (seeds/02_demo_setup.ts): CO2 follows O2 through it.
  co2MaxPercentDry: northmoorGasCo2MaxPercentDry,
  titleLines: [
    'Northmoor Mill (invented) — Stack 1 (Boiler 2) — data logger export, one-minute averages',
    'Period 2026-10, local time Europe/Berlin, time stamp = end of the minute. Demo data: every number is made up.',
  ],
};

async function main(): Promise<void> {
  const output = path.resolve(process.cwd(), process.argv[2] ?? demoExampleFile);
  mkdirSync(path.dirname(output), { recursive: true });
  const stream = createWriteStream(output);
  const finished = new Promise<void>((resolve, reject) => {
    stream.on('finish', resolve);
    stream.on('error', reject);
  });
  const { rows, events } = await writeDemoWorkbook(stream, northmoorDemoMonth);
  await finished;
  console.log(`[demo] wrote ${rows} rows × ${northmoorBoiler2Channels.length} channels to ${path.relative(process.cwd(), output)} (${(statSync(output).size / 1024 / 1024).toFixed(1)} MB)`);
  console.log(`[demo] calibration ${events.calibration.from}–${events.calibration.to}; analyser outage ${events.outage.from}–${events.outage.to};`);
  console.log(`[demo] burner fault (NOx/CO high) ${events.spike.from}–${events.spike.to}; "----" in ${events.textCells.channel} ${events.textCells.from}–${events.textCells.to};`);
  if (events.co2Drift) {
    console.log(`[demo] ${events.co2Drift.channel} span drift to ${events.co2Drift.worstSpanErrorPercent} % of reading ${events.co2Drift.from}–${events.co2Drift.to} (CO2max ${northmoorGasCo2MaxPercentDry.toFixed(2)} % dry);`);
  }
  console.log(`[demo] repeated hour at the end of summer time: ${events.dstRepeatedHour ?? 'none'}`);
}

if (process.argv[1] && /generate-demo-workbook\.ts$/.test(process.argv[1])) {
  main().catch((error: unknown) => {
    console.error('[demo] failed:', error);
    process.exit(1);
  });
}
