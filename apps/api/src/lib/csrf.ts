import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import type { Env } from '../config/env';
import { Forbidden } from './errors';

// Synchronizer-token CSRF protection shaped for Angular's built-in XSRF support: the token lives
// in the session (so in Postgres, shared by every instance), is mirrored into a readable cookie
// XSRF-TOKEN, and Angular's HttpClient sends it back as X-XSRF-TOKEN on mutating requests.

export const csrfCookieName = 'XSRF-TOKEN';
export const csrfHeaderName = 'x-xsrf-token';

const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS']);

export function isMutating(method: string): boolean {
  return !safeMethods.has(method.toUpperCase());
}

function setCsrfCookie(res: Response, token: string, env: Pick<Env, 'NODE_ENV'>): void {
  res.cookie(csrfCookieName, token, {
    httpOnly: false, // Angular must read it
    sameSite: 'lax',
    secure: env.NODE_ENV === 'production',
    path: '/',
  });
}

/** Returns the session's token, creating one (and the session) if needed, and sets the cookie. */
export function issueCsrfToken(req: Request, res: Response, env: Pick<Env, 'NODE_ENV'>): string {
  const token = req.session.csrfToken ?? randomBytes(32).toString('base64url');
  req.session.csrfToken = token;
  setCsrfCookie(res, token, env);
  return token;
}

/** Any API GET refreshes the cookie when the session already holds a token. */
export function refreshCsrfCookie(env: Pick<Env, 'NODE_ENV'>): RequestHandler {
  return (req, res, next) => {
    const token = req.session?.csrfToken;
    if (token && req.method === 'GET') setCsrfCookie(res, token, env);
    next();
  };
}

export function clearCsrfCookie(res: Response, env: Pick<Env, 'NODE_ENV'>): void {
  res.clearCookie(csrfCookieName, { path: '/', sameSite: 'lax', secure: env.NODE_ENV === 'production' });
}

function tokensMatch(expected: string, given: string): boolean {
  const a = Buffer.from(expected);
  const b = Buffer.from(given);
  return a.length === b.length && timingSafeEqual(a, b);
}

/** Rejects a mutating request whose X-XSRF-TOKEN header does not match the session's token. */
export const csrfProtection: RequestHandler = (req, _res, next) => {
  if (!isMutating(req.method)) return next();
  const expected = req.session?.csrfToken;
  const given = req.get(csrfHeaderName);
  if (!expected || !given || !tokensMatch(expected, given)) {
    return next(new Forbidden('csrf', 'The security token is missing or out of date. Reload the page and try again.'));
  }
  next();
};
