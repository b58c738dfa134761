import request from 'supertest';
import type { Knex } from 'knex';
import { ApiClient } from '../../test-support/api-client';
import { addMembership, createOrganisation, createUser, testPassword, type TestOrganisation } from '../../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../../test-support/test-app';

let t: TestApp;
let owner: Knex;
let north: TestOrganisation;
let south: TestOrganisation;

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  north = await createOrganisation(owner, { name: 'Aardvark Boilers' });
  south = await createOrganisation(owner, { name: 'Zephyr Kilns' });
  // The north officer is also an auditor in the south organisation.
  await addMembership(owner, south.id, north.users.officer.id, 'auditor');
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('GET /api/auth/csrf', () => {
  it('responds 204 and sets a readable XSRF-TOKEN cookie', async () => {
    const res = await request(t.app).get('/api/auth/csrf');
    expect(res.status).toBe(204);
    const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
    const xsrf = cookies.find((c) => c.startsWith('XSRF-TOKEN='));
    expect(xsrf).toBeDefined();
    expect(xsrf).not.toMatch(/HttpOnly/i);
    expect(cookies.find((c) => c.startsWith('fl.sid='))).toMatch(/HttpOnly/i);
    expect(cookies.find((c) => c.startsWith('fl.sid='))).toMatch(/SameSite=Lax/i);
  });
});

describe('POST /api/auth/login', () => {
  it('signs in and answers Me for the first organisation by name', async () => {
    const client = new ApiClient(t.app);
    const res = await client.signIn(north.users.officer.email, testPassword);
    expect(res.status).toBe(200);
    expect(res.body).toEqual({
      user: { id: north.users.officer.id, email: north.users.officer.email, name: north.users.officer.name },
      organisation: { id: north.id, name: north.name, slug: north.slug },
      role: 'officer',
      permissions: expect.arrayContaining(['site:write', 'data:import', 'audit:read']),
      organisations: [
        { id: north.id, name: north.name, slug: north.slug, role: 'officer' },
        { id: south.id, name: south.name, slug: south.slug, role: 'auditor' },
      ],
    });
    expect(res.body.permissions).not.toContain('members:manage');
  });

  it('accepts the e-mail in any letter case', async () => {
    const client = new ApiClient(t.app);
    const res = await client.signIn(north.users.manager.email.toUpperCase(), testPassword);
    expect(res.status).toBe(200);
    expect(res.body.role).toBe('manager');
  });

  it('gives a new session id at sign-in and forgets the old one', async () => {
    const client = new ApiClient(t.app);
    await client.fetchCsrf();
    const before = client.sessionId;
    expect(before).toBeDefined();
    await client.signIn(north.users.admin.email, testPassword);
    expect(client.sessionId).toBeDefined();
    expect(client.sessionId).not.toBe(before);
    const replay = await request(t.app).get('/api/me').set('Cookie', `fl.sid=${encodeURIComponent(before!)}`);
    expect(replay.status).toBe(401);
  });

  it('refuses a wrong password with 401 invalid_credentials', async () => {
    const client = new ApiClient(t.app);
    const res = await client.signIn(north.users.admin.email, 'not-the-password');
    expect(res.status).toBe(401);
    expect(res.body).toEqual({ error: { code: 'invalid_credentials', message: 'E-mail or password is wrong.' } });
    expect((await client.get('/api/me')).status).toBe(401);
  });

  it('refuses an unknown e-mail with the same answer', async () => {
    const res = await new ApiClient(t.app).signIn('nobody-here@test.example', testPassword);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('invalid_credentials');
  });

  it('refuses a disabled account', async () => {
    const user = await createUser(owner, { disabled: true });
    await addMembership(owner, north.id, user.id, 'officer');
    const res = await new ApiClient(t.app).signIn(user.email, testPassword);
    expect(res.status).toBe(401);
  });

  it('answers 400 with details when fields are missing', async () => {
    const client = new ApiClient(t.app);
    await client.fetchCsrf();
    const res = await client.post('/api/auth/login', { email: north.users.admin.email });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation');
    expect(res.body.error.details).toEqual([expect.objectContaining({ location: 'body', path: 'password' })]);
  });

  it('answers 400 when the e-mail is not an e-mail or the password not a string', async () => {
    const client = new ApiClient(t.app);
    await client.fetchCsrf();
    const res = await client.post('/api/auth/login', { email: 'not-an-email', password: 42 });
    expect(res.status).toBe(400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path).sort();
    expect(paths).toEqual(['email', 'password']);
  });

  it('answers 403 csrf without the X-XSRF-TOKEN header', async () => {
    const client = new ApiClient(t.app);
    await client.fetchCsrf();
    const res = await client.post('/api/auth/login', { email: north.users.admin.email, password: testPassword }, { csrf: false });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf');
  });

  it('answers 403 csrf with a token of another session', async () => {
    const other = new ApiClient(t.app);
    await other.fetchCsrf();
    const client = new ApiClient(t.app);
    await client.fetchCsrf();
    const res = await client.agent
      .post('/api/auth/login')
      .set('X-XSRF-TOKEN', other.csrfToken!)
      .send({ email: north.users.admin.email, password: testPassword });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf');
  });
});

describe('login rate limiting', () => {
  let limited: TestApp;
  beforeAll(() => {
    limited = createTestApp({ env: { LOGIN_RATE_LIMIT_MAX: '3' } });
  });
  afterAll(() => limited.close());

  it('answers 429 rate_limited after too many failed attempts for one address', async () => {
    const client = new ApiClient(limited.app);
    const email = north.users.auditor.email;
    for (let attempt = 0; attempt < 3; attempt += 1) {
      expect((await client.signIn(email, 'wrong')).status).toBe(401);
    }
    const blocked = await client.signIn(email, testPassword);
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe('rate_limited');
    // Another account from the same address is not blocked.
    expect((await client.signIn(north.users.manager.email, testPassword)).status).toBe(200);
  });

  it('does not count successful sign-ins', async () => {
    const email = south.users.manager.email;
    for (let attempt = 0; attempt < 4; attempt += 1) {
      expect((await new ApiClient(limited.app).signIn(email, testPassword)).status).toBe(200);
    }
  });
});

describe('demo accounts', () => {
  it('may sign in outside production', async () => {
    const demo = await createUser(owner, { isDemo: true });
    await addMembership(owner, north.id, demo.id, 'manager');
    expect((await new ApiClient(t.app).signIn(demo.email, testPassword)).status).toBe(200);
  });

  describe('when NODE_ENV=production', () => {
    let prod: TestApp;
    beforeAll(() => {
      prod = createTestApp({ env: { NODE_ENV: 'production', SESSION_SECRET: 'x'.repeat(40), TRUST_PROXY: '1', HTTPS: 'true' } });
    });
    afterAll(() => prod.close());

    // Secure cookies: the client is behind a TLS-terminating proxy, so cookies are passed by hand.
    async function signInBehindProxy(email: string) {
      const csrf = await request(prod.app).get('/api/auth/csrf').set('X-Forwarded-Proto', 'https');
      const cookies = ([] as string[]).concat(csrf.headers['set-cookie'] ?? []);
      expect(cookies.every((c) => /;\s*Secure/i.test(c))).toBe(true);
      const token = decodeURIComponent(cookies.find((c) => c.startsWith('XSRF-TOKEN='))!.split(';')[0].split('=')[1]);
      return request(prod.app)
        .post('/api/auth/login')
        .set('X-Forwarded-Proto', 'https')
        .set('Cookie', cookies.map((c) => c.split(';')[0]).join('; '))
        .set('X-XSRF-TOKEN', token)
        .send({ email, password: testPassword });
    }

    it('refuses a demo account with 403', async () => {
      const demo = await createUser(owner, { isDemo: true });
      await addMembership(owner, north.id, demo.id, 'manager');
      const res = await signInBehindProxy(demo.email);
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('demo_account_refused');
    });

    it('still signs in a real account', async () => {
      const res = await signInBehindProxy(north.users.manager.email);
      expect(res.status).toBe(200);
    });
  });
});

describe('GET /api/auth/session', () => {
  it('answers 200 with me: null when nobody is signed in', async () => {
    const res = await request(t.app).get('/api/auth/session');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ me: null });
  });

  it('answers the signed-in user, and null again after sign-out', async () => {
    const client = await ApiClient.signedIn(t.app, north.users.manager.email, testPassword);
    const signedIn = await client.get('/api/auth/session');
    expect(signedIn.status).toBe(200);
    expect(signedIn.body.me.user.email).toBe(north.users.manager.email);
    expect(signedIn.body.me.role).toBe('manager');
    expect((await client.send('post', '/api/auth/logout')).status).toBe(204);
    const after = await client.get('/api/auth/session');
    expect(after.body).toEqual({ me: null });
  });
});

describe('GET /api/me', () => {
  it('responds 401 unauthenticated without a session', async () => {
    const res = await request(t.app).get('/api/me');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  it('returns the signed-in user with role and permissions', async () => {
    const client = await ApiClient.signedIn(t.app, north.users.auditor.email, testPassword);
    const res = await client.get('/api/me');
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(north.users.auditor.email);
    expect(res.body.role).toBe('auditor');
    expect(res.body.permissions.every((p: string) => p.endsWith(':read'))).toBe(true);
  });
});

describe('PUT /api/me/active-organisation', () => {
  it('switches to another organisation of the user, with that role', async () => {
    const client = await ApiClient.signedIn(t.app, north.users.officer.email, testPassword);
    const res = await client.put('/api/me/active-organisation', { organisationId: south.id });
    expect(res.status).toBe(200);
    expect(res.body.organisation.id).toBe(south.id);
    expect(res.body.role).toBe('auditor');
    expect(res.body.permissions).not.toContain('site:write');
    const me = await client.get('/api/me');
    expect(me.body.organisation.id).toBe(south.id);
    // and the tenant routes follow: the auditor of south reads south's members
    const members = await client.get('/api/members');
    expect(members.status).toBe(200);
    expect(members.body.items.map((m: { userId: string }) => m.userId)).toContain(south.users.admin.id);
  });

  it('responds 404 for an organisation the user does not belong to', async () => {
    const client = await ApiClient.signedIn(t.app, north.users.admin.email, testPassword);
    const res = await client.put('/api/me/active-organisation', { organisationId: south.id });
    expect(res.status).toBe(404);
    expect((await client.get('/api/me')).body.organisation.id).toBe(north.id);
  });

  it('responds 400 for an id that is not a uuid', async () => {
    const client = await ApiClient.signedIn(t.app, north.users.admin.email, testPassword);
    expect((await client.put('/api/me/active-organisation', { organisationId: 'northmoor' })).status).toBe(400);
  });

  it('responds 403 csrf without the header', async () => {
    const client = await ApiClient.signedIn(t.app, north.users.officer.email, testPassword);
    const res = await client.put('/api/me/active-organisation', { organisationId: south.id }, { csrf: false });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf');
  });
});

describe('POST /api/auth/logout', () => {
  it('ends the session: 204, then /api/me is 401 and the session row is gone', async () => {
    const client = await ApiClient.signedIn(t.app, north.users.manager.email, testPassword);
    // The cookie holds `s:<sid>.<signature>`.
    const sid = client.sessionId!.replace(/^s:/, '').split('.')[0];
    expect(await owner('session').where({ sid })).toHaveLength(1);
    const res = await client.post('/api/auth/logout');
    expect(res.status).toBe(204);
    expect((await client.get('/api/me')).status).toBe(401);
    expect(await owner('session').where({ sid })).toHaveLength(0);
  });
});

describe('rolling session expiry', () => {
  const storedExpiry = async (sid: string) => (await owner('session').where({ sid }).first('expire')).expire.getTime() as number;

  it('moves the stored expiry only when it lags the cookie by more than the slack', async () => {
    const client = await ApiClient.signedIn(t.app, north.users.officer.email, north.users.officer.password);
    // The cookie holds the signed id: s:<id>.<signature>.
    const sid = client.sessionId!.replace(/^s:/, '').split('.')[0]!;
    const first = await storedExpiry(sid);
    // One minute behind the cookie (within the slack): a request leaves it where it is.
    await owner('session').where({ sid }).update({ expire: new Date(first - 60_000) });
    expect((await client.get('/api/me')).status).toBe(200);
    expect(await storedExpiry(sid)).toBe(first - 60_000);

    // Ten minutes older than it was: the next request moves it to a full session's length again.
    await owner('session').where({ sid }).update({ expire: new Date(first - 10 * 60_000) });
    const before = Date.now();
    expect((await client.get('/api/me')).status).toBe(200);
    const moved = await storedExpiry(sid);
    expect(moved).toBeGreaterThanOrEqual(before + t.env.SESSION_MAX_AGE_HOURS * 3_600_000 - 1000);
  });
});
