import { LocalTimeConverter, excelSerialToWallMs, wallMsToExcelSerial } from './local-time';

describe('excelSerialToWallMs', () => {
  // ECMA-376 Part 1, §18.17.4.1: 1900 system day 1 = 1900-01-01, day 60 = the non-existent
  // 1900-02-29, day 61 = 1900-03-01; 1904 system day 0 = 1904-01-01.
  it.each([
    [1, Date.UTC(1900, 0, 1)],
    [59, Date.UTC(1900, 1, 28)],
    [61, Date.UTC(1900, 2, 1)],
    [2, Date.UTC(1900, 0, 2)],
  ])('reads 1900-system day %d', (serial, wallMs) => {
    expect(excelSerialToWallMs(serial)).toBe(wallMs);
  });

  it('refuses day 60, the 29 February 1900 that never was', () => {
    expect(excelSerialToWallMs(60)).toBeNull();
  });

  it('reads the 1904 system from its own base', () => {
    expect(excelSerialToWallMs(0, true)).toBe(Date.UTC(1904, 0, 1));
    expect(excelSerialToWallMs(1.5, true)).toBe(Date.UTC(1904, 0, 2, 12));
  });

  it('reads 45658 as 2025-01-01 [memory: the serial Excel shows for that date]', () => {
    expect(excelSerialToWallMs(45658)).toBe(Date.UTC(2025, 0, 1));
  });

  it('rounds the binary fraction of a minute to the nearest second', () => {
    // 10:01 is 601/1440 of a day, which a double cannot hold exactly.
    expect(excelSerialToWallMs(45658 + 601 / 1440)).toBe(Date.UTC(2025, 0, 1, 10, 1));
    expect(excelSerialToWallMs(wallMsToExcelSerial(Date.UTC(2026, 9, 25, 2, 59)))).toBe(Date.UTC(2026, 9, 25, 2, 59));
  });
});

describe('LocalTimeConverter', () => {
  // EU summer time (Directive 2000/84/EC, Arts. 2 and 3) begins and ends at 01:00 UTC on the last
  // Sunday of March and of October: 29 March and 25 October 2026. Berlin is UTC+1, in summer UTC+2.
  const berlin = new LocalTimeConverter('Europe/Berlin');

  it('places an ordinary summer time at UTC+2 and a winter time at UTC+1', () => {
    expect(berlin.toUtc(Date.UTC(2026, 6, 1, 12, 0))).toEqual({ kind: 'unique', utcMs: Date.UTC(2026, 6, 1, 10, 0), offsetMinutes: 120 });
    expect(berlin.toUtc(Date.UTC(2026, 11, 1, 12, 0))).toEqual({ kind: 'unique', utcMs: Date.UTC(2026, 11, 1, 11, 0), offsetMinutes: 60 });
  });

  it('reports the hour the clock skips in spring as missing', () => {
    expect(berlin.toUtc(Date.UTC(2026, 2, 29, 2, 0))).toEqual({ kind: 'missing' });
    expect(berlin.toUtc(Date.UTC(2026, 2, 29, 2, 59))).toEqual({ kind: 'missing' });
    expect(berlin.toUtc(Date.UTC(2026, 2, 29, 3, 0))).toMatchObject({ kind: 'unique', utcMs: Date.UTC(2026, 2, 29, 1, 0) });
    expect(berlin.toUtc(Date.UTC(2026, 2, 29, 1, 59))).toMatchObject({ kind: 'unique', utcMs: Date.UTC(2026, 2, 29, 0, 59) });
  });

  it('reports the hour the clock repeats in autumn as ambiguous, with both instants', () => {
    expect(berlin.toUtc(Date.UTC(2026, 9, 25, 2, 0))).toEqual({ kind: 'ambiguous', earlierUtcMs: Date.UTC(2026, 9, 25, 0, 0), laterUtcMs: Date.UTC(2026, 9, 25, 1, 0) });
    expect(berlin.toUtc(Date.UTC(2026, 9, 25, 2, 59))).toMatchObject({ kind: 'ambiguous' });
    expect(berlin.toUtc(Date.UTC(2026, 9, 25, 3, 0))).toMatchObject({ kind: 'unique', utcMs: Date.UTC(2026, 9, 25, 2, 0) });
  });

  it('handles a zone without daylight saving time', () => {
    const utc = new LocalTimeConverter('UTC');
    expect(utc.toUtc(Date.UTC(2026, 9, 25, 2, 30))).toMatchObject({ kind: 'unique', utcMs: Date.UTC(2026, 9, 25, 2, 30) });
  });

  it('refuses an unknown zone', () => {
    expect(() => new LocalTimeConverter('Mars/Olympus')).toThrow(/Unknown time zone/);
  });
});
