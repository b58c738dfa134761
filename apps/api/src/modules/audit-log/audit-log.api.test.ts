import type { Knex } from 'knex';
import { ApiClient } from '../../test-support/api-client';
import { asOwnerInTenant, createOrganisation, testPassword, type TestOrganisation } from '../../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../../test-support/test-app';
import { withScope } from '../../lib/db';

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let other: TestOrganisation;

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  other = await createOrganisation(owner);
  await asOwnerInTenant(owner, org.id, (trx) =>
    trx('audit_log').insert([
      { tenant_id: org.id, actor_user_id: org.users.officer.id, action: 'site.created', entity: 'site', entity_id: 's-1', after: { name: 'Mill' } },
      { tenant_id: org.id, actor_user_id: null, action: 'job.ran', entity: 'job' },
    ]),
  );
  await asOwnerInTenant(owner, other.id, (trx) =>
    trx('audit_log').insert({ tenant_id: other.id, actor_user_id: other.users.admin.id, action: 'site.created', entity: 'site' }),
  );
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('GET /api/audit-log', () => {
  it("lists the organisation's entries newest first, with the actor", async () => {
    const client = await ApiClient.signedIn(t.app, org.users.auditor.email, testPassword);
    const res = await client.get('/api/audit-log');
    expect(res.status).toBe(200);
    const actions = res.body.items.map((i: { action: string }) => i.action);
    // the auditor's own sign-in is recorded too, and comes first
    expect(actions).toEqual(['session.signed_in', 'job.ran', 'site.created']);
    expect(res.body.total).toBe(3);
    const site = res.body.items[2];
    expect(site).toEqual({
      id: expect.any(Number),
      at: expect.stringMatching(/^\d{4}-\d{2}-\d{2}T/),
      actor: { id: org.users.officer.id, name: org.users.officer.name, email: org.users.officer.email },
      action: 'site.created',
      entity: 'site',
      entityId: 's-1',
      before: null,
      after: { name: 'Mill' },
    });
    expect(res.body.items[1].actor).toBeNull();
  });

  it('filters by entity and pages', async () => {
    const client = await ApiClient.signedIn(t.app, org.users.admin.email, testPassword);
    const sites = await client.get('/api/audit-log?entity=site');
    expect(sites.body.items.map((i: { action: string }) => i.action)).toEqual(['site.created']);
    const page = await client.get('/api/audit-log?limit=1&offset=1');
    expect(page.body.items).toHaveLength(1);
    expect(page.body.total).toBeGreaterThanOrEqual(3);
  });

  it('answers 400 for a limit out of range', async () => {
    const client = await ApiClient.signedIn(t.app, org.users.officer.email, testPassword);
    const res = await client.get('/api/audit-log?limit=0');
    expect(res.status).toBe(400);
    expect(res.body.error.details[0]).toEqual(expect.objectContaining({ location: 'query', path: 'limit' }));
  });

  it('answers 403 to a manager', async () => {
    const client = await ApiClient.signedIn(t.app, org.users.manager.email, testPassword);
    expect((await client.get('/api/audit-log')).status).toBe(403);
  });
});

describe('the audit_log table', () => {
  it('refuses UPDATE and DELETE from the API role (no privilege)', async () => {
    const scope = { tenantId: org.id, userId: org.users.admin.id };
    await expect(withScope(t.db, scope, (trx) => trx('audit_log').where({ tenant_id: org.id }).update({ action: 'x' }))).rejects.toThrow(
      /permission denied/,
    );
    await expect(withScope(t.db, scope, (trx) => trx('audit_log').where({ tenant_id: org.id }).delete())).rejects.toThrow(/permission denied/);
  });

  it('refuses UPDATE, DELETE and TRUNCATE even from the owner (trigger)', async () => {
    await expect(asOwnerInTenant(owner, org.id, (trx) => trx('audit_log').where({ tenant_id: org.id }).update({ action: 'x' }))).rejects.toThrow(
      /append-only/,
    );
    await expect(asOwnerInTenant(owner, org.id, (trx) => trx('audit_log').where({ tenant_id: org.id }).delete())).rejects.toThrow(/append-only/);
    // TRUNCATE queues for an exclusive lock before its trigger fires, and while it waits every other
    // suite's audit insert queues behind it: wait briefly, retrying, instead of stalling the run.
    const truncateOnce = () =>
      owner.transaction(async (trx) => {
        await trx.raw("set local lock_timeout = '500ms'");
        await trx.raw('truncate audit_log');
      });
    let refusal: unknown;
    for (let attempt = 0; attempt < 40; attempt++) {
      refusal = await truncateOnce().then(() => null, (error: unknown) => error);
      if (!/lock timeout/.test(String(refusal))) break;
      await new Promise((resolve) => setTimeout(resolve, 250));
    }
    expect(String(refusal)).toMatch(/append-only/);
  });
});
