import type { Limit } from '../../../core/api/permits-api';
import type { Column, Readings, Review, ReviewDaily, ReviewHourly, ReviewWire, SparseColumn } from '../../../core/api/review-api';
import type { Site, StackWithChannels } from '../../../core/api/sites-api';
import { noxChannel, o2Channel } from '../../imports/testing/import-fixtures';

/* An invented site and stack with made-up values, for tests. */

export const site: Site = {
  id: 'site-1',
  name: 'Harrowgate Works',
  timeZone: 'Europe/Berlin',
  country: 'DE',
  regime: 'eu_ied',
  address: null,
  archivedAt: null,
  version: 1,
  createdAt: '2026-10-01T00:00:00Z',
  updatedAt: '2026-10-01T00:00:00Z',
};

export const stack: StackWithChannels = {
  id: 'stack-b2',
  siteId: 'site-1',
  name: 'Boiler 2 stack',
  heightM: 45,
  diameterM: 1.8,
  unitIds: ['unit-b2'],
  channels: [noxChannel, o2Channel],
  archivedAt: null,
  version: 1,
  createdAt: '2026-10-01T00:00:00Z',
  updatedAt: '2026-10-01T00:00:00Z',
};

export const noxLimit: Limit = {
  id: 'lim-nox-day',
  permitId: 'permit-1',
  stackId: 'stack-b2',
  unitId: null,
  pollutant: 'NOx',
  elv: 100,
  unit: 'mg/Nm3',
  referenceO2Percent: 3,
  ambientO2Percent: 21,
  basis: 'dry',
  period: 'day',
  periodLength: null,
  operatingPeriodsOnly: true,
  criterion: { type: 'every_period', factor: 1.1 },
  confidenceIntervalPercent: 20,
  nearMissPercent: 90,
  correctOnlyWhenAbove: false,
  excludeStatuses: [],
  minValidHoursPerDay: null,
  minData: null,
  effectiveFrom: '2026-01-01',
  effectiveTo: null,
  summary: 'NOx ≤ 100 mg/Nm3, dry, 3 % O2, daily average',
  archivedAt: null,
  version: 1,
  createdAt: '2026-10-01T00:00:00Z',
  updatedAt: '2026-10-01T00:00:00Z',
};

const statusLegend = ['valid', 'substituted', 'invalid', 'not_operating', 'startup_shutdown'];
const reasonLegend = ['none', 'no_readings', 'fault'];
const code = (legend: string[], word: string) => legend.indexOf(word);

/**
 * `hours` hours from 1 November 00:00 in Berlin (31 October 23:00 UTC), as the API sends them: NOx
 * at 60 + i mg/Nm3 and the limit at 61 + i, except hour 5, which is not valid (20 % coverage).
 */
export function hourlyFixture(hours = 48): ReviewHourly {
  const invalid = (i: number) => i === 5;
  const column = <T>(at: (i: number) => T) => Array.from({ length: hours }, (_, i) => at(i));
  return {
    fromMs: Date.parse('2026-10-31T23:00:00Z'),
    stepMs: 3_600_000,
    count: hours,
    statusLegend,
    reasonLegend,
    channels: {
      'ch-nox': {
        value: column((i) => (invalid(i) ? null : 60 + i)),
        status: column((i) => code(statusLegend, invalid(i) ? 'invalid' : 'valid')),
        coverage: column((i) => (invalid(i) ? 0.2 : 1)),
        reason: column((i) => code(reasonLegend, invalid(i) ? 'fault' : 'none')),
      },
      'ch-o2': { value: column(() => 3.2), status: column(() => 0), coverage: column(() => 1), reason: column(() => 0) },
    },
    limits: {
      'lim-nox-day': {
        value: column((i) => (invalid(i) ? null : 61 + i)),
        status: column((i) => code(statusLegend, invalid(i) ? 'invalid' : 'valid')),
        reason: column((i) => code(reasonLegend, invalid(i) ? 'fault' : 'none')),
      },
    },
  };
}

/** A period with no stored hour at all. */
export function emptyHourlyFixture(fromIso: string, hours: number): ReviewHourly {
  return { fromMs: Date.parse(fromIso), stepMs: 3_600_000, count: hours, statusLegend, reasonLegend, channels: {}, limits: {} };
}

export const emptyDailyFixture: ReviewDaily = { dayStart: [], dayEnd: [], statusLegend: ['valid', 'invalid', 'not_operating', 'incomplete'], channels: {}, limits: {} };

const event = (start: string, end: string, peak: number) => ({ start, end, peak, peakAt: start, percentOfElv: peak, threshold: 100, periodCount: 1 });

export function reviewFixture(overrides: Partial<Review> = {}): Review {
  return {
    stack: { id: stack.id, name: stack.name, siteId: site.id, siteName: site.name },
    from: '2026-10-31T23:00:00.000Z',
    to: '2026-11-30T23:00:00.000Z',
    timeZone: 'Europe/Berlin',
    channels: [noxChannel, o2Channel].map(({ id, parameter, unit, basis, conditions, intervalMinutes }) => ({ id, parameter, unit, basis, conditions, intervalMinutes })),
    hourly: hourlyFixture(),
    daily: {
      dayStart: ['2026-10-31T23:00:00.000Z', '2026-11-01T23:00:00.000Z'],
      dayEnd: ['2026-11-01T23:00:00.000Z', '2026-11-02T23:00:00.000Z'],
      statusLegend: emptyDailyFixture.statusLegend,
      channels: {},
      limits: { 'lim-nox-day': { value: [72.4, 121.5], validatedValue: [72.4 * 0.8, 121.5 * 0.8], status: [0, 0], validHours: [24, 24], invalidHours: [0, 0] } },
    },
    limits: [
      {
        limit: noxLimit,
        channelId: 'ch-nox',
        verdict: 'exceedance',
        note: 'One daily average above 110 % of the ELV.',
        threshold: 110,
        availabilityPercent: 97.9,
        validHours: 47,
        invalidHours: 1,
        invalidDays: 0,
        exceedances: [event('2026-11-01T23:00:00.000Z', '2026-11-02T23:00:00.000Z', 121.5)],
        nearMisses: [event('2026-10-31T23:00:00.000Z', '2026-11-01T23:00:00.000Z', 96.1)],
        share: null,
        headroom: null,
      },
    ],
    plausibility: [{ hourStart: '2026-11-01T04:00:00.000Z', o2PercentDry: 3.1, expectedCo2PercentDry: 10.6, measuredCo2PercentDry: 9.1, deviationPercent: -14.2 }],
    plausibilityCheck: { co2MaxPercentDry: 11.7, tolerancePercent: 10, hoursChecked: 47, note: null },
    computedAt: '2026-12-01T08:05:00Z',
    disclaimer: 'Figures support, not replace, regulatory reporting.',
    ...overrides,
  };
}

export function readingsFixture(items: Readings['items']): Readings {
  return {
    channel: { id: 'ch-nox', stackId: 'stack-b2', parameter: 'NOx', unit: 'mg/Nm3', basis: 'dry', intervalMinutes: 1 },
    from: '2026-10-31T23:00:00.000Z',
    to: '2026-11-01T00:00:00.000Z',
    includeSuperseded: true,
    items,
    truncated: false,
    imports: [
      { id: 'imp-1', fileName: 'boiler2-2026-11.xlsx', sha256: 'ab'.repeat(32), state: 'committed', uploadedAt: '2026-12-01T08:00:00Z', uploadedBy: 'user-officer', committedAt: '2026-12-01T08:04:00Z', rolledBackAt: null },
    ],
    hours: [],
  };
}

/** A full column as the API sends it: its exceptions from `usual`. */
export function sparse(column: Column, usual: number | null): SparseColumn {
  const at: number[] = [];
  const values: (number | null)[] = [];
  column.forEach((v, i) => {
    if (v !== usual) {
      at.push(i);
      values.push(v);
    }
  });
  return { usual, at, values };
}

/** A review as the API sends it (statuses, reasons and coverages as exceptions). */
export function toWire(review: Review): ReviewWire {
  const channels: ReviewWire['hourly']['channels'] = {};
  for (const [id, c] of Object.entries(review.hourly.channels)) {
    channels[id] = { ...c, status: sparse(c.status, 0), reason: sparse(c.reason, 0), coverage: sparse(c.coverage, 1) };
  }
  const limits: ReviewWire['hourly']['limits'] = {};
  for (const [id, c] of Object.entries(review.hourly.limits)) limits[id] = { ...c, status: sparse(c.status, 0), reason: sparse(c.reason, 0) };
  return { ...review, hourly: { ...review.hourly, channels, limits } };
}

/**
 * Six local days of Berlin around the end of summer time for the NOx daily limit (`noxLimit`: ELV
 * 100 mg/Nm3, judged at 110 %, confidence interval 20 % of the ELV), invented figures:
 * - Sat 24 Oct: valid, 95.3 measured;
 * - Sun 25 Oct: 25 clock hours (CEST ends at 01:00 UTC, Directive 2000/84/EC art. 2 [memory]),
 *   valid, 134.8 measured, above 110 after the interval too;
 * - Mon 26 Oct: valid, 125.0 measured but 105.0 validated: above 110 only without the interval;
 * - Tue 27 Oct: nothing stored for the limit;
 * - Wed 28 Oct: the unit did not run;
 * - Thu 29 Oct: not valid (12 invalid hours).
 * Validated = measured − `confidenceIntervalMgPerNm3` (every hour lies above the interval, so no
 * hour is floored at 0 and the day's mean moves by the interval itself; IED 2010/75/EU Annex V
 * Part 3 point 10, see REFERENCES.md §5). With 0 the API sends the measured value as validated.
 */
export function dailyAcrossDstFixture(confidenceIntervalMgPerNm3 = 20): ReviewDaily {
  const measured: Column = [95.3, 134.8, 125.0, null, null, 88.0];
  const legend = emptyDailyFixture.statusLegend;
  return {
    dayStart: ['2026-10-23T22:00:00.000Z', '2026-10-24T22:00:00.000Z', '2026-10-25T23:00:00.000Z', '2026-10-26T23:00:00.000Z', '2026-10-27T23:00:00.000Z', '2026-10-28T23:00:00.000Z'],
    dayEnd: ['2026-10-24T22:00:00.000Z', '2026-10-25T23:00:00.000Z', '2026-10-26T23:00:00.000Z', '2026-10-27T23:00:00.000Z', '2026-10-28T23:00:00.000Z', '2026-10-29T23:00:00.000Z'],
    statusLegend: legend,
    channels: {},
    limits: {
      'lim-nox-day': {
        value: measured,
        validatedValue: measured.map((v) => (v === null ? null : v - confidenceIntervalMgPerNm3)),
        status: [code(legend, 'valid'), code(legend, 'valid'), code(legend, 'valid'), null, code(legend, 'not_operating'), code(legend, 'invalid')],
        validHours: [24, 25, 24, null, 0, 12],
        invalidHours: [0, 0, 0, null, 0, 12],
      },
    },
  };
}
