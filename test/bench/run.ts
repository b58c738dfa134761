/**
 * npm run bench — runs every `*.bench.ts` in this folder, one after the other, each in its own
 * process so one benchmark's garbage and JIT state do not colour the next. Each benchmark prints
 * its own times and the ratio to a baseline it measures in the same run.
 */
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { join } from 'node:path';

const benchDir = join(process.cwd(), 'test', 'bench');
const only = process.argv.slice(2);
const files = readdirSync(benchDir)
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
  .sort();

let failed = 0;
for (const file of files) {
  console.log(`\n== ${file}`);
  const result = spawnSync(process.execPath, ['--conditions=source', '--import', 'tsx', join(benchDir, file)], { stdio: 'inherit' });
  if (result.status !== 0) failed++;
}
console.log(`\nbench: ${files.length - failed} ran, ${failed} failed`);
process.exit(failed ? 1 : 0);
