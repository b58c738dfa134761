import knex, { type Knex } from 'knex';
import type { Env } from '../config/env';

/** Table names, so a rename is one edit. */
export const tables = {
  organisations: 'organisations',
  users: 'users',
  memberships: 'memberships',
  auditLog: 'audit_log',
  session: 'session',
  rateLimit: 'rate_limit',
} as const;

/** The API's connection pool, as the unprivileged app role (DATABASE_URL). */
export function createDb(env: Pick<Env, 'DATABASE_URL' | 'DATABASE_POOL_MAX' | 'LOG_LEVEL'>): Knex {
  const quiet = () => undefined;
  return knex({
    client: 'pg',
    connection: env.DATABASE_URL,
    pool: { min: 0, max: env.DATABASE_POOL_MAX },
    acquireConnectionTimeout: 10_000,
    // knex prints pool problems with console.log; keep tests and LOG_LEVEL=silent quiet.
    ...(env.LOG_LEVEL === 'silent' ? { log: { warn: quiet, error: quiet, deprecate: quiet, debug: quiet } } : {}),
  });
}

export interface DbScope {
  /** Active organisation; null outside any tenant (sign-in). */
  tenantId: string | null;
  /** Signed-in user; null for anonymous work. */
  userId: string | null;
}

/**
 * Runs `work` in a transaction whose row-level security scope is `scope`. The settings are
 * transaction-local (third argument true), so a pooled connection never carries them over.
 */
export async function withScope<T>(db: Knex, scope: DbScope, work: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  return db.transaction(async (trx) => {
    await trx.raw("select set_config('app.tenant_id', ?, true), set_config('app.user_id', ?, true)", [
      scope.tenantId ?? '',
      scope.userId ?? '',
    ]);
    return work(trx);
  });
}
