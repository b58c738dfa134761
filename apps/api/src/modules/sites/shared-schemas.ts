/** zod shapes shared by the set-up modules. */
import { z } from 'zod';

export const Id = z.uuid();
/** A calendar date 'YYYY-MM-DD' (validated: 2024-02-30 is refused). */
export const DateOnly = z.iso.date();
/** The version an update is based on (optimistic concurrency). */
export const Version = z.number().int().min(1);
export const Name = z.string().trim().min(1, 'Required').max(200);

/** Optional `{ version }` body of the archive routes. */
export const ArchiveBody = z.object({ version: Version.optional() }).optional();

export const idParams = <const K extends string>(key: K) => z.object({ [key]: Id } as { [P in K]: typeof Id });

/** True when `to` is absent or not before `from`. */
export const datesInOrder = (from: string | null | undefined, to: string | null | undefined): boolean =>
  !from || !to || to >= from;

/** Response of a list endpoint: one page of items and the total count matching the filters. */
export const listOf = <T extends z.ZodType>(item: T) => z.object({ items: z.array(item), total: z.number().int() });
