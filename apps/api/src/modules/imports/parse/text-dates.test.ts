import { parseTextTimestamp, settleDayMonthOrder } from './text-dates';

describe('parseTextTimestamp', () => {
  it.each([
    ['2026-10-25 02:30', Date.UTC(2026, 9, 25, 2, 30)],
    ['2026-10-25T02:30:15', Date.UTC(2026, 9, 25, 2, 30, 15)],
    ['2026/10/25 02:30', Date.UTC(2026, 9, 25, 2, 30)],
    ['25.10.2026 02:30', Date.UTC(2026, 9, 25, 2, 30)],
    ['25.10.2026', Date.UTC(2026, 9, 25)],
    ['5.3.2026 7:05', Date.UTC(2026, 2, 5, 7, 5)],
    ['25/10/2026 02:30:00', Date.UTC(2026, 9, 25, 2, 30)],
    ['25-10-2026 02:30', Date.UTC(2026, 9, 25, 2, 30)],
    ['31.12.2026 24:00', Date.UTC(2027, 0, 1)],
  ])('reads %s as a wall-clock time', (text, wallMs) => {
    expect(parseTextTimestamp(text, 'day_first')).toEqual({ kind: 'wall', wallMs });
  });

  it('reads month-first dates with AM/PM when told the column is month-first', () => {
    expect(parseTextTimestamp('10/25/2026 2:30 PM', 'month_first')).toEqual({ kind: 'wall', wallMs: Date.UTC(2026, 9, 25, 14, 30) });
    expect(parseTextTimestamp('10/25/2026 12:05 AM', 'month_first')).toEqual({ kind: 'wall', wallMs: Date.UTC(2026, 9, 25, 0, 5) });
  });

  it('reads an ISO time with Z or an offset as an exact instant', () => {
    expect(parseTextTimestamp('2026-10-25T00:30:00Z', 'day_first')).toEqual({ kind: 'instant', utcMs: Date.UTC(2026, 9, 25, 0, 30) });
    expect(parseTextTimestamp('2026-10-25 02:30+02:00', 'day_first')).toEqual({ kind: 'instant', utcMs: Date.UTC(2026, 9, 25, 0, 30) });
  });

  it('says why an impossible date or time is not one', () => {
    expect(parseTextTimestamp('31.02.2026 10:00', 'day_first')).toEqual({ kind: 'invalid', reason: 'day 31 does not exist in month 2 of 2026' });
    expect(parseTextTimestamp('2026-10-25 25:10', 'day_first')).toMatchObject({ kind: 'invalid' });
    expect(parseTextTimestamp('10/25/2026 10:00', 'day_first')).toEqual({ kind: 'invalid', reason: 'month 25 does not exist' });
  });

  it('returns null for text that is no timestamp', () => {
    expect(parseTextTimestamp('Average', 'day_first')).toBeNull();
    expect(parseTextTimestamp('12.5', 'day_first')).toBeNull();
  });
});

describe('settleDayMonthOrder', () => {
  it('lets a day above 12 settle the whole column', () => {
    expect(settleDayMonthOrder(['01/10/2026 00:01', '13/10/2026 00:01'], 'US')).toEqual({ order: 'day_first', settledBy: 'data' });
    expect(settleDayMonthOrder(['10/01/2026 00:01', '10/13/2026 00:01'], 'DE')).toEqual({ order: 'month_first', settledBy: 'data' });
  });

  it('falls back to the site country when no value settles it', () => {
    expect(settleDayMonthOrder(['01/10/2026', '02/10/2026'], 'US')).toEqual({ order: 'month_first', settledBy: 'site' });
    expect(settleDayMonthOrder(['01/10/2026', '02/10/2026'], 'GB')).toEqual({ order: 'day_first', settledBy: 'site' });
  });

  it('says when a column mixes both orders', () => {
    expect(settleDayMonthOrder(['13/10/2026', '10/13/2026'], 'DE').settledBy).toBe('contradictory');
  });
});
