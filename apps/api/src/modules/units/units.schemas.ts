import { z } from 'zod';
import { listQuery } from '../sites/list-query';
import { DateOnly, datesInOrder, Id, Name, Version } from '../sites/shared-schemas';

export const UNIT_TYPES = ['boiler', 'process_heater', 'kiln', 'gas_turbine', 'engine', 'incinerator', 'other'] as const;
export type UnitType = (typeof UNIT_TYPES)[number];

const UnitFields = z.object({
  name: Name,
  unitType: z.enum(UNIT_TYPES),
  // Rated thermal input, MW of fuel heat input (the quantity the IED's capacity thresholds use).
  ratedThermalInputMWth: z.number().positive('Must be greater than 0').max(100000),
  inServiceFrom: DateOnly,
  inServiceTo: DateOnly.nullish(),
  fuelIds: z.array(Id).max(50),
});

const inServiceOrder = (v: { inServiceFrom?: string | undefined; inServiceTo?: string | null | undefined }) =>
  datesInOrder(v.inServiceFrom, v.inServiceTo);
const inServiceOrderIssue = { message: 'Must not be before the in-service date', path: ['inServiceTo'] };

export const CreateUnitBody = UnitFields.extend({ fuelIds: UnitFields.shape.fuelIds.default([]) }).refine(
  inServiceOrder,
  inServiceOrderIssue,
);
export type CreateUnitBody = z.infer<typeof CreateUnitBody>;

export const UpdateUnitBody = UnitFields.partial().extend({ version: Version }).refine(inServiceOrder, inServiceOrderIssue);
export type UpdateUnitBody = z.infer<typeof UpdateUnitBody>;

export const UnitListQuery = listQuery(
  {
    name: 'name',
    unitType: 'unit_type',
    ratedThermalInputMWth: 'rated_thermal_input_mwth',
    inServiceFrom: 'in_service_from',
    createdAt: 'created_at',
  },
  'name',
);

export const EmissionUnitDto = z.object({
  id: Id,
  siteId: Id,
  name: z.string(),
  unitType: z.enum(UNIT_TYPES),
  ratedThermalInputMWth: z.number(),
  inServiceFrom: z.string(),
  inServiceTo: z.string().nullable(),
  fuelIds: z.array(Id),
  archivedAt: z.string().nullable(),
  version: z.number().int(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type EmissionUnitDto = z.infer<typeof EmissionUnitDto>;
