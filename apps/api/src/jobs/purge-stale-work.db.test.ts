import type { Knex } from 'knex';
import { createDb } from '../lib/db';
import { createOrganisation, type TestOrganisation } from '../test-support/fixtures';
import { createOwnerDb, testEnv } from '../test-support/test-app';
import { purgeStaleWork, purgeStaleWorkLockKey } from './purge-stale-work';

let owner: Knex;
let app: Knex;
let org: TestOrganisation;

/** Inserts an import in the given state with two staged parts, as the owner inside the tenant. */
async function importWithStaging(state: string, uploadedDaysAgo: number): Promise<string> {
  return owner.transaction(async (trx) => {
    await trx.raw("select set_config('app.tenant_id', ?, true)", [org.id]);
    const [site] = await trx('sites').insert({ tenant_id: org.id, name: `Purge site ${Math.random()}`, time_zone: 'UTC', country: 'DE', regime: 'eu_ied' }).returning('id');
    const [stack] = await trx('stacks').insert({ tenant_id: org.id, site_id: site.id, name: 'Purge stack' }).returning('id');
    const [imp] = await trx('imports')
      .insert({
        tenant_id: org.id,
        stack_id: stack.id,
        file_name: 'month.xlsx',
        sha256: 'a'.repeat(64),
        size_bytes: 1,
        format: 'xlsx',
        timestamp_column: 0,
        timestamp_header: 'Time',
        uploaded_by: org.users.officer.id,
        uploaded_at: trx.raw("now() - make_interval(days => ?)", [uploadedDaysAgo]),
        state,
      })
      .returning('id');
    await trx('import_columns').insert([0, 1].map((part) => ({ tenant_id: org.id, import_id: imp.id, part, content: Buffer.from([part]) })));
    return imp.id as string;
  });
}

async function stagingCount(importId: string): Promise<number> {
  return owner.transaction(async (trx) => {
    await trx.raw("select set_config('app.tenant_id', ?, true)", [org.id]);
    const [{ n }] = await trx('import_columns').where({ import_id: importId }).count<{ n: string }[]>({ n: '*' });
    return Number(n);
  });
}

beforeAll(async () => {
  owner = createOwnerDb();
  app = createDb(testEnv());
  org = await createOrganisation(owner);
});

afterAll(async () => {
  await app.destroy();
  await owner.destroy();
});

describe('the purge-stale-work job', () => {
  it('deletes staging of finished imports and of old drafts, and keeps a fresh draft', async () => {
    const committed = await importWithStaging('committed', 0);
    const oldDraft = await importWithStaging('mapped', 8);
    const freshDraft = await importWithStaging('parsed', 1);

    const outcome = await purgeStaleWork(app, { draftMaxAgeDays: 7 });

    expect(outcome.ran).toBe(true);
    expect(outcome.stagingRowsDeleted).toBeGreaterThanOrEqual(4);
    expect(await stagingCount(committed)).toBe(0);
    expect(await stagingCount(oldDraft)).toBe(0);
    expect(await stagingCount(freshDraft)).toBe(2);
  });

  it('skips the round while another instance holds the lock', async () => {
    const draft = await importWithStaging('committed', 0);
    const other = await app.transaction();
    try {
      await other.raw('select pg_advisory_xact_lock(hashtextextended(?, 0))', [purgeStaleWorkLockKey]);
      const outcome = await purgeStaleWork(app);
      expect(outcome).toEqual({ ran: false, stagingRowsDeleted: 0, rateLimitsDeleted: 0 });
      expect(await stagingCount(draft)).toBe(2);
    } finally {
      await other.rollback();
    }
    expect((await purgeStaleWork(app)).ran).toBe(true);
    expect(await stagingCount(draft)).toBe(0);
  });

  it('cannot be used by the API role to read staging directly', async () => {
    const draft = await importWithStaging('parsed', 0);
    const rows = await app('import_columns').where({ import_id: draft }).select('part');
    expect(rows).toEqual([]);
  });
});
