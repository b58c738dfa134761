import { formatZoned, monthKeyOf, shiftMonth, zonedMidnight, zonedMonthRange } from './zoned-time';

describe('zoned time', () => {
  // Central European Time is UTC+1, summer time UTC+2; summer time ends on the last Sunday of
  // October at 03:00 local (EU Directive 2000/84/EC, Art. 2–3), i.e. 2026-10-25.
  it('finds local midnight in winter and in summer time', () => {
    expect(zonedMidnight(2026, 11, 1, 'Europe/Berlin').toISOString()).toBe('2026-10-31T23:00:00.000Z');
    expect(zonedMidnight(2026, 10, 1, 'Europe/Berlin').toISOString()).toBe('2026-09-30T22:00:00.000Z');
  });

  it('gives the October that holds the DST change 745 hours', () => {
    const { from, to } = zonedMonthRange('2026-10', 'Europe/Berlin');
    expect((to.getTime() - from.getTime()) / 3_600_000).toBe(31 * 24 + 1);
  });

  it('puts an instant in the month of the site calendar, not of UTC', () => {
    expect(monthKeyOf('2026-10-31T23:30:00Z', 'Europe/Berlin')).toBe('2026-11');
    expect(monthKeyOf('2026-10-31T23:30:00Z', 'UTC')).toBe('2026-10');
    expect(monthKeyOf('2026-11-01T03:00:00Z', 'America/Chicago')).toBe('2026-10');
  });

  it('steps across a year boundary', () => {
    expect(shiftMonth('2026-12', 1)).toBe('2027-01');
    expect(shiftMonth('2026-01', -1)).toBe('2025-12');
  });

  it('shows the zone name beside the hour', () => {
    expect(formatZoned('2026-11-01T13:00:00Z', 'Europe/Berlin')).toMatch(/1 Nov 2026.*14:00.*(CET|GMT\+1)/);
    expect(formatZoned(null, 'UTC')).toBe('—');
  });
});
