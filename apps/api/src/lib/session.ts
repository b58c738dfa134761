import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import type { RequestHandler } from 'express';
import type { Env } from '../config/env';
import { tables } from './db';

declare module 'express-session' {
  interface SessionData {
    userId?: string;
    /** The active organisation (tenant) chosen at sign-in or with the switcher. */
    organisationId?: string;
    csrfToken?: string;
  }
}

export const sessionCookieName = 'fl.sid';

export type SessionStore = session.Store & { close(): Promise<void> | void };

/** Sessions live in Postgres (table `session`, created by a migration), so any instance serves any request. */
export function createSessionStore(env: Pick<Env, 'DATABASE_URL' | 'SESSION_PRUNE_INTERVAL_SECONDS'>): SessionStore {
  const PgStore = connectPgSimple(session);
  return new PgStore({
    conString: env.DATABASE_URL,
    tableName: tables.session,
    createTableIfMissing: false,
    pruneSessionInterval: env.SESSION_PRUNE_INTERVAL_SECONDS > 0 ? env.SESSION_PRUNE_INTERVAL_SECONDS : false,
  }) as SessionStore;
}

export function sessionMiddleware(env: Env, store: session.Store): RequestHandler {
  return session({
    name: sessionCookieName,
    secret: env.SESSION_SECRET,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    proxy: env.TRUST_PROXY !== false ? true : undefined,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: env.NODE_ENV === 'production',
      maxAge: env.SESSION_MAX_AGE_HOURS * 60 * 60 * 1000,
      path: '/',
    },
  });
}
