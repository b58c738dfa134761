import { z } from 'zod';
import { actions } from '../../auth/permissions';
import { RoleSchema, Uuid } from '../../lib/schemas';

export const LoginBody = z.object({
  email: z.string().trim().min(1).max(320).pipe(z.email()),
  password: z.string().min(1).max(1024),
});

export const ActiveOrganisationBody = z.object({ organisationId: Uuid });

const OrganisationRef = z.object({ id: z.string(), name: z.string(), slug: z.string() });

/** The signed-in user, the active organisation, the role and permissions there, and every membership. */
export const MeDto = z.object({
  user: z.object({ id: z.string(), email: z.string(), name: z.string() }),
  organisation: OrganisationRef,
  role: RoleSchema,
  permissions: z.array(z.enum(actions)),
  organisations: z.array(OrganisationRef.extend({ role: RoleSchema })),
});

export type Me = z.input<typeof MeDto>;

/** `GET /api/auth/session`: the same `Me`, or null when nobody is signed in. */
export const SessionDto = z.object({ me: MeDto.nullable() });
