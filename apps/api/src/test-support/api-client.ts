import type { Express } from 'express';
import request, { type Response } from 'supertest';
import { csrfCookieName } from '../lib/csrf';
import { sessionCookieName } from '../lib/session';

type Body = string | object | undefined;

function cookieValue(res: Response, name: string): string | undefined {
  const header = res.headers['set-cookie'] as unknown as string[] | string | undefined;
  const cookies = Array.isArray(header) ? header : header ? [header] : [];
  for (const cookie of cookies) {
    const [pair] = cookie.split(';');
    const at = pair.indexOf('=');
    if (pair.slice(0, at).trim() === name) return decodeURIComponent(pair.slice(at + 1));
  }
  return undefined;
}

/**
 * A browser-like client: keeps cookies (supertest agent) and, like Angular's HttpClient, sends
 * the XSRF-TOKEN cookie back as X-XSRF-TOKEN on mutating requests.
 */
export class ApiClient {
  readonly agent: ReturnType<typeof request.agent>;
  csrfToken: string | undefined;
  sessionId: string | undefined;

  constructor(readonly app: Express) {
    this.agent = request.agent(app);
  }

  /** A client signed in as the given user; throws unless sign-in answers 200. */
  static async signedIn(app: Express, email: string, password: string): Promise<ApiClient> {
    const client = new ApiClient(app);
    const res = await client.signIn(email, password);
    if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
    return client;
  }

  private remember(res: Response): Response {
    const token = cookieValue(res, csrfCookieName);
    if (token !== undefined) this.csrfToken = token || undefined;
    const sid = cookieValue(res, sessionCookieName);
    if (sid !== undefined) this.sessionId = sid || undefined;
    return res;
  }

  async fetchCsrf(): Promise<Response> {
    return this.remember(await this.agent.get('/api/auth/csrf'));
  }

  async signIn(email: string, password: string): Promise<Response> {
    if (!this.csrfToken) await this.fetchCsrf();
    return this.post('/api/auth/login', { email, password });
  }

  async get(path: string): Promise<Response> {
    return this.remember(await this.agent.get(path));
  }

  /** Any method; `csrf: false` leaves the header off. */
  async send(method: 'post' | 'put' | 'patch' | 'delete', path: string, body?: Body, options: { csrf?: boolean } = {}): Promise<Response> {
    let req = this.agent[method](path);
    if (options.csrf !== false && this.csrfToken) req = req.set('X-XSRF-TOKEN', this.csrfToken);
    if (body !== undefined) req = req.send(body);
    return this.remember(await req);
  }

  post(path: string, body?: Body, options?: { csrf?: boolean }): Promise<Response> {
    return this.send('post', path, body, options);
  }

  put(path: string, body?: Body, options?: { csrf?: boolean }): Promise<Response> {
    return this.send('put', path, body, options);
  }

  patch(path: string, body?: Body, options?: { csrf?: boolean }): Promise<Response> {
    return this.send('patch', path, body, options);
  }

  delete(path: string, options?: { csrf?: boolean }): Promise<Response> {
    return this.send('delete', path, undefined, options);
  }
}
