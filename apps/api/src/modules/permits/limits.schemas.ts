import { EXCLUDABLE_STATUSES, MinDataSchema } from '@flueledger/calc';
import { z } from 'zod';
import { listQuery } from '../sites/list-query';
import { DateOnly, Id, Version } from '../sites/shared-schemas';

/** Pollutants a limit may name: the channel parameters that are emissions (not O2, H2O, flow …). */
export const POLLUTANTS = ['NOx', 'NO', 'NO2', 'SO2', 'CO', 'dust', 'HCl', 'HF', 'TOC', 'NH3', 'Hg', 'CO2'] as const;
export type Pollutant = (typeof POLLUTANTS)[number];

export const LIMIT_UNITS = ['mg/Nm3', 'ppm', 'ug/Nm3', 'lb/MMBtu', 'ng/J', 'kg/h', 't/yr'] as const;
export type LimitUnit = (typeof LIMIT_UNITS)[number];
/** Limits on heat input or mass: no reference O2 applies to them. */
export const UNITS_WITHOUT_O2: readonly LimitUnit[] = ['lb/MMBtu', 'ng/J', 'kg/h', 't/yr'];

export const PERIODS = ['hour', 'half_hour', 'day', 'month', 'year', 'rolling_days', 'rolling_hours', 'block_hours'] as const;
export type Period = (typeof PERIODS)[number];
export const PERIODS_WITH_LENGTH: readonly Period[] = ['rolling_days', 'rolling_hours', 'block_hours'];

export const Criterion = z.discriminatedUnion('type', [
  z.object({ type: z.literal('every_period'), factor: z.number().positive().max(10).default(1) }),
  z.object({
    type: z.literal('share_of_periods'),
    factor: z.number().positive().max(10),
    share: z.number().gt(0, 'Must be above 0').max(1, 'A share between 0 and 1 (0.95 for 95 %)'),
  }),
]);
export type Criterion = z.output<typeof Criterion>;

const LimitFields = z.object({
  stackId: Id.nullish(),
  unitId: Id.nullish(),
  pollutant: z.enum(POLLUTANTS),
  elv: z.number().positive('The emission limit value must be above 0'),
  unit: z.enum(LIMIT_UNITS),
  /** % O2, dry. Omitted → the regime's default for the unit and fuel (GET /api/limit-defaults). */
  referenceO2Percent: z.number().min(0).lt(21).nullable(),
  /** 21 (EU, IED) or 20.9 (US, 40 CFR 60). Omitted → the site regime's value. */
  ambientO2Percent: z.union([z.literal(21), z.literal(20.9)]),
  basis: z.enum(['dry', 'wet']),
  period: z.enum(PERIODS),
  periodLength: z.number().int().min(1).max(8784).nullish(),
  operatingPeriodsOnly: z.boolean(),
  criterion: Criterion,
  confidenceIntervalPercent: z.number().min(0).lt(100).nullish(),
  nearMissPercent: z.number().gt(0).lt(100),
  correctOnlyWhenAbove: z.boolean(),
  excludeStatuses: z.array(z.enum(EXCLUDABLE_STATUSES)).max(EXCLUDABLE_STATUSES.length),
  minValidHoursPerDay: z.number().int().min(1).max(24).nullish(),
  minData: MinDataSchema.nullish(),
  /** Omitted → the permit's effective-from date. */
  effectiveFrom: DateOnly,
  effectiveTo: DateOnly.nullish(),
});

type LimitShape = Partial<{
  stackId: string | null;
  unitId: string | null;
  unit: LimitUnit;
  referenceO2Percent: number | null;
  ambientO2Percent: number;
  period: Period;
  periodLength: number | null;
  effectiveFrom: string;
  effectiveTo: string | null;
}>;

/** Cross-field rules, used by zod on create and by the service on the merged row on update. */
export function limitIssues(v: LimitShape, partial = false): { path: string; message: string }[] {
  const issues: { path: string; message: string }[] = [];
  const hasStack = Boolean(v.stackId);
  const hasUnit = Boolean(v.unitId);
  if (!partial && hasStack === hasUnit) {
    issues.push({ path: 'stackId', message: 'Give either a stack or an emission unit, not both' });
  }
  if (v.period) {
    const needsLength = PERIODS_WITH_LENGTH.includes(v.period);
    if (needsLength && !v.periodLength) issues.push({ path: 'periodLength', message: 'Give the length of the rolling or block window' });
    if (!needsLength && v.periodLength) issues.push({ path: 'periodLength', message: 'Only rolling and block periods have a length' });
  }
  if (v.referenceO2Percent != null && v.ambientO2Percent != null && v.referenceO2Percent >= v.ambientO2Percent) {
    issues.push({ path: 'referenceO2Percent', message: `Must be below the ambient ${v.ambientO2Percent} % O2` });
  }
  if (v.unit && UNITS_WITHOUT_O2.includes(v.unit) && v.referenceO2Percent != null) {
    issues.push({ path: 'referenceO2Percent', message: `A limit in ${v.unit} has no reference O2` });
  }
  if (v.effectiveFrom && v.effectiveTo && v.effectiveTo < v.effectiveFrom) {
    issues.push({ path: 'effectiveTo', message: 'Must not be before the effective-from date' });
  }
  return issues;
}

const refineWith = (partial: boolean) => (v: LimitShape, ctx: z.RefinementCtx) => {
  for (const issue of limitIssues(v, partial)) ctx.addIssue({ code: 'custom', path: [issue.path], message: issue.message });
};

export const CreateLimitBody = LimitFields.extend({
  referenceO2Percent: LimitFields.shape.referenceO2Percent.optional(),
  ambientO2Percent: LimitFields.shape.ambientO2Percent.optional(),
  basis: LimitFields.shape.basis.default('dry'),
  operatingPeriodsOnly: LimitFields.shape.operatingPeriodsOnly.default(true),
  criterion: Criterion.default({ type: 'every_period', factor: 1 }),
  nearMissPercent: LimitFields.shape.nearMissPercent.default(90),
  correctOnlyWhenAbove: LimitFields.shape.correctOnlyWhenAbove.default(false),
  excludeStatuses: LimitFields.shape.excludeStatuses.default(['startup-shutdown']),
  effectiveFrom: DateOnly.optional(),
}).superRefine(refineWith(false));
export type CreateLimitBody = z.output<typeof CreateLimitBody>;

/** The target (stack or unit) is fixed at creation: a limit for another target is another limit. */
export const UpdateLimitBody = LimitFields.omit({ stackId: true, unitId: true })
  .partial()
  .extend({ version: Version })
  .superRefine(refineWith(true));
export type UpdateLimitBody = z.output<typeof UpdateLimitBody>;

export const LimitListQuery = listQuery(
  { pollutant: 'pollutant', period: 'period', elv: 'elv', effectiveFrom: 'effective_from', createdAt: 'created_at' },
  'pollutant',
);

export const LimitDto = z.object({
  id: Id,
  permitId: Id,
  stackId: Id.nullable(),
  unitId: Id.nullable(),
  pollutant: z.enum(POLLUTANTS),
  elv: z.number(),
  unit: z.enum(LIMIT_UNITS),
  referenceO2Percent: z.number().nullable(),
  ambientO2Percent: z.number(),
  basis: z.enum(['dry', 'wet']),
  period: z.enum(PERIODS),
  periodLength: z.number().int().nullable(),
  operatingPeriodsOnly: z.boolean(),
  criterion: Criterion,
  confidenceIntervalPercent: z.number().nullable(),
  nearMissPercent: z.number(),
  correctOnlyWhenAbove: z.boolean(),
  excludeStatuses: z.array(z.string()),
  minValidHoursPerDay: z.number().int().nullable(),
  minData: z.record(z.string(), z.number()).nullable(),
  effectiveFrom: z.string(),
  effectiveTo: z.string().nullable(),
  /** The limit in one plain sentence, e.g. "NOx ≤ 100 mg/Nm3, dry, 3 % O2, daily average, …". */
  summary: z.string(),
  archivedAt: z.string().nullable(),
  version: z.number().int(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type LimitDto = z.infer<typeof LimitDto>;

export const LimitDefaultsQuery = z.object({
  regime: z.enum(['eu_ied', 'us_epa', 'other']),
  unitType: z.enum(['boiler', 'process_heater', 'kiln', 'gas_turbine', 'engine', 'incinerator', 'other']).optional(),
  fuelKind: z.enum(['gas', 'liquid', 'solid']).optional(),
});
export type LimitDefaultsQuery = z.infer<typeof LimitDefaultsQuery>;

export const LimitDefaultsDto = z.object({
  referenceO2Percent: z.number().nullable(),
  ambientO2Percent: z.number(),
  source: z.string(),
});
export type LimitDefaultsDto = z.infer<typeof LimitDefaultsDto>;
