import { hourStatusAt, hourlySeriesFromValues, hourlyValuesFromSeries } from './series';

const H = 3_600_000;

describe('hourly values from stored rows', () => {
  it('builds a sorted column series from rows (t, value, status, coverage) and back', () => {
    const rows = [
      { t: 2 * H, value: 70, status: 'substituted' as const, coverage: 1 },
      { t: 0, value: 80, status: 'valid' as const, coverage: 0.95 },
      { t: H, value: null, status: 'invalid' as const, coverage: 0.2, reason: 'fault' as const },
    ];
    const s = hourlySeriesFromValues(rows);
    expect(Array.from(s.t)).toEqual([0, H, 2 * H]);
    expect(hourStatusAt(s, 1)).toBe('invalid');
    const back = hourlyValuesFromSeries(s);
    expect(back.map((r) => [r.t, r.value, r.status, r.coverage, r.reason])).toEqual([
      [0, 80, 'valid', 0.95, null],
      [H, null, 'invalid', 0.2, 'fault'],
      [2 * H, 70, 'substituted', 1, null],
    ]);
  });

  it('refuses duplicate hours, unknown statuses and valid rows without a number', () => {
    expect(() => hourlySeriesFromValues([{ t: 0, value: 1, status: 'valid' }, { t: 0, value: 2, status: 'valid' }])).toThrow(/share the start/);
    expect(() => hourlySeriesFromValues([{ t: 0, value: 1, status: 'ok' as never }])).toThrow(/unknown status "ok"/);
    expect(() => hourlySeriesFromValues([{ t: 0, value: null, status: 'valid' }])).toThrow(/marked valid but has no number/);
  });
});
