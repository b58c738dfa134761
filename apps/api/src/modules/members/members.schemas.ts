import { z } from 'zod';
import { IsoDateTime, RoleSchema, Uuid } from '../../lib/schemas';

export const MemberParams = z.object({ userId: Uuid });

export const ChangeRoleBody = z.object({ role: RoleSchema });

export const MemberDto = z.object({
  userId: z.string(),
  email: z.string(),
  name: z.string(),
  role: RoleSchema,
  joinedAt: IsoDateTime,
});

export const MemberList = z.object({ items: z.array(MemberDto), total: z.number().int() });

export type Member = z.input<typeof MemberDto>;
