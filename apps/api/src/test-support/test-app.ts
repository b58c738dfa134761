import type { Express } from 'express';
import knex, { type Knex } from 'knex';
import { createApp } from '../app';
import { parseEnv, type Env } from '../config/env';
import { createDb } from '../lib/db';
import { createSessionStore, type SessionStore } from '../lib/session';
import type { AnyRoute } from '../routing/route';

function requireEnv(name: 'DATABASE_URL' | 'DATABASE_OWNER_URL'): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: start the test database and export its URLs (bash infra/pg.sh url)`);
  return value;
}

/** The test environment: process.env with test defaults, plus overrides. */
export function testEnv(overrides: Record<string, string | undefined> = {}): Env {
  return parseEnv({
    ...process.env,
    NODE_ENV: 'test',
    DATABASE_URL: requireEnv('DATABASE_URL'),
    SESSION_PRUNE_INTERVAL_SECONDS: '0',
    // No built web app in API tests unless a test points at one.
    WEB_DIST_DIR: '.data/no-web-dist',
    ...overrides,
  });
}

/** A pool connected as the schema owner, for fixtures (not for code under test). */
export function createOwnerDb(): Knex {
  return knex({ client: 'pg', connection: requireEnv('DATABASE_OWNER_URL'), pool: { min: 0, max: 2 } });
}

export interface TestApp {
  app: Express;
  env: Env;
  /** The app role's pool, the one the app uses. */
  db: Knex;
  sessionStore: SessionStore;
  close(): Promise<void>;
}

/** An app wired as server.ts wires it, on the test database. Call close() in afterAll. */
export function createTestApp(options: { env?: Record<string, string | undefined>; routes?: readonly AnyRoute[] } = {}): TestApp {
  const env = testEnv(options.env);
  const db = createDb(env);
  const sessionStore = createSessionStore(env);
  const app = createApp({ env, db, sessionStore, routes: options.routes });
  return {
    app,
    env,
    db,
    sessionStore,
    close: async () => {
      await Promise.allSettled([db.destroy(), Promise.resolve(sessionStore.close())]);
    },
  };
}
