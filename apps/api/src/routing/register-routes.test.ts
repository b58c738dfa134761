import { z } from 'zod';
import { actions } from '../auth/permissions';
import { apiRoutes, listRoutes } from '../routes';
import type { AppServices } from '../services';
import { assertRouteTable, registerRoutes } from './register-routes';
import { defineRoute, type AnyRoute } from './route';

const services = { rateLimiters: { login: (_req: unknown, _res: unknown, next: () => void) => next() } } as unknown as AppServices;

const okRoute = defineRoute({
  method: 'get',
  path: '/api/things',
  permission: 'site:read',
  summary: 'things',
  response: z.object({}),
  handler: () => ({}),
});

describe('the registered API routes', () => {
  const routes = listRoutes();

  it('lists every route of the table', () => {
    expect(routes).toHaveLength(apiRoutes.length);
    expect(routes).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ method: 'GET', path: '/api/health', permission: 'public' }),
        expect.objectContaining({ method: 'POST', path: '/api/auth/login', permission: 'public' }),
        expect.objectContaining({ method: 'GET', path: '/api/me', permission: 'authenticated' }),
        expect.objectContaining({ method: 'GET', path: '/api/members', permission: 'members:read' }),
        expect.objectContaining({ method: 'GET', path: '/api/audit-log', permission: 'audit:read' }),
      ]),
    );
  });

  it.each(listRoutes().map((r) => [`${r.method} ${r.path}`, r] as const))('%s declares a known permission', (_name, route) => {
    expect(['public', 'authenticated', ...actions]).toContain(route.permission);
  });

  it('keeps public routes to the known few', () => {
    const publicRoutes = routes.filter((r) => r.permission === 'public').map((r) => `${r.method} ${r.path}`);
    expect(publicRoutes.sort()).toEqual(['GET /api/auth/csrf', 'GET /api/auth/session', 'GET /api/health', 'POST /api/auth/login', 'POST /api/auth/logout']);
  });

  it('lets only sign-in, sign-out and the switcher mutate without a tenant permission', () => {
    const sessionOnly = routes.filter((r) => r.sessionOnly).map((r) => `${r.method} ${r.path}`);
    expect(sessionOnly.sort()).toEqual(['POST /api/auth/login', 'POST /api/auth/logout', 'PUT /api/me/active-organisation']);
  });

  it('passes the startup checks', () => {
    expect(() => assertRouteTable(apiRoutes)).not.toThrow();
  });
});

describe('registerRoutes', () => {
  it('builds a router from a valid table', () => {
    expect(typeof registerRoutes([okRoute], services)).toBe('function');
  });

  it('throws when a route declares no permission', () => {
    const { permission: _omitted, ...withoutPermission } = okRoute;
    expect(() => registerRoutes([withoutPermission as AnyRoute], services)).toThrow(/declares no permission/);
  });

  it('throws when a route names an unknown permission', () => {
    expect(() => registerRoutes([{ ...okRoute, permission: 'sites:everything' }], services)).toThrow(/unknown permission/);
  });

  it('throws when a mutating route names an action the auditor holds', () => {
    expect(() => registerRoutes([{ ...okRoute, method: 'post' }], services)).toThrow(/read-only auditor/);
  });

  it('throws when a mutating route is public or merely authenticated without being session-only', () => {
    expect(() => registerRoutes([{ ...okRoute, method: 'delete', permission: 'public' }], services)).toThrow(/sessionOnly/);
    expect(() => registerRoutes([{ ...okRoute, method: 'put', permission: 'authenticated' }], services)).toThrow(/sessionOnly/);
  });

  it('throws when a route declares no response', () => {
    const { response: _omitted, ...withoutResponse } = okRoute;
    expect(() => registerRoutes([withoutResponse as AnyRoute], services)).toThrow(/response/);
  });

  it('throws on a route declared twice and on a path outside /api/', () => {
    expect(() => registerRoutes([okRoute, okRoute], services)).toThrow(/twice/);
    expect(() => registerRoutes([{ ...okRoute, path: '/things' }], services)).toThrow(/\/api\//);
  });
});
