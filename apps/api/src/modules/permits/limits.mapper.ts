/**
 * The one place where a stored limit (API/DB shape) becomes the compliance engine's LimitRule
 * (packages/calc/src/limits) and back. The API keeps flat, form-friendly fields (`period` +
 * `periodLength`, `criterion.type` in snake_case); the engine nests them.
 */
import type { LimitRule, LimitRuleInput } from '@flueledger/calc';
import type { Criterion, LimitDto, Period } from './limits.schemas';

export type LimitRuleFields = Pick<
  LimitDto,
  | 'pollutant' | 'elv' | 'unit' | 'referenceO2Percent' | 'ambientO2Percent' | 'basis' | 'period' | 'periodLength'
  | 'operatingPeriodsOnly' | 'criterion' | 'confidenceIntervalPercent' | 'nearMissPercent' | 'correctOnlyWhenAbove'
  | 'excludeStatuses' | 'minData'
>;

function toPeriod(l: LimitRuleFields): LimitRuleInput['period'] {
  const n = l.periodLength ?? 0;
  switch (l.period) {
    case 'hour': return { kind: 'hour' };
    case 'half_hour': return { kind: 'half-hour' };
    case 'day': return { kind: 'day' };
    case 'month': return { kind: 'month' };
    case 'year': return { kind: 'year' };
    case 'rolling_days': return { kind: 'rolling-days', days: n, operatingDaysOnly: l.operatingPeriodsOnly };
    case 'rolling_hours': return { kind: 'rolling-hours', hours: n, operatingHoursOnly: l.operatingPeriodsOnly };
    case 'block_hours': return { kind: 'block-hours', hours: n };
  }
}

function fromPeriod(p: LimitRule['period']): { period: Period; periodLength: number | null; operatingPeriodsOnly: boolean } {
  switch (p.kind) {
    case 'hour': return { period: 'hour', periodLength: null, operatingPeriodsOnly: true };
    case 'half-hour': return { period: 'half_hour', periodLength: null, operatingPeriodsOnly: true };
    case 'day': return { period: 'day', periodLength: null, operatingPeriodsOnly: true };
    case 'month': return { period: 'month', periodLength: null, operatingPeriodsOnly: true };
    case 'year': return { period: 'year', periodLength: null, operatingPeriodsOnly: true };
    case 'rolling-days': return { period: 'rolling_days', periodLength: p.days, operatingPeriodsOnly: p.operatingDaysOnly };
    case 'rolling-hours': return { period: 'rolling_hours', periodLength: p.hours, operatingPeriodsOnly: p.operatingHoursOnly };
    case 'block-hours': return { period: 'block_hours', periodLength: p.hours, operatingPeriodsOnly: true };
  }
}

const toCriterion = (c: Criterion): LimitRuleInput['criterion'] =>
  c.type === 'every_period' ? { kind: 'every-period', factor: c.factor } : { kind: 'share-of-periods', share: c.share, factor: c.factor };

const fromCriterion = (c: LimitRule['criterion']): Criterion =>
  c.kind === 'every-period' ? { type: 'every_period', factor: c.factor } : { type: 'share_of_periods', share: c.share, factor: c.factor };

/** A stored limit as the compliance engine's rule input (validate with `parseLimitRule`). */
export function toLimitRule(l: LimitRuleFields & { id?: string; summary?: string }): LimitRuleInput {
  return {
    ...(l.id ? { id: l.id } : {}),
    ...(l.summary ? { name: l.summary } : {}),
    pollutant: l.pollutant,
    elv: l.elv,
    unit: l.unit,
    referenceO2Percent: l.referenceO2Percent,
    ambientO2Percent: l.ambientO2Percent === 20.9 ? 20.9 : 21,
    basis: l.basis,
    period: toPeriod(l),
    criterion: toCriterion(l.criterion),
    confidenceIntervalPercent: l.confidenceIntervalPercent ?? 0,
    excludeStatuses: l.excludeStatuses as LimitRuleInput['excludeStatuses'],
    correctOnlyWhenAboveReference: l.correctOnlyWhenAbove,
    nearMissPercent: l.nearMissPercent,
    ...(l.minData ? { minData: l.minData } : {}),
  };
}

/** An engine rule (e.g. a calc preset) as the fields of a limit to store. */
export function fromLimitRule(rule: LimitRule): LimitRuleFields {
  return {
    pollutant: rule.pollutant as LimitRuleFields['pollutant'],
    elv: rule.elv,
    unit: rule.unit as LimitRuleFields['unit'],
    referenceO2Percent: rule.referenceO2Percent,
    ambientO2Percent: rule.ambientO2Percent,
    basis: rule.basis,
    ...fromPeriod(rule.period),
    criterion: fromCriterion(rule.criterion),
    confidenceIntervalPercent: rule.confidenceIntervalPercent === 0 ? null : rule.confidenceIntervalPercent,
    nearMissPercent: rule.nearMissPercent ?? 90,
    correctOnlyWhenAbove: rule.correctOnlyWhenAboveReference,
    excludeStatuses: [...rule.excludeStatuses],
    minData: rule.minData ? (Object.fromEntries(Object.entries(rule.minData).filter(([, v]) => v !== undefined)) as Record<string, number>) : null,
  };
}
