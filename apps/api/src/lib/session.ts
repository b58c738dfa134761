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

/**
 * How far the stored expiry of a session may lag its rolling cookie's before a request moves it.
 * Sessions roll (each request extends them), and express-session holds every response until the
 * store has "touched" the session: an UPDATE and a durable commit per request. With this slack the
 * stored expiry moves at most once in five minutes per session; the UPDATE of the other requests
 * matches no row, writes nothing and has nothing to flush. An idle session therefore ends up to
 * five minutes before its cookie would (of SESSION_MAX_AGE_HOURS, 12 h by default).
 */
export const SESSION_TOUCH_SLACK_SECONDS = 300;

type StoreCallback = (err?: unknown) => void;
interface PgStoreInternals {
  quotedTable(): string;
  query(sql: string, params: unknown[], fn: StoreCallback): void;
}

/** Sessions live in Postgres (table `session`, created by a migration), so any instance serves any request. */
export function createSessionStore(env: Pick<Env, 'DATABASE_URL' | 'SESSION_PRUNE_INTERVAL_SECONDS'>): SessionStore {
  const PgStore = connectPgSimple(session);
  class SlackTouchStore extends PgStore {
    override touch(sid: string, sess: session.SessionData, fn?: StoreCallback): void {
      const expires = sess?.cookie?.expires ? new Date(sess.cookie.expires).getTime() : Number.NaN;
      // No expiry to move to (a session without a cookie expiry): the store's own rule.
      if (!Number.isFinite(expires)) return super.touch(sid, sess, fn);
      const self = this as unknown as PgStoreInternals;
      self.query(
        `update ${self.quotedTable()} set expire = to_timestamp($1) where sid = $2 and expire < to_timestamp($1) - make_interval(secs => $3)`,
        [Math.ceil(expires / 1000), sid, SESSION_TOUCH_SLACK_SECONDS],
        (err) => fn?.(err),
      );
    }
  }
  return new SlackTouchStore({
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
