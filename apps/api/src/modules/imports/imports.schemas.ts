import { z } from 'zod';

export const Id = z.uuid();
const DateOnly = z.iso.date();

export const intervalConventions = ['interval_end', 'interval_start'] as const;
export const IntervalConventionSchema = z.enum(intervalConventions);

export const importStates = ['parsed', 'mapped', 'committing', 'committed', 'rolled_back', 'failed'] as const;

export const StackParams = z.object({ stackId: Id });
export const ImportParams = z.object({ importId: Id });

export const ImportListQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

/** The text fields that may come with the uploaded file (multipart fields are strings). */
export const UploadFields = z
  .object({
    intervalConvention: IntervalConventionSchema.optional(),
    periodFrom: DateOnly.optional(),
    periodTo: DateOnly.optional(),
  })
  .refine((f) => !f.periodFrom || !f.periodTo || f.periodFrom <= f.periodTo, { message: 'periodTo must not be before periodFrom', path: ['periodTo'] });
export type UploadFields = z.infer<typeof UploadFields>;

export const MappingBody = z.object({
  columns: z.array(z.object({ index: z.number().int().min(0), channelId: Id.nullable() })).max(1000),
  timestampColumn: z.number().int().min(0),
  /** Optional status column (null = none; absent = keep the current one). */
  statusColumn: z.number().int().min(0).nullable().optional(),
  intervalConvention: IntervalConventionSchema,
  saveAsStackMap: z.boolean().default(false),
});
export type MappingBody = z.infer<typeof MappingBody>;

const Reason = z.string().trim().min(3, 'Say why, in a few words').max(2000);

export const CommitBody = z
  .object({ replaceConflicts: z.boolean().optional(), reason: Reason.optional() })
  .default({})
  .refine((b) => !b.replaceConflicts || !!b.reason, { message: 'A reason is required to replace stored values', path: ['reason'] });
export type CommitBody = z.infer<typeof CommitBody>;

export const RollbackBody = z.object({ reason: Reason });

const Span = z.object({ from: z.string(), to: z.string() }).nullable();

export const ProgressDto = z.object({
  phase: z.string().nullable(),
  done: z.number().nullable(),
  total: z.number().nullable(),
  updatedAt: z.string().nullable(),
});

const Counts = z.object({
  rows: z.number(),
  cells: z.number(),
  problems: z.number(),
  inserted: z.number().nullable(),
  unchanged: z.number().nullable(),
  superseded: z.number().nullable(),
  conflicts: z.number().nullable(),
});

export const ImportColumnDto = z.object({
  index: z.number(),
  letter: z.string(),
  header: z.string(),
  unitHint: z.string().nullable(),
  parameterHint: z.string().nullable(),
  basisHint: z.string().nullable(),
  suggestedChannelId: z.string().nullable(),
  suggestionSource: z.string().nullable(),
  mappedChannelId: z.string().nullable(),
  sample: z.array(z.number().nullable()),
  numbers: z.number(),
  problems: z.number(),
});

export const ImportSummaryDto = z.object({
  id: z.string(),
  stackId: z.string(),
  fileName: z.string(),
  sha256: z.string(),
  sizeBytes: z.number(),
  format: z.string(),
  state: z.enum(importStates),
  uploadedAt: z.string(),
  uploadedBy: z.string(),
  uploadedByName: z.string().nullable(),
  rowCount: z.number(),
  span: Span,
  problemCount: z.number(),
  counts: Counts,
  committedAt: z.string().nullable(),
  rolledBackAt: z.string().nullable(),
  rollbackReason: z.string().nullable(),
});

export const ImportDraftDto = ImportSummaryDto.extend({
  sheetName: z.string().nullable(),
  headerRow: z.number().nullable(),
  timestampColumn: z.number(),
  timestampHeader: z.string(),
  statusColumn: z.number().nullable(),
  intervalConvention: IntervalConventionSchema,
  intervalSeconds: z.number().nullable(),
  period: z.object({ from: z.string().nullable(), to: z.string().nullable() }),
  columns: z.array(ImportColumnDto),
  notes: z.array(z.string()),
  problemCountsByCode: z.record(z.string(), z.number()),
  duplicates: z.number(),
  alreadyImported: z.object({ importId: z.string(), committedAt: z.string() }).nullable(),
  failureMessage: z.string().nullable(),
  progress: ProgressDto,
});
export type ImportDraftDto = z.input<typeof ImportDraftDto>;

export const ImportList = z.object({ items: z.array(ImportSummaryDto), total: z.number() });

export const ProblemDto = z.object({ row: z.number(), column: z.string(), columnIndex: z.number(), value: z.string(), code: z.string(), reason: z.string() });

export const PreviewDto = z.object({
  sampleRows: z.array(z.object({ row: z.number(), t: z.string(), status: z.string(), values: z.record(z.string(), z.number().nullable()) })),
  problems: z.array(ProblemDto),
  problemCount: z.number(),
  perChannel: z.array(
    z.object({
      channelId: z.string(),
      columnIndex: z.number(),
      count: z.number(),
      valid: z.number(),
      invalid: z.number(),
      min: z.number().nullable(),
      max: z.number().nullable(),
      mean: z.number().nullable(),
    }),
  ),
  span: Span,
  intervalSeconds: z.number().nullable(),
  gaps: z.array(z.object({ from: z.string(), to: z.string() })),
  duplicates: z.number(),
  overlap: z.object({ new: z.number(), unchanged: z.number(), conflicting: z.number() }),
  notes: z.array(z.string()),
});
export type PreviewDto = z.input<typeof PreviewDto>;

export const CommitResultDto = z.object({
  inserted: z.number(),
  unchanged: z.number(),
  superseded: z.number(),
  conflicts: z.number(),
  nothingNew: z.boolean(),
});
export type CommitResultDto = z.input<typeof CommitResultDto>;

export const RollbackResultDto = z.object({ withdrawn: z.number(), restored: z.number(), state: z.enum(importStates) });
