import type { Request, Response } from 'express';
import type { z } from 'zod';
import type { Action } from '../auth/permissions';
import type { AppServices } from '../services';
import type { PublicContext, TenantContext, UserContext } from './context';

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

/**
 * Who may call a route: `'public'` (anyone), `'authenticated'` (any signed-in user, no tenant
 * permission needed: /api/me and the switcher), or one action of the permission map, checked
 * against the caller's role in the active organisation.
 */
export type Access = 'public' | 'authenticated' | Action;

/**
 * How the pipeline answers: a zod schema (the handler's result is parsed through it, so unknown
 * keys are stripped, and sent as JSON), `'none'` (204, no body) or `'raw'` (the handler writes the
 * response itself, e.g. a file download; it still runs inside the request's transaction).
 */
export type ResponseSpec = z.ZodType | 'none' | 'raw';

export type ContextFor<A extends Access> = A extends 'public' ? PublicContext : A extends 'authenticated' ? UserContext : TenantContext;

export interface HandlerInput<A extends Access, PS extends z.ZodType, QS extends z.ZodType, BS extends z.ZodType> {
  params: z.output<PS>;
  query: z.output<QS>;
  body: z.output<BS>;
  ctx: ContextFor<A>;
  req: Request;
  res: Response;
  services: AppServices;
}

export type HandlerResult<RS extends ResponseSpec> = RS extends z.ZodType ? z.input<RS> : RS extends 'none' ? void : unknown;

/** Named rate limiters a route may ask for (built once per app from the shared Postgres store). */
export type RateLimitName = 'login';

export interface RouteDef<
  A extends Access = Access,
  PS extends z.ZodType = z.ZodType,
  QS extends z.ZodType = z.ZodType,
  BS extends z.ZodType = z.ZodType,
  RS extends ResponseSpec = ResponseSpec,
> {
  method: Method;
  /** Express path, always under /api/. */
  path: string;
  permission: A;
  /** One line for route listings. */
  summary: string;
  params?: PS;
  query?: QS;
  body?: BS;
  response: RS;
  /** Success status for JSON responses (default 200). */
  status?: number;
  rateLimit?: RateLimitName;
  /**
   * A non-GET route that only changes the caller's own session (sign-in, sign-out, switching the
   * active organisation). Only such routes may be mutating without a tenant action; every other
   * mutating route must name an action the auditor does not hold.
   */
  sessionOnly?: true;
  handler: (input: HandlerInput<A, PS, QS, BS>) => Promise<HandlerResult<RS>> | HandlerResult<RS>;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type AnyRoute = RouteDef<any, any, any, any, any>;

/** Declares one row of a module's route table, with the handler typed from its schemas. */
export function defineRoute<
  A extends Access,
  PS extends z.ZodType = z.ZodType,
  QS extends z.ZodType = z.ZodType,
  BS extends z.ZodType = z.ZodType,
  RS extends ResponseSpec = ResponseSpec,
>(route: RouteDef<A, PS, QS, BS, RS>): AnyRoute {
  return route as AnyRoute;
}
