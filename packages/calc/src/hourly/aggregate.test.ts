import fc from 'fast-check';
import type { Reading, ReadingStatus } from '../readings';
import { aggregateHours } from './aggregate';
import { hourStatusAt, hourlyValuesFromSeries } from './series';

const MIN = 60_000;
const T0 = Date.UTC(2026, 0, 5); // an hour boundary

/** One reading per minute of one hour; `statusAt(minute)` decides each status. */
function hourOfMinutes(value: (m: number) => number, statusAt: (m: number) => ReadingStatus = () => 'valid'): Reading[] {
  return Array.from({ length: 60 }, (_, m) => ({ t: T0 + m * MIN, value: value(m), status: statusAt(m) }));
}

describe('aggregateHours', () => {
  describe('15-minute quadrant rule (40 CFR 60.13(h)(2) and 75.10(d)(1): one valid reading in each quadrant the unit operated [memory on the exact wording])', () => {
    it('makes an hour with one valid reading in each quadrant valid, averaging the valid readings', () => {
      // Only minutes 5, 20, 35, 50 valid; the rest analyser fault.
      const valid = new Set([5, 20, 35, 50]);
      const h = aggregateHours(hourOfMinutes((m) => m, (m) => (valid.has(m) ? 'valid' : 'fault')), { intervalMinutes: 1 });
      expect(hourStatusAt(h, 0)).toBe('valid');
      expect(h.value[0]).toBeCloseTo((5 + 20 + 35 + 50) / 4, 12);
      expect(h.validCount[0]).toBe(4);
      expect(h.coverage[0]).toBeCloseTo(4 / 60, 12);
    });

    it('makes an hour with a quadrant lacking valid data invalid, naming the cause', () => {
      // Minutes 30–44 (the third quadrant) are analyser fault.
      const h = aggregateHours(hourOfMinutes(() => 80, (m) => (m >= 30 && m < 45 ? 'fault' : 'valid')), { intervalMinutes: 1 });
      expect(hourStatusAt(h, 0)).toBe('invalid');
      expect(hourlyValuesFromSeries(h)[0]!.reason).toBe('fault');
      // With 45 of 60 minutes valid the same hour passes a 2/3 share rule (common practice, [memory]).
      const share = aggregateHours(hourOfMinutes(() => 80, (m) => (m >= 30 && m < 45 ? 'fault' : 'valid')), { rule: { kind: 'min-share', share: 2 / 3 }, intervalMinutes: 1 });
      expect(hourStatusAt(share, 0)).toBe('valid');
    });

    it('needs no data in quadrants in which the unit did not operate (partial operating hour)', () => {
      const h = aggregateHours(hourOfMinutes(() => 70, (m) => (m < 30 ? 'not-operating' : m === 40 || m === 50 ? 'valid' : 'fault')), { intervalMinutes: 1 });
      expect(hourStatusAt(h, 0)).toBe('valid');
      expect(h.value[0]).toBe(70);
    });

    it('counts a quadrant without any reading as operated (missing data is not a stop)', () => {
      const readings = hourOfMinutes(() => 70).filter((r) => r.t < T0 + 45 * MIN);
      const h = aggregateHours(readings, { intervalMinutes: 1, from: T0, to: T0 + 60 * MIN });
      expect(hourStatusAt(h, 0)).toBe('invalid');
      expect(hourlyValuesFromSeries(h)[0]!.reason).toBe('quadrant-missing');
    });

    it('in a calibration hour needs two valid readings at least 15 minutes apart (40 CFR 60.13(h)(2)(iii) [memory])', () => {
      const two = new Set([2, 20]);
      const ok = aggregateHours(hourOfMinutes(() => 60, (m) => (two.has(m) ? 'valid' : 'calibration')), { intervalMinutes: 1 });
      expect(hourStatusAt(ok, 0)).toBe('valid');
      const close = new Set([2, 10]);
      const bad = aggregateHours(hourOfMinutes(() => 60, (m) => (close.has(m) ? 'valid' : 'calibration')), { intervalMinutes: 1 });
      expect(hourStatusAt(bad, 0)).toBe('invalid');
      expect(hourlyValuesFromSeries(bad)[0]!.reason).toBe('calibration');
      const strict = aggregateHours(hourOfMinutes(() => 60, (m) => (two.has(m) ? 'valid' : 'calibration')), { intervalMinutes: 1, rule: { kind: 'quadrants', qaHourVariant: false } });
      expect(hourStatusAt(strict, 0)).toBe('invalid');
    });
  });

  it('applies a minimum-count rule', () => {
    const r = hourOfMinutes(() => 10, (m) => (m % 20 === 0 ? 'valid' : 'maintenance'));
    expect(hourStatusAt(aggregateHours(r, { rule: { kind: 'min-count', count: 3 } }), 0)).toBe('valid');
    expect(hourStatusAt(aggregateHours(r, { rule: { kind: 'min-count', count: 4 } }), 0)).toBe('invalid');
  });

  it('marks hours not operating, start-up/shut-down and substituted', () => {
    const readings: Reading[] = [
      ...hourOfMinutes(() => 0, () => 'not-operating'),
      ...hourOfMinutes(() => 300, (m) => (m < 10 ? 'startup-shutdown' : 'valid')).map((r) => ({ ...r, t: r.t + 60 * MIN })),
      ...hourOfMinutes(() => 90, (m) => (m < 5 ? 'substituted' : 'valid')).map((r) => ({ ...r, t: r.t + 120 * MIN })),
    ];
    const h = aggregateHours(readings, { intervalMinutes: 1 });
    expect([0, 1, 2].map((i) => hourStatusAt(h, i))).toEqual(['not-operating', 'startup-shutdown', 'substituted']);
    expect(h.firstReading[2]).toBe(120);
    expect(h.lastReading[2]).toBe(179);
  });

  it('builds half-hours and 10-minute periods, and honours end-of-interval timestamps', () => {
    const readings = Array.from({ length: 60 }, (_, m) => ({ t: T0 + (m + 1) * MIN, value: m < 30 ? 10 : 20, status: 'valid' as const }));
    const half = aggregateHours(readings, { periodMinutes: 30, timestampMarks: 'end', intervalMinutes: 1 });
    expect(Array.from(half.t)).toEqual([T0, T0 + 30 * MIN]);
    expect(Array.from(half.value)).toEqual([10, 20]);
    const ten = aggregateHours(readings, { periodMinutes: 10, timestampMarks: 'end', intervalMinutes: 1 });
    expect(ten.t.length).toBe(6);
  });

  it('gives the same result from objects and columns, sorted or not', () => {
    const r = hourOfMinutes((m) => (m * 7) % 13, (m) => (m % 11 === 0 ? 'fault' : 'valid'));
    const a = aggregateHours(r, { intervalMinutes: 1 });
    const b = aggregateHours([...r].reverse(), { intervalMinutes: 1 });
    expect(b.value[0]).toBeCloseTo(a.value[0]!, 12);
    expect(b.status[0]).toBe(a.status[0]);
  });

  it('refuses a period that does not divide a day', () => {
    expect(() => aggregateHours([], { periodMinutes: 7 })).toThrow(/periodMinutes/);
  });

  describe('properties (fast-check)', () => {
    it('a constant series gives that constant for every valid hour', () => {
      fc.assert(
        fc.property(fc.double({ min: 0, max: 5000, noNaN: true }), fc.integer({ min: 1, max: 5 }), fc.constantFrom(1, 5, 15), (c, hours, step) => {
          const readings: Reading[] = [];
          for (let t = T0; t < T0 + hours * 60 * MIN; t += step * MIN) readings.push({ t, value: c, status: 'valid' });
          const h = aggregateHours(readings, { intervalMinutes: step });
          expect(h.t.length).toBe(hours);
          for (let i = 0; i < hours; i++) {
            expect(hourStatusAt(h, i)).toBe('valid');
            expect(h.value[i]).toBeCloseTo(c, 9);
          }
        }),
      );
    });

    it('adding an invalid reading never changes a valid average', () => {
      const invalidStatus = fc.constantFrom<ReadingStatus>('fault', 'calibration', 'maintenance', 'out-of-range', 'not-operating');
      fc.assert(
        fc.property(
          fc.array(fc.double({ min: 0, max: 1000, noNaN: true }), { minLength: 60, maxLength: 60 }),
          fc.integer({ min: 0, max: 59 }),
          fc.option(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { nil: null }),
          invalidStatus,
          (values, minute, extraValue, status) => {
            const base = values.map((v, m) => ({ t: T0 + m * MIN, value: v, status: 'valid' as const }));
            const before = aggregateHours(base, { intervalMinutes: 1, rule: { kind: 'min-share', share: 2 / 3 } });
            const after = aggregateHours([...base, { t: T0 + minute * MIN + 30_000, value: extraValue, status }], {
              intervalMinutes: 1,
              rule: { kind: 'min-share', share: 2 / 3 },
            });
            expect(hourStatusAt(after, 0)).toBe('valid');
            expect(after.value[0]).toBe(before.value[0]);
          },
        ),
      );
    });
  });
});
