import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import type { Knex } from 'knex';
import { demoExampleFile, northmoorDemoMonth } from '../apps/api/src/cli/generate-demo-workbook';
import { demoWorkbookBytes } from '../apps/api/src/modules/imports/demo-data';
import * as imports from '../apps/api/src/modules/imports/imports.service';

// The demo month of one-minute data for the invented Northmoor mill's Stack 1 (Boiler 2),
// imported through the same import service the API uses (upload → suggested mapping → commit), so
// the demo shows real imports with their problems, their audit trail and their hourly values.
// Every channel of the stack must find its column through its logger label (K2_NOX … K2_CO2): the
// seed stops otherwise, rather than leave a channel — e.g. the CO2 the plausibility check needs —
// without data.
// Idempotent: a file already committed to the stack is not imported again. Runs after 02.

const NORTHMOOR = '4f1c2a7e-3b5d-4c8e-9a10-6d2e8b7c1a01';
const STACK_1 = 'd5e757ac-0000-4000-8000-000000000001';
const OFFICER_EMAIL = 'officer@northmoor.example';

function inTenant<T>(knex: Knex, userId: string, work: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  return knex.transaction(async (trx) => {
    await trx.raw("select set_config('app.tenant_id', ?, true), set_config('app.user_id', ?, true)", [NORTHMOOR, userId]);
    return work(trx);
  });
}

export async function seed(knex: Knex): Promise<void> {
  const officer = await knex('users').where({ email: OFFICER_EMAIL }).first('id');
  if (!officer) throw new Error(`03_demo_readings: run 01_demo_organisations first (${OFFICER_EMAIL} is missing)`);
  const ctxFor = (trx: Knex.Transaction) => ({ tenantId: NORTHMOOR, userId: officer.id as string, role: 'officer' as const, db: trx, requestId: 'seed-03' });

  const already = await inTenant(knex, officer.id, (trx) =>
    trx('imports').where({ tenant_id: NORTHMOOR, stack_id: STACK_1, state: 'committed' }).first('id'),
  );
  if (already) return;

  const file = path.join(process.cwd(), demoExampleFile);
  const bytes = existsSync(file) ? readFileSync(file) : await demoWorkbookBytes(northmoorDemoMonth);
  const draft = await inTenant(knex, officer.id, (trx) =>
    imports.upload(ctxFor(trx), STACK_1, { originalName: path.basename(file), bytes }, { intervalConvention: 'interval_end', periodFrom: '2026-10-01', periodTo: '2026-10-31' }),
  );
  const channelIds = await inTenant(knex, officer.id, (trx) =>
    trx('channels').where({ tenant_id: NORTHMOOR, stack_id: STACK_1 }).whereNull('archived_at').pluck('id'),
  );
  const mapped = draft.columns.filter((c) => c.mappedChannelId !== null);
  const unmapped = (channelIds as string[]).filter((channelId) => !mapped.some((c) => c.mappedChannelId === channelId));
  if (unmapped.length > 0) {
    throw new Error(`03_demo_readings: no column of ${draft.fileName} was matched to channel(s) ${unmapped.join(', ')} (columns: ${draft.columns.map((c) => c.header).join(', ')})`);
  }
  const result = await inTenant(knex, officer.id, (trx) => imports.commit(ctxFor(trx), { pool: knex }, draft.id, {}));
  console.log(
    `[seed] 03_demo_readings: ${draft.fileName} → ${result.inserted} readings of ${mapped.map((c) => c.header).join(', ')} (${draft.problemCount} problems reported)`,
  );
}
