/**
 * A limit in one plain sentence for people: "NOx ≤ 100 mg/Nm3, dry, 3 % O2, daily average,
 * validated (−20 %), every day ≤ 110 % of ELV". The sentence is written by @flueledger/calc, so
 * the web form previews exactly what is stored here as `Limit.summary`.
 */
import { describeLimit } from '@flueledger/calc';

import type { Criterion, LimitUnit, Period } from './limits.schemas';

export interface SummaryInput {
  pollutant: string;
  elv: number;
  unit: LimitUnit;
  referenceO2Percent: number | null;
  basis: 'dry' | 'wet';
  period: Period;
  periodLength: number | null;
  operatingPeriodsOnly: boolean;
  criterion: Criterion;
  confidenceIntervalPercent: number | null;
  correctOnlyWhenAbove: boolean;
}

export function limitSummary(p: SummaryInput): string {
  return describeLimit(p);
}
