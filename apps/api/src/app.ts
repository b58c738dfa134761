import { randomBytes, randomUUID } from 'node:crypto';
import express, { type Express } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import helmet from 'helmet';
import type { Knex } from 'knex';
import { pinoHttp } from 'pino-http';
import type session from 'express-session';
import { createLocalSignIn } from './auth/local-sign-in';
import type { Env } from './config/env';
import { refreshCsrfCookie } from './lib/csrf';
import { TooManyRequests } from './lib/errors';
import { PgRateLimitStore } from './lib/rate-limit-store';
import { sessionMiddleware } from './lib/session';
import { webAppRouter } from './lib/web-app';
import { errorHandler, notFoundHandler } from './middleware/error-handler';
import { apiRoutes } from './routes';
import { registerRoutes } from './routing/register-routes';
import type { AnyRoute } from './routing/route';
import type { AppServices } from './services';

export interface AppDeps {
  env: Env;
  /** Pool connected as the app role (DATABASE_URL). */
  db: Knex;
  sessionStore: session.Store;
  /** Defaults to every module's routes; tests may pass their own table. */
  routes?: readonly AnyRoute[];
}

const requestIdPattern = /^[A-Za-z0-9._-]{1,100}$/;

/** Builds the Express app (no listen): parsers, security headers, session, routes, 404, errors. */
export function createApp(deps: AppDeps): Express {
  const { env, db } = deps;
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', env.TRUST_PROXY);
  // Express 5's default "simple" query parser: flat key=value strings, no nested objects.
  app.set('query parser', 'simple');

  app.use(
    pinoHttp({
      level: env.LOG_LEVEL,
      genReqId: (req, res) => {
        const incoming = req.headers['x-request-id'];
        const id = typeof incoming === 'string' && requestIdPattern.test(incoming) ? incoming : randomUUID();
        res.setHeader('X-Request-Id', id);
        return id;
      },
      // Never log credentials.
      redact: ['req.headers.cookie', 'req.headers["x-xsrf-token"]', 'res.headers["set-cookie"]'],
    }),
  );

  app.use((_req, res, next) => {
    res.locals.cspNonce = randomBytes(16).toString('base64');
    next();
  });
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // Angular adds its component <style> elements with the nonce from ngCspNonce.
          styleSrc: ["'self'", (_req, res) => `'nonce-${(res as express.Response).locals.cspNonce}'`],
          fontSrc: ["'self'", 'data:'],
          imgSrc: ["'self'", 'data:'],
          connectSrc: ["'self'"],
          frameAncestors: ["'none'"],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          scriptSrcAttr: ["'none'"],
          ...(env.HTTPS ? { upgradeInsecureRequests: [] } : {}),
        },
      },
      strictTransportSecurity: env.HTTPS ? { maxAge: 31_536_000, includeSubDomains: true } : false,
    }),
  );

  const loginLimiter = rateLimit({
    windowMs: env.LOGIN_RATE_LIMIT_WINDOW_MINUTES * 60_000,
    limit: env.LOGIN_RATE_LIMIT_MAX,
    // Successful sign-ins are given back: the limit is on failed attempts per address and account.
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: new PgRateLimitStore(db, 'login'),
    keyGenerator: (req) => {
      const email = typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
      return `${ipKeyGenerator(req.ip ?? '')}|${email}`;
    },
    handler: (_req, _res, next) => next(new TooManyRequests()),
  });

  const services: AppServices = { env, db, signIn: createLocalSignIn(db), rateLimiters: { login: loginLimiter } };

  const api = express.Router();
  api.use(express.json({ limit: env.JSON_BODY_LIMIT }));
  api.use(sessionMiddleware(env, deps.sessionStore));
  api.use(refreshCsrfCookie(env));
  api.use(registerRoutes(deps.routes ?? apiRoutes, services));
  api.use(notFoundHandler);
  app.use('/api', (req, _res, next) => {
    // API answers are never cached: they depend on the session.
    _res.setHeader('Cache-Control', 'no-store');
    next();
  });
  // Routes declare full paths (/api/...), so the API router is mounted at the root.
  app.use((req, res, next) => (req.path === '/api' || req.path.startsWith('/api/') ? api(req, res, next) : next()));

  const web = webAppRouter(env.WEB_DIST_DIR);
  if (web) app.use(web);

  app.use(notFoundHandler);
  app.use(errorHandler);
  return app;
}
