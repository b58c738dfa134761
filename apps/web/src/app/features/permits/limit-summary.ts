import type { AveragingPeriod, LimitCriterion, LimitUnit } from '../../core/api/permits-api';
import { limitUnitsWithoutO2 } from '../../shared/setup-labels';

/** What a limit's plain-language summary is made of (the API's LimitDto fields). */
export interface LimitSummaryInput {
  pollutant: string;
  elv: number;
  unit: LimitUnit;
  referenceO2Percent: number | null;
  basis: 'dry' | 'wet';
  period: AveragingPeriod;
  periodLength: number | null;
  operatingPeriodsOnly: boolean;
  criterion: LimitCriterion;
  confidenceIntervalPercent: number | null;
  correctOnlyWhenAbove: boolean;
}

/** Numbers as people write them: no trailing zeros. */
const num = (n: number): string => String(Number(n.toPrecision(6)));
const MINUS = '\u2212';

function averageName(p: LimitSummaryInput): string {
  const n = p.periodLength ?? 0;
  const operating = p.operatingPeriodsOnly ? ' operating' : '';
  switch (p.period) {
    case 'hour':
      return 'hourly average';
    case 'half_hour':
      return 'half-hourly average';
    case 'day':
      return 'daily average';
    case 'month':
      return 'monthly average';
    case 'year':
      return 'annual average';
    case 'rolling_days':
      return `${n}${operating}-day rolling average`;
    case 'rolling_hours':
      return `${n}${operating}-hour rolling average`;
    case 'block_hours':
      return `${n}-hour block average`;
  }
}

function periodsName(p: LimitSummaryInput, plural: boolean): string {
  const n = p.periodLength ?? 0;
  const s = plural ? 's' : '';
  switch (p.period) {
    case 'hour':
      return `hour${s}`;
    case 'half_hour':
      return `half-hour${s}`;
    case 'day':
      return `day${s}`;
    case 'month':
      return `month${s}`;
    case 'year':
      return `year${s}`;
    case 'rolling_days':
      return `${n}-day average${s}`;
    case 'rolling_hours':
      return `${n}-hour average${s}`;
    case 'block_hours':
      return `${n}-hour block${s}`;
  }
}

const ofElv = (factor: number): string => (factor === 1 ? 'ELV' : `${num(factor * 100)} % of ELV`);

/**
 * The limit in one sentence, written the way the API writes `Limit.summary`, so the form can
 * show what will be stored while the person types: "NOx ≤ 100 mg/Nm3, dry, 3 % O2, daily
 * average, validated (−20 %), every day ≤ 110 % of ELV".
 */
export function limitSummary(p: LimitSummaryInput): string {
  const parts = [`${p.pollutant} ≤ ${num(p.elv)} ${p.unit}`];
  if (limitUnitsWithoutO2.includes(p.unit)) {
    if (p.unit === 'lb/MMBtu' || p.unit === 'ng/J') parts.push('per heat input (F-factor)');
  } else {
    parts.push(p.basis);
    if (p.referenceO2Percent === null) parts.push('no O2 correction');
    else parts.push(`${num(p.referenceO2Percent)} % O2${p.correctOnlyWhenAbove ? ' (corrected only when above)' : ''}`);
  }
  parts.push(averageName(p));
  if (p.confidenceIntervalPercent) parts.push(`validated (${MINUS}${num(p.confidenceIntervalPercent)} %)`);
  if (p.criterion.type === 'every_period') {
    parts.push(`every ${periodsName(p, false)} ≤ ${ofElv(p.criterion.factor)}`);
  } else {
    parts.push(`${num(p.criterion.share * 100)} % of ${periodsName(p, true)} ≤ ${ofElv(p.criterion.factor)}`);
  }
  return parts.join(', ');
}
