import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { createApp } from './app';
import { createDb } from './lib/db';
import { withNonce } from './lib/web-app';
import { ApiClient } from './test-support/api-client';
import { createTestApp, testEnv, type TestApp } from './test-support/test-app';

let t: TestApp;

beforeAll(() => {
  t = createTestApp();
});

afterAll(() => t.close());

function expectJsonError(res: request.Response, status: number, code: string) {
  expect(res.status).toBe(status);
  expect(res.headers['content-type']).toMatch(/application\/json/);
  expect(res.body.error.code).toBe(code);
  expect(typeof res.body.error.message).toBe('string');
  expect(res.text).not.toMatch(/<html|at \S+ \(|node_modules/i);
}

describe('GET /api/health', () => {
  it('reports the API and the database as ok', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', database: 'ok' });
  });

  it('answers 503 when the database does not answer', async () => {
    const env = testEnv({ DATABASE_URL: 'postgres://flueledger_app:x@127.0.0.1:1/flueledger' });
    const db = createDb(env);
    try {
      const app = createApp({ env, db, sessionStore: t.sessionStore });
      expectJsonError(await request(app).get('/api/health'), 503, 'database_unavailable');
    } finally {
      await db.destroy();
    }
  });
});

describe('bad input', () => {
  let client: ApiClient;
  beforeAll(async () => {
    client = new ApiClient(t.app);
    await client.fetchCsrf();
  });

  it('answers malformed JSON with 400 invalid_json', async () => {
    const res = await client.agent
      .post('/api/auth/login')
      .set('Content-Type', 'application/json')
      .set('X-XSRF-TOKEN', client.csrfToken!)
      .send('{"email": "a@b.example", "password": ');
    expectJsonError(res, 400, 'invalid_json');
  });

  it('answers missing fields with 400 and the fields named', async () => {
    const res = await client.post('/api/auth/login', {});
    expectJsonError(res, 400, 'validation');
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['email', 'password']);
  });

  it('answers wrong types with 400', async () => {
    const res = await client.post('/api/auth/login', { email: ['a@b.example'], password: { $ne: '' } });
    expectJsonError(res, 400, 'validation');
  });

  it('answers a body that is not JSON with 400', async () => {
    const res = await client.agent.post('/api/auth/login').set('X-XSRF-TOKEN', client.csrfToken!).type('text/plain').send('email=a');
    expectJsonError(res, 400, 'validation');
  });

  it('answers an oversized body with 413', async () => {
    const res = await client.post('/api/auth/login', { email: 'a@b.example', password: 'x'.repeat(200 * 1024) });
    expectJsonError(res, 413, 'payload_too_large');
  });

  it('answers an unknown API route with 404 JSON', async () => {
    expectJsonError(await request(t.app).get('/api/no-such-thing'), 404, 'not_found');
    expectJsonError(await request(t.app).delete('/api/health'), 404, 'not_found');
    expectJsonError(await request(t.app).get('/api'), 404, 'not_found');
  });

  it('answers an unknown page with 404 JSON when no web app is built', async () => {
    expectJsonError(await request(t.app).get('/some/page'), 404, 'not_found');
  });
});

describe('security headers', () => {
  it('sends a strict Content-Security-Policy and a request id', async () => {
    const res = await request(t.app).get('/api/health');
    const csp = res.headers['content-security-policy'];
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
    expect(csp).not.toContain('unsafe-inline');
    expect(csp).not.toContain('unsafe-eval');
    expect(res.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/);
    expect(res.headers['x-powered-by']).toBeUndefined();
    expect(res.headers['cache-control']).toBe('no-store');
  });
});

describe('the built web app', () => {
  let dist: string;
  let web: TestApp;
  beforeAll(() => {
    dist = mkdtempSync(path.join(os.tmpdir(), 'fl-web-'));
    writeFileSync(path.join(dist, 'index.html'), '<!doctype html><html><head><link rel="stylesheet" href="styles.css"></head><body><app-root></app-root><script src="main.js" type="module"></script></body></html>');
    writeFileSync(path.join(dist, 'main.js'), 'console.log(1)');
    web = createTestApp({ env: { WEB_DIST_DIR: dist } });
  });
  afterAll(async () => {
    await web.close();
    rmSync(dist, { recursive: true, force: true });
  });

  it('serves index.html for client-side routes, with the CSP nonce on the root element', async () => {
    const res = await request(web.app).get('/sites/42');
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/html/);
    const nonce = /'nonce-([^']+)'/.exec(res.headers['content-security-policy'])?.[1];
    expect(nonce).toBeDefined();
    expect(res.text).toContain(`<app-root ngCspNonce="${nonce}">`);
  });

  it('serves static files, 404s a missing asset and keeps /api JSON', async () => {
    expect((await request(web.app).get('/main.js')).text).toBe('console.log(1)');
    expectJsonError(await request(web.app).get('/missing.js'), 404, 'not_found');
    expectJsonError(await request(web.app).get('/api/nothing'), 404, 'not_found');
  });
});

describe('withNonce', () => {
  it('replaces an existing ngCspNonce value', () => {
    expect(withNonce('<body><fl-root ngCspNonce="old"></fl-root></body>', 'n1')).toBe('<body><fl-root ngCspNonce="n1"></fl-root></body>');
  });
  it('leaves html without a custom element alone', () => {
    expect(withNonce('<body><div></div></body>', 'n1')).toBe('<body><div></div></body>');
  });
});
