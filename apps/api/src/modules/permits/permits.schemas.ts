import { z } from 'zod';
import { listQuery } from '../sites/list-query';
import { DateOnly, datesInOrder, Id, Version } from '../sites/shared-schemas';
import { LimitDto } from './limits.schemas';

const PermitFields = z.object({
  reference: z.string().trim().min(1, 'Required').max(200),
  authority: z.string().trim().min(1, 'Required').max(500),
  effectiveFrom: DateOnly,
  effectiveTo: DateOnly.nullish(),
});
const effectiveOrder = (v: { effectiveFrom?: string | undefined; effectiveTo?: string | null | undefined }) =>
  datesInOrder(v.effectiveFrom, v.effectiveTo);
const effectiveOrderIssue = { message: 'Must not be before the effective-from date', path: ['effectiveTo'] };

export const CreatePermitBody = PermitFields.refine(effectiveOrder, effectiveOrderIssue);
export type CreatePermitBody = z.infer<typeof CreatePermitBody>;
export const UpdatePermitBody = PermitFields.partial().extend({ version: Version }).refine(effectiveOrder, effectiveOrderIssue);
export type UpdatePermitBody = z.infer<typeof UpdatePermitBody>;

export const PermitListQuery = listQuery(
  { reference: 'reference', authority: 'authority', effectiveFrom: 'effective_from', createdAt: 'created_at' },
  'effectiveFrom',
);

/** The permit's PDF: at most 20 MB (20 × 1024 × 1024 bytes). */
export const MAX_PERMIT_DOCUMENT_BYTES = 20 * 1024 * 1024;

export const PermitDocumentDto = z.object({
  fileName: z.string(),
  sizeBytes: z.number().int(),
  sha256: z.string(),
  uploadedAt: z.string(),
});

export const PermitDto = z.object({
  id: Id,
  siteId: Id,
  reference: z.string(),
  authority: z.string(),
  effectiveFrom: z.string(),
  effectiveTo: z.string().nullable(),
  document: PermitDocumentDto.nullable(),
  archivedAt: z.string().nullable(),
  version: z.number().int(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type PermitDto = z.infer<typeof PermitDto>;

export const PermitDetailDto = PermitDto.extend({ limits: z.array(LimitDto) });
export type PermitDetailDto = z.infer<typeof PermitDetailDto>;
