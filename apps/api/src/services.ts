import type { RequestHandler } from 'express';
import type { Knex } from 'knex';
import type { LocalSignIn } from './auth/local-sign-in';
import type { Env } from './config/env';
import type { RateLimitName } from './routing/route';

/** What route handlers may use besides their context (built once per app by createApp). */
export interface AppServices {
  env: Env;
  /** The pool (app role). Handlers use ctx.db; this is for work outside the request's scope. */
  db: Knex;
  signIn: LocalSignIn;
  rateLimiters: Record<RateLimitName, RequestHandler>;
}
