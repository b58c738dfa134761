import { z } from 'zod';
import { listQuery } from '../sites/list-query';
import { DateOnly, Id, Name, Version } from '../sites/shared-schemas';

export const FUEL_TYPES = [
  'natural_gas', 'propane', 'butane', 'fuel_oil', 'bituminous_coal', 'anthracite', 'lignite',
  'wood', 'wood_bark', 'other_gas', 'other_liquid', 'other_solid',
] as const;
export type FuelType = (typeof FUEL_TYPES)[number];
export const FUEL_KINDS = ['gas', 'liquid', 'solid'] as const;
export type FuelKind = (typeof FUEL_KINDS)[number];

/** The physical state each fuel type is fired in (it decides which analysis it needs). */
export const KIND_OF_FUEL_TYPE: Record<FuelType, FuelKind> = {
  natural_gas: 'gas',
  propane: 'gas',
  butane: 'gas',
  other_gas: 'gas',
  fuel_oil: 'liquid',
  other_liquid: 'liquid',
  bituminous_coal: 'solid',
  anthracite: 'solid',
  lignite: 'solid',
  wood: 'solid',
  wood_bark: 'solid',
  other_solid: 'solid',
};

export const F_FACTOR_SOURCES = ['computed', 'method19_default'] as const;
export const GCV_SOURCES = ['measured', 'correlation', 'none'] as const;

const percent = z.number().min(0, 'Must be at least 0 %').max(100, 'Must be at most 100 %');

/** Sum tolerance of an analysis, percentage points (the calc package's COMPOSITION_SUM_TOLERANCE_PERCENT). */
const SUM_TOLERANCE_PERCENT = 0.5;

/** As-fired mass %, ASTM D3176 convention: H excludes the hydrogen of moisture. */
export const UltimateAnalysis = z
  .object({ C: percent, H: percent, O: percent, N: percent, S: percent, moisture: percent, ash: percent })
  .strict()
  .refine((u) => Math.abs(Object.values(u).reduce((a, b) => a + b, 0) - 100) <= SUM_TOLERANCE_PERCENT, {
    message: 'The ultimate analysis must sum to 100 % (± 0.5) as fired, moisture and ash included',
  });

export const GasComposition = z
  .object({
    CH4: percent, C2H6: percent, C3H8: percent, C4H10: percent, CO: percent, H2: percent,
    CO2: percent, N2: percent, O2: percent, H2S: percent, H2O: percent,
  })
  .partial()
  .strict()
  .refine((c) => Math.abs(Object.values(c).reduce<number>((a, b) => a + (b ?? 0), 0) - 100) <= SUM_TOLERANCE_PERCENT, {
    message: 'The gas composition must sum to 100 mol % (± 0.5)',
  });

export const CreateAnalysisBody = z.object({
  validFrom: DateOnly,
  ultimate: UltimateAnalysis.nullish(),
  composition: GasComposition.nullish(),
  gcvMJPerKg: z.number().positive().max(100).nullish(),
  gcvMJPerNm3: z.number().positive().max(200).nullish(),
  /** 'computed' (default when an analysis is given) or the Method 19 Table 19-2 default. */
  fFactorSource: z.enum(F_FACTOR_SOURCES).optional(),
});
export type CreateAnalysisBody = z.infer<typeof CreateAnalysisBody>;

export const CreateFuelBody = z
  .object({
    name: Name,
    fuelType: z.enum(FUEL_TYPES),
    kind: z.enum(FUEL_KINDS).optional(),
    analysis: CreateAnalysisBody.optional(),
  })
  .refine((f) => !f.kind || f.kind === KIND_OF_FUEL_TYPE[f.fuelType], {
    message: 'Does not match the fuel type',
    path: ['kind'],
  });
export type CreateFuelBody = z.infer<typeof CreateFuelBody>;

/** Name and type only: the analysis is history and changes by adding a new one. */
export const UpdateFuelBody = z.object({
  name: Name.optional(),
  fuelType: z.enum(FUEL_TYPES).optional(),
  version: Version,
});
export type UpdateFuelBody = z.infer<typeof UpdateFuelBody>;

export const FuelListQuery = listQuery({ name: 'name', fuelType: 'fuel_type', kind: 'kind', createdAt: 'created_at' }, 'name');
export const AnalysisListQuery = listQuery({ validFrom: 'valid_from', createdAt: 'created_at' }, 'validFrom');

export const FuelAnalysisDto = z.object({
  id: Id,
  fuelId: Id,
  validFrom: z.string(),
  ultimate: z.record(z.string(), z.number()).nullable(),
  composition: z.record(z.string(), z.number()).nullable(),
  gcvMJPerKg: z.number().nullable(),
  gcvMJPerNm3: z.number().nullable(),
  /** measured = given with the analysis; correlation = computed by @flueledger/calc; none = not known */
  gcvSource: z.enum(GCV_SOURCES),
  fdDscfPerMMBtu: z.number(),
  fwWscfPerMMBtu: z.number().nullable(),
  fcScfPerMMBtu: z.number(),
  fFactorSource: z.enum(F_FACTOR_SOURCES),
  createdBy: Id.nullable(),
  createdAt: z.string(),
});
export type FuelAnalysisDto = z.infer<typeof FuelAnalysisDto>;

export const FuelDto = z.object({
  id: Id,
  siteId: Id,
  name: z.string(),
  fuelType: z.enum(FUEL_TYPES),
  kind: z.enum(FUEL_KINDS),
  currentAnalysis: FuelAnalysisDto.nullable(),
  archivedAt: z.string().nullable(),
  version: z.number().int(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type FuelDto = z.infer<typeof FuelDto>;
