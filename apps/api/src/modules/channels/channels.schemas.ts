import { z } from 'zod';
import { listQuery } from '../sites/list-query';
import { Id, Version } from '../sites/shared-schemas';

export const CHANNEL_PARAMETERS = [
  'NOx', 'NO', 'NO2', 'SO2', 'CO', 'dust', 'HCl', 'HF', 'TOC', 'NH3', 'Hg', 'CO2',
  'O2', 'H2O', 'flow', 'temperature', 'pressure', 'load', 'fuel_flow',
] as const;
export type ChannelParameter = (typeof CHANNEL_PARAMETERS)[number];

/** `scfh`: standard cubic feet per hour at 68 °F and 29.92 in Hg (40 CFR 60.2); `degF`: °F. */
export const CHANNEL_UNITS = ['mg/Nm3', 'ppm', 'ug/Nm3', '%', 'Nm3/h', 'm3/h', 'scfh', 'degC', 'degF', 'K', 'kPa', 'hPa', 'MW', 'kg/h', 't/h'] as const;
export type ChannelUnit = (typeof CHANNEL_UNITS)[number];

export const BASES = ['wet', 'dry'] as const;
export const CONDITIONS = ['actual', 'standard'] as const;
export const INTERVALS_MINUTES = [1, 5, 10, 15, 30, 60] as const;

const GAS_CONCENTRATION: readonly ChannelUnit[] = ['mg/Nm3', 'ppm', 'ug/Nm3'];
const PARTICULATE: readonly ChannelUnit[] = ['mg/Nm3', 'ug/Nm3'];
const VOLUME_SHARE: readonly ChannelUnit[] = ['%'];

/**
 * The units a parameter can be reported in. A dust or mercury monitor cannot report ppm (there is
 * no molar mass for a particle), a temperature cannot be in mg/Nm3: such a channel is a typing
 * mistake that would silently poison every later calculation.
 */
export const UNITS_BY_PARAMETER: Record<ChannelParameter, readonly ChannelUnit[]> = {
  NOx: GAS_CONCENTRATION,
  NO: GAS_CONCENTRATION,
  NO2: GAS_CONCENTRATION,
  SO2: GAS_CONCENTRATION,
  CO: GAS_CONCENTRATION,
  HCl: GAS_CONCENTRATION,
  HF: GAS_CONCENTRATION,
  TOC: GAS_CONCENTRATION,
  NH3: GAS_CONCENTRATION,
  dust: PARTICULATE,
  Hg: PARTICULATE,
  CO2: VOLUME_SHARE,
  O2: VOLUME_SHARE,
  H2O: VOLUME_SHARE,
  flow: ['Nm3/h', 'm3/h', 'scfh'],
  temperature: ['degC', 'degF', 'K'],
  pressure: ['kPa', 'hPa'],
  load: ['MW', '%'],
  fuel_flow: ['kg/h', 't/h', 'Nm3/h', 'm3/h'],
};

export const unitFitsParameter = (parameter: ChannelParameter, unit: ChannelUnit): boolean =>
  UNITS_BY_PARAMETER[parameter].includes(unit);

const ChannelFields = z.object({
  parameter: z.enum(CHANNEL_PARAMETERS),
  unit: z.enum(CHANNEL_UNITS),
  basis: z.enum(BASES),
  conditions: z.enum(CONDITIONS),
  rangeMin: z.number().finite().nullish(),
  rangeMax: z.number().finite().nullish(),
  intervalMinutes: z.union(INTERVALS_MINUTES.map((m) => z.literal(m)) as [z.ZodLiteral<1>, ...z.ZodLiteral<number>[]]),
  sourceLabel: z.string().trim().min(1).max(200).nullish(),
});

type ChannelShape = {
  parameter?: ChannelParameter | undefined;
  unit?: ChannelUnit | undefined;
  rangeMin?: number | null | undefined;
  rangeMax?: number | null | undefined;
};

/** Cross-field checks shared by create and (after merging with the stored row) update. */
export function channelIssues(v: ChannelShape): { path: string; message: string }[] {
  const issues: { path: string; message: string }[] = [];
  if (v.parameter && v.unit && !unitFitsParameter(v.parameter, v.unit)) {
    issues.push({ path: 'unit', message: `${v.parameter} is reported in ${UNITS_BY_PARAMETER[v.parameter].join(', ')}` });
  }
  if (v.rangeMin != null && v.rangeMax != null && !(v.rangeMin < v.rangeMax)) {
    issues.push({ path: 'rangeMax', message: 'Must be greater than the range minimum' });
  }
  return issues;
}

const refineChannel = (v: ChannelShape, ctx: z.RefinementCtx) => {
  for (const issue of channelIssues(v)) ctx.addIssue({ code: 'custom', message: issue.message, path: [issue.path] });
};

export const CreateChannelBody = ChannelFields.superRefine(refineChannel);
export type CreateChannelBody = z.infer<typeof CreateChannelBody>;
export const UpdateChannelBody = ChannelFields.partial().extend({ version: Version }).superRefine(refineChannel);
export type UpdateChannelBody = z.infer<typeof UpdateChannelBody>;

export const ChannelListQuery = listQuery(
  { parameter: 'parameter', unit: 'unit', basis: 'basis', intervalMinutes: 'interval_minutes', createdAt: 'created_at' },
  'parameter',
);

export const ChannelDto = z.object({
  id: Id,
  stackId: Id,
  parameter: z.enum(CHANNEL_PARAMETERS),
  unit: z.enum(CHANNEL_UNITS),
  basis: z.enum(BASES),
  conditions: z.enum(CONDITIONS),
  rangeMin: z.number().nullable(),
  rangeMax: z.number().nullable(),
  intervalMinutes: z.number().int(),
  sourceLabel: z.string().nullable(),
  archivedAt: z.string().nullable(),
  version: z.number().int(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type ChannelDto = z.infer<typeof ChannelDto>;
