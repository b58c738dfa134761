import { Router, type Request, type Response } from 'express';
import type { z } from 'zod';
import { can, isAction, isRole, permissionsFor, type Role } from '../auth/permissions';
import { withScope } from '../lib/db';
import { csrfProtection, isMutating } from '../lib/csrf';
import { Forbidden, Unauthorized, ValidationError } from '../lib/errors';
import type { AppServices } from '../services';
import type { AnyRoute, Method } from './route';

const methods: readonly Method[] = ['get', 'post', 'put', 'patch', 'delete'];

export interface RouteSummary {
  method: Uppercase<Method>;
  path: string;
  permission: string;
  summary: string;
  sessionOnly: boolean;
}

/** Every route of a table with its method, path and permission (for tests, docs and sweeps). */
export function describeRoutes(routes: readonly AnyRoute[]): RouteSummary[] {
  return routes.map((route) => ({
    method: route.method.toUpperCase() as Uppercase<Method>,
    path: route.path,
    permission: route.permission,
    summary: route.summary,
    sessionOnly: route.sessionOnly === true,
  }));
}

/**
 * Checks a route table and throws on the first problem, so a server with an unguarded route
 * never starts. Fails closed: a route must name who may call it.
 */
export function assertRouteTable(routes: readonly AnyRoute[]): void {
  const seen = new Set<string>();
  for (const route of routes) {
    const name = `${String(route?.method).toUpperCase()} ${route?.path}`;
    if (!route || !methods.includes(route.method)) throw new Error(`Route ${name}: unknown method`);
    if (typeof route.path !== 'string' || !route.path.startsWith('/api/')) throw new Error(`Route ${name}: path must start with /api/`);
    if (seen.has(name)) throw new Error(`Route ${name}: declared twice`);
    seen.add(name);
    const permission: unknown = route.permission;
    if (permission === undefined || permission === null || permission === '') {
      throw new Error(`Route ${name} declares no permission (use an action of the permission map, 'authenticated' or 'public')`);
    }
    if (permission !== 'public' && permission !== 'authenticated' && !isAction(permission)) {
      throw new Error(`Route ${name}: unknown permission '${String(permission)}'`);
    }
    if (route.response === undefined) throw new Error(`Route ${name}: declare a response schema, 'none' or 'raw'`);
    if (typeof route.handler !== 'function') throw new Error(`Route ${name}: no handler`);
    if (isMutating(route.method)) {
      if (isAction(permission) && can('auditor', permission)) {
        throw new Error(`Route ${name} changes data but its permission '${permission}' is held by the read-only auditor role`);
      }
      if (!isAction(permission) && route.sessionOnly !== true) {
        throw new Error(`Route ${name} changes data without a tenant permission; only sessionOnly routes may`);
      }
    }
  }
}

function parsePart<S extends z.ZodType>(location: 'body' | 'query' | 'params', schema: S | undefined, value: unknown): unknown {
  if (!schema) return value;
  const result = schema.safeParse(value ?? (location === 'body' ? undefined : {}));
  if (!result.success) throw ValidationError.fromZod(location, result.error);
  return result.data;
}

function parseInput(route: AnyRoute, req: Request) {
  return {
    params: parsePart('params', route.params, { ...req.params }),
    // Express 5's req.query is a getter: parse it into a new object.
    query: parsePart('query', route.query, { ...(req.query as object) }),
    body: parsePart('body', route.body, req.body),
  };
}

type Outcome = { kind: 'json'; status: number; body: unknown } | { kind: 'none'; status: number } | { kind: 'raw' };

function shape(route: AnyRoute, result: unknown, res: Response): Outcome {
  if (route.response === 'raw') {
    if (!res.headersSent) throw new Error(`Route ${route.method.toUpperCase()} ${route.path} is 'raw' but did not respond`);
    return { kind: 'raw' };
  }
  if (route.response === 'none') return { kind: 'none', status: route.status ?? 204 };
  // Parsing the result strips anything the schema does not name, so nothing extra leaks.
  return { kind: 'json', status: route.status ?? 200, body: (route.response as z.ZodType).parse(result) };
}

function send(res: Response, outcome: Outcome): void {
  if (outcome.kind === 'json') res.status(outcome.status).json(outcome.body);
  else if (outcome.kind === 'none') res.status(outcome.status).end();
}

function destroySession(req: Request): Promise<void> {
  return new Promise((resolve) => req.session.destroy(() => resolve()));
}

interface MembershipRow {
  disabled_at: Date | null;
  role: string | null;
}

function buildPipeline(route: AnyRoute, services: AppServices) {
  const { db } = services;
  return async (req: Request, res: Response): Promise<void> => {
    const requestId = String(req.id ?? '');

    if (route.permission === 'public') {
      const input = parseInput(route, req);
      const result = await route.handler({ ...input, ctx: { kind: 'public', requestId, db }, req, res, services });
      send(res, shape(route, result, res));
      return;
    }

    const userId = req.session?.userId;
    if (!userId) throw new Unauthorized();
    const tenantId = req.session.organisationId ?? null;

    const outcome = await withScope(db, { tenantId, userId }, async (trx) => {
      const row: MembershipRow | undefined = await trx('users as u')
        .leftJoin('memberships as m', function joinActive() {
          this.on('m.user_id', '=', 'u.id').andOn('m.tenant_id', '=', trx.raw('?', [tenantId]));
        })
        .where('u.id', userId)
        .first('u.disabled_at', 'm.role');
      if (!row || row.disabled_at) {
        await destroySession(req);
        throw new Unauthorized();
      }

      if (route.permission === 'authenticated') {
        const input = parseInput(route, req);
        const ctx = { kind: 'user' as const, requestId, userId, organisationId: tenantId, db: trx };
        return shape(route, await route.handler({ ...input, ctx, req, res, services }), res);
      }

      if (!tenantId || !isRole(row.role)) throw new Forbidden('not_a_member', 'You are not a member of the active organisation.');
      const role: Role = row.role;
      if (!can(role, route.permission)) throw new Forbidden();
      const input = parseInput(route, req);
      const ctx = { kind: 'tenant' as const, requestId, tenantId, userId, role, permissions: new Set(permissionsFor(role)), db: trx };
      return shape(route, await route.handler({ ...input, ctx, req, res, services }), res);
    });
    // Sent after the commit, so a client never sees success for work that was rolled back.
    send(res, outcome);
  };
}

/**
 * Builds the API router from route tables. Per route: CSRF check (mutating methods) → rate limit
 * (if named) → authentication → permission → validation of params, query and body → handler in
 * the request's transaction → response validated by its schema. Throws at startup on a bad table.
 */
export function registerRoutes(routes: readonly AnyRoute[], services: AppServices): Router {
  assertRouteTable(routes);
  const router = Router();
  for (const route of routes) {
    const chain = [];
    if (isMutating(route.method)) chain.push(csrfProtection);
    if (route.rateLimit) chain.push(services.rateLimiters[route.rateLimit]);
    chain.push(buildPipeline(route, services));
    router[route.method](route.path, ...chain);
  }
  return router;
}
