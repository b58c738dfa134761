/**
 * F-factors and heating value of a fuel analysis, computed with @flueledger/calc so the server
 * records exactly what the browser previews. Method 19 (40 CFR 60 App. A) §12.3.2 for computed
 * values, Table 19-2 for the defaults.
 */
import {
  CalcInputError,
  DEFAULT_F_FACTORS,
  fFactors,
  heatingValues,
  type DefaultFFactorFuel,
  type Fuel,
} from '@flueledger/calc';
import type { FieldIssue } from '../sites/setup-context';
import { unprocessable } from '../sites/setup-context';
import type { CreateAnalysisBody, FuelKind, FuelType } from './fuels.schemas';

/** Our fuel types → rows of Method 19 Table 19-2 (the "other" types have no default). */
const DEFAULT_ROW: Partial<Record<FuelType, DefaultFFactorFuel>> = {
  natural_gas: 'natural-gas',
  propane: 'propane',
  butane: 'butane',
  fuel_oil: 'oil',
  bituminous_coal: 'coal-bituminous',
  anthracite: 'coal-anthracite',
  lignite: 'coal-lignite',
  wood: 'wood',
  wood_bark: 'wood-bark',
};

export interface AnalysisFigures {
  ultimate: Record<string, number> | null;
  composition: Record<string, number> | null;
  gcvMJPerKg: number | null;
  gcvMJPerNm3: number | null;
  gcvSource: 'measured' | 'correlation' | 'none';
  fdDscfPerMMBtu: number;
  fwWscfPerMMBtu: number | null;
  fcScfPerMMBtu: number;
  fFactorSource: 'computed' | 'method19_default';
}

function calcIssue(error: unknown): FieldIssue[] {
  if (error instanceof CalcInputError) return [{ path: error.field ?? '', message: error.message }];
  throw error;
}

function calcFuel(kind: FuelKind, body: CreateAnalysisBody): Fuel | null {
  if (kind === 'gas') {
    if (!body.composition) return null;
    return { kind: 'gas', composition: body.composition, ...(body.gcvMJPerNm3 ? { gcvMJPerNm3: body.gcvMJPerNm3 } : {}) };
  }
  if (!body.ultimate) return null;
  return { kind, ultimate: body.ultimate, ...(body.gcvMJPerKg ? { gcvMJPerKg: body.gcvMJPerKg } : {}) };
}

/**
 * What to store for a new analysis. A gas needs a composition, a solid or liquid an ultimate
 * analysis, unless the Method 19 default F-factors are asked for. A missing GCV is computed
 * (gas: ISO 6976 summation; solid/liquid: Channiwala–Parikh correlation) and marked as such.
 */
export function analysisFigures(fuelType: FuelType, kind: FuelKind, body: CreateAnalysisBody): AnalysisFigures {
  const wrongAnalysis =
    kind === 'gas'
      ? body.ultimate ? [{ path: 'ultimate', message: 'A gaseous fuel is described by its composition (mol %), not an ultimate analysis' }] : []
      : body.composition ? [{ path: 'composition', message: 'A solid or liquid fuel is described by its ultimate analysis (mass %), not a gas composition' }] : [];
  if (wrongAnalysis.length > 0) throw unprocessable('The analysis does not fit the fuel', wrongAnalysis);

  const fuel = calcFuel(kind, body);
  const source = body.fFactorSource ?? (fuel ? 'computed' : 'method19_default');
  const given = {
    ultimate: body.ultimate ?? null,
    composition: (body.composition as Record<string, number> | undefined) ?? null,
  };

  if (source === 'method19_default') {
    const row = DEFAULT_ROW[fuelType];
    if (!row) {
      throw unprocessable('Method 19 gives no default F-factors for this fuel type', [
        { path: 'fFactorSource', message: 'Give the analysis so the F-factors can be computed' },
      ]);
    }
    const d = DEFAULT_F_FACTORS[row];
    const gcvMeasured = kind === 'gas' ? body.gcvMJPerNm3 : body.gcvMJPerKg;
    return {
      ...given,
      gcvMJPerKg: kind === 'gas' ? null : (body.gcvMJPerKg ?? null),
      gcvMJPerNm3: kind === 'gas' ? (body.gcvMJPerNm3 ?? null) : null,
      gcvSource: gcvMeasured ? 'measured' : 'none',
      fdDscfPerMMBtu: d.fdDscfPerMMBtu,
      fwWscfPerMMBtu: d.fwWscfPerMMBtu ?? null,
      fcScfPerMMBtu: d.fcScfPerMMBtu,
      fFactorSource: 'method19_default',
    };
  }

  if (!fuel) {
    const path = kind === 'gas' ? 'composition' : 'ultimate';
    throw unprocessable('Computed F-factors need the analysis', [
      { path, message: kind === 'gas' ? 'Give the gas composition (mol %)' : 'Give the ultimate analysis (mass %, as fired)' },
    ]);
  }
  try {
    const f = fFactors(fuel, { estimateGcv: true });
    const hv = heatingValues(fuel, { estimate: true });
    return {
      ...given,
      gcvMJPerKg: kind === 'gas' ? null : hv.hhvMJPerKg,
      gcvMJPerNm3: kind === 'gas' ? hv.hhvMJ : null,
      gcvSource: f.gcvSource === 'given' ? 'measured' : 'correlation',
      fdDscfPerMMBtu: f.fdDscfPerMMBtu,
      fwWscfPerMMBtu: f.fwWscfPerMMBtu,
      fcScfPerMMBtu: f.fcScfPerMMBtu,
      fFactorSource: 'computed',
    };
  } catch (error) {
    throw unprocessable('The analysis cannot be used for F-factors', calcIssue(error));
  }
}
