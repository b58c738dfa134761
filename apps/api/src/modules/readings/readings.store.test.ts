import { randomUUID } from 'node:crypto';
import knex, { type Knex } from 'knex';
import { createOrganisation } from '../../test-support/fixtures';
import { createOwnerDb } from '../../test-support/test-app';
import { lockStackReadings } from './readings.store';

// Readings ids come from a cached sequence (migration 20261212000100); the versions of a reading
// are ordered by id. These tests write from two database sessions taking turns under the stack's
// readings lock, as two API instances (or two pooled connections) do.

let owner: Knex;
let sessionA: Knex;
let sessionB: Knex;
let tenantId: string;
const authorId = randomUUID();

/** One pooled connection: every transaction of this Knex runs in the same database session. */
function oneSession(): Knex {
  return knex({ client: 'pg', connection: process.env.DATABASE_OWNER_URL, pool: { min: 1, max: 1 } });
}

beforeAll(async () => {
  owner = createOwnerDb();
  tenantId = (await createOrganisation(owner)).id;
  // Its own month partition first: a row in the default partition would stop other suites from
  // creating October's.
  await owner.raw("select ensure_month_partition('readings', '2026-10-01')");
  sessionA = oneSession();
  sessionB = oneSession();
});

afterAll(async () => {
  await Promise.all([sessionA.destroy(), sessionB.destroy(), owner.destroy()]);
});

/** Under the stack's lock: supersedes the current reading of (channel, t), if any, and writes a new one. */
async function writeVersion(session: Knex, stackId: string, channelId: string, t: string, value: number): Promise<string> {
  return session.transaction(async (trx) => {
    await trx.raw("select set_config('app.tenant_id', ?, true)", [tenantId]);
    await lockStackReadings(trx, stackId);
    const current = await trx('readings').where({ tenant_id: tenantId, channel_id: channelId, t }).whereNull('superseded_at').first('id');
    if (current) await trx('readings').where({ tenant_id: tenantId, id: current.id }).update({ superseded_at: trx.fn.now() });
    const [row] = await trx('readings')
      .insert({ tenant_id: tenantId, channel_id: channelId, t, value, status: 'substituted', reason: 'test version', created_by: authorId })
      .returning('id');
    if (current) await trx('readings').where({ tenant_id: tenantId, id: current.id }).update({ superseded_by: row.id });
    return String(row.id);
  });
}

it('hands out readings ids a block at a time (the sequence is cached)', async () => {
  const seq = await owner.raw("select seqcache from pg_sequence where seqrelid = pg_get_serial_sequence('readings', 'id')::regclass");
  expect(Number(seq.rows[0].seqcache)).toBeGreaterThan(1);
});

it('orders the versions of a reading by id when sessions take turns under the stack lock', async () => {
  const stackId = randomUUID();
  const channelId = randomUUID();
  const t = '2026-10-05T08:00:00Z';
  // A writes first (and, with a cached sequence, keeps the rest of its block), B supersedes it,
  // then A supersedes B's version: A's second id must come after B's, not from A's old block.
  const ids = [
    await writeVersion(sessionA, stackId, channelId, t, 1),
    await writeVersion(sessionB, stackId, channelId, t, 2),
    await writeVersion(sessionA, stackId, channelId, t, 3),
    await writeVersion(sessionB, stackId, channelId, t, 4),
  ];
  const versions = await owner.transaction(async (trx) => {
    await trx.raw("select set_config('app.tenant_id', ?, true)", [tenantId]);
    return (await trx('readings').where({ tenant_id: tenantId, channel_id: channelId, t }).orderBy('id').select('id', 'value', 'superseded_by')) as {
      id: string;
      value: number;
      superseded_by: string | null;
    }[];
  });
  // Written order = id order, and each version points at the next.
  expect(versions.map((v) => v.value)).toEqual([1, 2, 3, 4]);
  expect(versions.map((v) => String(v.id))).toEqual(ids);
  expect(versions.map((v) => (v.superseded_by === null ? null : String(v.superseded_by)))).toEqual([ids[1], ids[2], ids[3], null]);
});

it('refuses a reading without an author: neither a person (created_by) nor an import', async () => {
  const write = (row: Record<string, unknown>) =>
    owner.transaction(async (trx) => {
      await trx.raw("select set_config('app.tenant_id', ?, true)", [tenantId]);
      await trx('readings').insert({ tenant_id: tenantId, channel_id: randomUUID(), t: '2026-10-05T09:00:00Z', value: 1, status: 'valid', ...row });
    });
  await expect(write({})).rejects.toMatchObject({ code: '23514', constraint: 'readings_author' });
  await expect(write({ import_id: randomUUID() })).resolves.toBeUndefined();
  await expect(write({ created_by: randomUUID() })).resolves.toBeUndefined();
});
