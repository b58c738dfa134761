import type { Knex } from 'knex';
import { ApiClient } from '../../test-support/api-client';
import { addMembership, createOrganisation, createUser, testPassword, type TestOrganisation } from '../../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../../test-support/test-app';

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let other: TestOrganisation;

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  other = await createOrganisation(owner);
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('GET /api/members', () => {
  it('lists the members of the active organisation only', async () => {
    const admin = await ApiClient.signedIn(t.app, org.users.admin.email, testPassword);
    const res = await admin.get('/api/members');
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(4);
    const ids = res.body.items.map((m: { userId: string }) => m.userId);
    expect(ids).toEqual(expect.arrayContaining(Object.values(org.users).map((u) => u.id)));
    expect(ids).not.toContain(other.users.admin.id);
    expect(res.body.items[0]).toEqual({
      userId: expect.any(String),
      email: expect.any(String),
      name: expect.any(String),
      role: expect.stringMatching(/^(admin|officer|manager|auditor)$/),
      joinedAt: expect.stringMatching(/^\d{4}-\d{2}-\d{2}T/),
    });
  });

  it('answers 403 to a manager', async () => {
    const manager = await ApiClient.signedIn(t.app, org.users.manager.email, testPassword);
    const res = await manager.get('/api/members');
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('forbidden');
  });

  it('answers 401 without a session', async () => {
    expect((await new ApiClient(t.app).get('/api/members')).status).toBe(401);
  });
});

describe('PUT /api/members/:userId/role', () => {
  it("lets an admin change a member's role, and records it in the audit trail", async () => {
    const person = await createUser(owner);
    await addMembership(owner, org.id, person.id, 'manager');
    const admin = await ApiClient.signedIn(t.app, org.users.admin.email, testPassword);
    const res = await admin.put(`/api/members/${person.id}/role`, { role: 'officer' });
    expect(res.status).toBe(200);
    expect(res.body).toEqual(expect.objectContaining({ userId: person.id, role: 'officer' }));
    const trail = await admin.get('/api/audit-log?entity=member');
    expect(trail.body.items[0]).toEqual(
      expect.objectContaining({ action: 'member.role_changed', entityId: person.id, before: { role: 'manager' }, after: { role: 'officer' } }),
    );
    expect(trail.body.items[0].actor.id).toBe(org.users.admin.id);
  });

  it('refuses to demote the last admin with 409', async () => {
    const admin = await ApiClient.signedIn(t.app, org.users.admin.email, testPassword);
    const res = await admin.put(`/api/members/${org.users.admin.id}/role`, { role: 'officer' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('last_admin');
  });

  it('answers 404 for a member of another organisation', async () => {
    const admin = await ApiClient.signedIn(t.app, org.users.admin.email, testPassword);
    const res = await admin.put(`/api/members/${other.users.officer.id}/role`, { role: 'auditor' });
    expect(res.status).toBe(404);
  });

  it('answers 400 for an unknown role', async () => {
    const admin = await ApiClient.signedIn(t.app, org.users.admin.email, testPassword);
    const res = await admin.put(`/api/members/${org.users.manager.id}/role`, { role: 'owner' });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('role');
  });

  it('answers 403 to an officer', async () => {
    const officer = await ApiClient.signedIn(t.app, org.users.officer.email, testPassword);
    expect((await officer.put(`/api/members/${org.users.manager.id}/role`, { role: 'auditor' })).status).toBe(403);
  });
});

describe('DELETE /api/members/:userId', () => {
  it('removes a member, who then cannot use the organisation', async () => {
    const person = await createUser(owner);
    await addMembership(owner, org.id, person.id, 'officer');
    const theirClient = await ApiClient.signedIn(t.app, person.email, testPassword);
    const admin = await ApiClient.signedIn(t.app, org.users.admin.email, testPassword);
    expect((await admin.delete(`/api/members/${person.id}`)).status).toBe(204);
    expect((await admin.get('/api/members')).body.items.map((m: { userId: string }) => m.userId)).not.toContain(person.id);
    const res = await theirClient.get('/api/audit-log');
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('not_a_member');
  });

  it('refuses to remove the last admin with 409', async () => {
    const admin = await ApiClient.signedIn(t.app, org.users.admin.email, testPassword);
    expect((await admin.delete(`/api/members/${org.users.admin.id}`)).status).toBe(409);
  });
});
