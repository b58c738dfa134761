import { createHash } from 'node:crypto';
import type { ClientRateLimitInfo, IncrementResponse, Options, Store } from 'express-rate-limit';
import type { Knex } from 'knex';
import { tables } from './db';

/**
 * express-rate-limit store in Postgres (table `rate_limit`), so every API instance counts the
 * same attempts. Fixed windows: the first hit of a window sets `reset_at`. Keys are hashed, so the
 * table holds no e-mail addresses or IPs.
 */
export class PgRateLimitStore implements Store {
  readonly localKeys = false;
  private windowMs = 60_000;

  constructor(
    private readonly db: Knex,
    readonly prefix: string,
  ) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  private key(key: string): string {
    return createHash('sha256').update(`${this.prefix}:${key}`).digest('base64url');
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const row = await this.db(tables.rateLimit).where({ key: this.key(key) }).where('reset_at', '>', this.db.fn.now()).first();
    return row ? { totalHits: row.hits, resetTime: row.reset_at } : undefined;
  }

  async increment(key: string): Promise<IncrementResponse> {
    const { rows } = await this.db.raw(
      `insert into rate_limit (key, hits, reset_at) values (?, 1, now() + ? * interval '1 millisecond')
       on conflict (key) do update set
         hits = case when rate_limit.reset_at <= now() then 1 else rate_limit.hits + 1 end,
         reset_at = case when rate_limit.reset_at <= now() then excluded.reset_at else rate_limit.reset_at end
       returning hits, reset_at`,
      [this.key(key), this.windowMs],
    );
    // Old windows are removed now and then by whoever happens to be counting; no timer needed.
    if (Math.random() < 0.01) await this.db(tables.rateLimit).where('reset_at', '<', this.db.raw("now() - interval '1 day'")).delete();
    return { totalHits: rows[0].hits, resetTime: rows[0].reset_at };
  }

  async decrement(key: string): Promise<void> {
    await this.db(tables.rateLimit)
      .where({ key: this.key(key) })
      .where('reset_at', '>', this.db.fn.now())
      .update({ hits: this.db.raw('greatest(hits - 1, 0)') });
  }

  async resetKey(key: string): Promise<void> {
    await this.db(tables.rateLimit).where({ key: this.key(key) }).delete();
  }
}
