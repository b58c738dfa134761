import { z } from 'zod';
import { roles } from '../auth/permissions';

/** A timestamptz from the database, sent as an ISO 8601 string. */
export const IsoDateTime = z.date().transform((date) => date.toISOString());

export const Uuid = z.uuid();

export const RoleSchema = z.enum(roles);

/** limit/offset paging for list endpoints; query strings arrive as text. */
export const PageQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});
