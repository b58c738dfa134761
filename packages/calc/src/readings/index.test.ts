import { READING_STATUSES, ReadingStatusCode, toReadingColumns } from './index';

describe('toReadingColumns', () => {
  it('turns reading objects into columns, null values into NaN', () => {
    const c = toReadingColumns([
      { t: 0, value: 5, status: 'valid' },
      { t: 60_000, value: null, status: 'fault' },
    ]);
    expect(Array.from(c.t)).toEqual([0, 60_000]);
    expect(c.value[0]).toBe(5);
    expect(Number.isNaN(c.value[1]!)).toBe(true);
    expect(Array.from(c.status)).toEqual([ReadingStatusCode.valid, ReadingStatusCode.fault]);
  });

  it('numbers each status by its place in READING_STATUSES', () => {
    READING_STATUSES.forEach((s, i) => expect(ReadingStatusCode[s]).toBe(i));
  });

  it('refuses an unknown status or a missing timestamp, naming the reading', () => {
    expect(() => toReadingColumns([{ t: 0, value: 1, status: 'ok' as never }])).toThrow(/Reading 0 has an unknown status "ok"/);
    expect(() => toReadingColumns([{ t: Number.NaN, value: 1, status: 'valid' }])).toThrow(/Reading 0 has no valid timestamp/);
  });
});
