import { formatZoned, zoneShortName, monthKeyOf, shiftMonth, zonedMidnight, zonedMonthRange } from './zoned-time';

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

  // Abbreviations as the IANA/CLDR data name them (Central European and US Mountain time).
  it('names European and North American zones, in winter and in summer', () => {
    expect(formatZoned('2026-11-01T13:00:00Z', 'Europe/Berlin')).toBe('1 Nov 2026, 14:00 CET');
    expect(formatZoned('2026-07-01T12:00:00Z', 'Europe/Berlin')).toBe('1 Jul 2026, 14:00 CEST');
    expect(formatZoned('2026-11-01T19:00:00Z', 'America/Denver')).toBe('1 Nov 2026, 12:00 MST');
    expect(formatZoned('2026-07-01T18:00:00Z', 'America/Denver')).toBe('1 Jul 2026, 12:00 MDT');
  });

  it('falls back to the offset where no abbreviation is in common use', () => {
    expect(zoneShortName(Date.UTC(2026, 0, 1), 'Asia/Singapore')).toBe('GMT+8');
    expect(zoneShortName(Date.UTC(2026, 0, 1), 'UTC')).toBe('UTC');
  });
});
