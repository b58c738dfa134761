import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { withScope } from '../../lib/db';
import { type TestOrganisation, asOwnerInTenant, createOrganisation } from '../../test-support/fixtures';
import { type TestApp, createOwnerDb, createTestApp } from '../../test-support/test-app';
import { type SiteTree, buildSiteTree } from '../sites/setup-fixtures';

// Hourly results refer to their channel and limit through statement-level checks (migration
// 20261212000200) instead of foreign keys; these tests hold them to what the foreign keys did.

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let other: TestOrganisation;
let tree: SiteTree;
let otherTree: SiteTree;
const hour = new Date(Date.UTC(2026, 8, 1, 0));

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  other = await createOrganisation(owner);
  tree = await buildSiteTree(t.db, org, 'Series Works');
  otherTree = await buildSiteTree(t.db, other, 'Elsewhere Works');
  await owner.raw("select ensure_month_partition('hourly_values', '2026-09-01')");
  await owner.raw("select ensure_month_partition('limit_hourly_values', '2026-09-01')");
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

const asOfficer = <T>(work: (db: Knex.Transaction) => Promise<T>): Promise<T> => withScope(t.db, { tenantId: org.id, userId: org.users.officer.id }, work);

const channelHour = (channelId: string, at = hour) => ({ tenant_id: org.id, channel_id: channelId, hour_start: at, value: 50, status: 'valid', coverage: 1 });
const limitHour = (limitId: string, at = hour) => ({ tenant_id: org.id, limit_id: limitId, hour_start: at, value: 80, status: 'valid' });

/** The SQLSTATE a statement fails with (null when it succeeds). */
async function sqlState(work: () => Promise<unknown>): Promise<string | null> {
  try {
    await work();
    return null;
  } catch (error) {
    return (error as { code?: string }).code ?? String(error);
  }
}

describe('hourly values refer to an existing channel', () => {
  it('stores hours of the organisation’s own channel', async () => {
    await asOfficer((db) => db('hourly_values').insert(channelHour(tree.channelId)));
    const stored = await asOfficer((db) => db('hourly_values').where({ tenant_id: org.id, channel_id: tree.channelId }).count({ n: '*' }));
    expect(Number(stored[0]!.n)).toBe(1);
  });

  it('refuses a statement with hours of a channel that does not exist, storing none of them', async () => {
    const at = new Date(hour.getTime() + 3_600_000);
    const state = await sqlState(() => asOfficer((db) => db('hourly_values').insert([channelHour(tree.channelId, at), channelHour(randomUUID(), at)])));
    expect(state).toBe('23503');
    const stored = await asOfficer((db) => db('hourly_values').where({ tenant_id: org.id, hour_start: at }).count({ n: '*' }));
    expect(Number(stored[0]!.n)).toBe(0);
  });

  it('refuses hours of another organisation’s channel', async () => {
    expect(await sqlState(() => asOfficer((db) => db('hourly_values').insert(channelHour(otherTree.channelId, new Date(hour.getTime() + 7_200_000)))))).toBe('23503');
  });

  it('refuses moving stored hours to a channel that does not exist', async () => {
    expect(await sqlState(() => asOfficer((db) => db('hourly_values').where({ tenant_id: org.id, channel_id: tree.channelId }).update({ channel_id: randomUUID() })))).toBe('23503');
  });
});

describe('limit hours refer to an existing limit', () => {
  it('stores hours of the organisation’s own limit and refuses those of an unknown one', async () => {
    await asOfficer((db) => db('limit_hourly_values').insert(limitHour(tree.limitId)));
    expect(await sqlState(() => asOfficer((db) => db('limit_hourly_values').insert(limitHour(randomUUID(), new Date(hour.getTime() + 3_600_000)))))).toBe('23503');
    expect(await sqlState(() => asOfficer((db) => db('limit_hourly_values').insert(limitHour(otherTree.limitId, new Date(hour.getTime() + 3_600_000)))))).toBe('23503');
  });
});

describe('channels and limits with hours stay', () => {
  it('the API role cannot delete a channel or a limit', async () => {
    expect(await sqlState(() => asOfficer((db) => db('channels').where({ tenant_id: org.id, id: tree.channelId }).delete()))).toBe('42501');
    expect(await sqlState(() => asOfficer((db) => db('permit_limits').where({ tenant_id: org.id, id: tree.limitId }).delete()))).toBe('42501');
  });

  it('the owner role cannot delete them either while hours refer to them', async () => {
    expect(await sqlState(() => asOwnerInTenant(owner, org.id, (trx) => trx('channels').where({ tenant_id: org.id, id: tree.channelId }).delete()))).toBe('23503');
    expect(await sqlState(() => asOwnerInTenant(owner, org.id, (trx) => trx('permit_limits').where({ tenant_id: org.id, id: tree.limitId }).delete()))).toBe('23503');
  });

  it('a channel’s id never changes', async () => {
    expect(await sqlState(() => asOfficer((db) => db('channels').where({ tenant_id: org.id, id: tree.channelId }).update({ id: randomUUID() })))).toBe('23503');
    // Other columns change as before.
    expect(await sqlState(() => asOfficer((db) => db('channels').where({ tenant_id: org.id, id: tree.channelId }).update({ updated_at: db.fn.now() })))).toBeNull();
  });
});
