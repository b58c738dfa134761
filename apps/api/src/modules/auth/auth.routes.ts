import type { Request } from 'express';
import { audit } from '../../lib/audit';
import { clearCsrfCookie, issueCsrfToken } from '../../lib/csrf';
import { withScope } from '../../lib/db';
import { AppError, Forbidden, Unauthorized } from '../../lib/errors';
import { sessionCookieName } from '../../lib/session';
import { defineRoute } from '../../routing/route';
import { ActiveOrganisationBody, LoginBody, MeDto, SessionDto } from './auth.schemas';
import { assertMember, buildMe } from './auth.service';

function regenerate(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.regenerate((error) => (error ? reject(error) : resolve())));
}

function destroy(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.destroy((error) => (error ? reject(error) : resolve())));
}

export const authRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/auth/csrf',
    permission: 'public',
    summary: 'Issue the XSRF-TOKEN cookie for this session',
    response: 'none',
    handler: ({ req, res, services }) => {
      issueCsrfToken(req, res, services.env);
    },
  }),

  defineRoute({
    method: 'post',
    path: '/api/auth/login',
    permission: 'public',
    sessionOnly: true,
    rateLimit: 'login',
    summary: 'Sign in with e-mail and password',
    body: LoginBody,
    response: MeDto,
    handler: async ({ req, res, services, ctx }) => {
      const user = await services.signIn(req, res);
      if (!user) throw new Unauthorized('invalid_credentials', 'E-mail or password is wrong.');
      if (user.isDemo && services.env.NODE_ENV === 'production') {
        throw new Forbidden('demo_account_refused', 'Demo accounts cannot sign in on a production server.');
      }
      const me = await withScope(services.db, { tenantId: null, userId: user.id }, (trx) => buildMe(trx, user.id, null));
      // A fresh session id at sign-in, so an id planted before sign-in is worthless (session fixation).
      await regenerate(req);
      req.session.userId = user.id;
      req.session.organisationId = me.organisation.id;
      issueCsrfToken(req, res, services.env);
      await withScope(services.db, { tenantId: me.organisation.id, userId: user.id }, (trx) =>
        audit(
          { tenantId: me.organisation.id, userId: user.id, requestId: ctx.requestId, db: trx },
          { action: 'session.signed_in', entity: 'user', entityId: user.id },
        ),
      );
      return me;
    },
  }),

  defineRoute({
    method: 'post',
    path: '/api/auth/logout',
    permission: 'public',
    sessionOnly: true,
    summary: 'Sign out (ends the session)',
    response: 'none',
    handler: async ({ req, res, services }) => {
      if (req.session) await destroy(req);
      res.clearCookie(sessionCookieName, { path: '/', httpOnly: true, sameSite: 'lax', secure: services.env.NODE_ENV === 'production' });
      clearCsrfCookie(res, services.env);
    },
  }),

  defineRoute({
    method: 'get',
    path: '/api/auth/session',
    permission: 'public',
    summary: 'Who is signed in, or null — answers 200 either way, so a signed-out start-up is not an error',
    response: SessionDto,
    handler: async ({ req, services }) => {
      const userId = req.session?.userId;
      if (!userId) return { me: null };
      try {
        const me = await withScope(services.db, { tenantId: null, userId }, (trx) => buildMe(trx, userId, req.session.organisationId ?? null));
        if (req.session.organisationId !== me.organisation.id) req.session.organisationId = me.organisation.id;
        return { me };
      } catch (error) {
        // A session whose user lost every membership (or was disabled) counts as signed out.
        if (error instanceof AppError && error.status < 500) return { me: null };
        throw error;
      }
    },
  }),

  defineRoute({
    method: 'get',
    path: '/api/me',
    permission: 'authenticated',
    summary: 'The signed-in user, active organisation, role and permissions',
    response: MeDto,
    handler: async ({ ctx, req }) => {
      const me = await buildMe(ctx.db, ctx.userId, ctx.organisationId);
      // The active organisation may have gone (membership removed): remember the fallback.
      if (req.session.organisationId !== me.organisation.id) req.session.organisationId = me.organisation.id;
      return me;
    },
  }),

  defineRoute({
    method: 'put',
    path: '/api/me/active-organisation',
    permission: 'authenticated',
    sessionOnly: true,
    summary: 'Switch the active organisation',
    body: ActiveOrganisationBody,
    response: MeDto,
    handler: async ({ ctx, body, req }) => {
      await assertMember(ctx.db, ctx.userId, body.organisationId);
      req.session.organisationId = body.organisationId;
      return buildMe(ctx.db, ctx.userId, body.organisationId);
    },
  }),
];
