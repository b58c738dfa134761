import { emptyHourlyFixture, hourlyFixture, reviewFixture } from './testing/review-fixtures';
import { dailyPoints, hasValues, hourRows, hourlyPoints, invalidRanges } from './review-series';

const hourMs = 3_600_000;
const first = Date.parse('2026-10-31T23:00:00Z');

describe('review series (the API columns read for the table and the chart)', () => {
  it('gives the table one row per hour, decoded through the legends', () => {
    const rows = hourRows(reviewFixture(), 'ch-nox', ['lim-nox-day']);
    expect(rows).toHaveLength(48);
    expect(rows[0]).toEqual({
      hourStart: '2026-10-31T23:00:00.000Z',
      channels: { 'ch-nox': { value: 60, status: 'valid', coverage: 1, reason: null } },
      limits: { 'lim-nox-day': { value: 61, status: 'valid', reason: null } },
    });
    expect(rows[5].hourStart).toBe('2026-11-01T04:00:00.000Z');
    expect(rows[5].channels['ch-nox']).toEqual({ value: null, status: 'invalid', coverage: 0.2, reason: 'fault' });
    // Only the channel asked for: the O2 channel's columns stay out of the rows.
    expect(rows[0].channels['ch-o2']).toBeUndefined();
  });

  it('leaves out the entry of an hour with no stored value', () => {
    const review = reviewFixture();
    review.hourly.channels['ch-nox'].status[7] = null;
    review.hourly.channels['ch-nox'].value[7] = null;
    const rows = hourRows(review, 'ch-nox', []);
    expect(rows[7].channels['ch-nox']).toBeUndefined();
    expect(rows[8].channels['ch-nox']).toMatchObject({ value: 68, status: 'valid' });
  });

  it('puts each hour on the chart at its start, with NaN (a gap) where there is no value', () => {
    const hourly = hourlyFixture(6);
    const points = hourlyPoints(hourly, hourly.channels['ch-nox'].value);
    expect(points.map((p) => p.x)).toEqual([0, 1, 2, 3, 4, 5].map((i) => first + i * hourMs));
    expect(points.slice(0, 5).map((p) => p.y)).toEqual([60, 61, 62, 63, 64]);
    expect(points[5].y).toBeNaN();
    expect(hourlyPoints(hourly, undefined).every((p) => Number.isNaN(p.y))).toBe(true);
  });

  it('places daily averages at the start of each local day', () => {
    expect(dailyPoints(reviewFixture(), 'lim-nox-day')).toEqual([
      { x: Date.parse('2026-10-31T23:00:00.000Z'), y: 72.4 },
      { x: Date.parse('2026-11-01T23:00:00.000Z'), y: 121.5 },
    ]);
  });

  it('joins consecutive hours that are not valid into one shaded run', () => {
    const review = reviewFixture();
    const invalid = review.hourly.statusLegend.indexOf('invalid');
    review.hourly.limits['lim-nox-day'].status[6] = invalid;
    review.hourly.limits['lim-nox-day'].status[9] = invalid;
    expect(invalidRanges(review, 'ch-nox', 'lim-nox-day')).toEqual([
      [first + 5 * hourMs, first + 7 * hourMs],
      [first + 9 * hourMs, first + 10 * hourMs],
    ]);
    expect(invalidRanges(review, null, null)).toEqual([]);
  });

  it('knows whether any channel has a value', () => {
    expect(hasValues(reviewFixture())).toBe(true);
    expect(hasValues(reviewFixture({ hourly: emptyHourlyFixture('2026-10-31T23:00:00Z', 720) }))).toBe(false);
  });
});
