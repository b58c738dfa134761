import { demoBoilerChannels, demoMonthEvents, demoMonthRows } from './demo-data';

const month = { year: 2026, month: 10, timeZone: 'Europe/Berlin' };

describe('demo month', () => {
  const rows = [...demoMonthRows(month)];
  const nox = demoBoilerChannels.findIndex((c) => c.parameter === 'NOx');

  it('has one row per minute of the local month, the repeated autumn hour included', () => {
    expect(rows).toHaveLength(31 * 1440 + 60);
    expect(new Date(rows[0]!.startUtcMs).toISOString()).toBe('2026-09-30T22:00:00.000Z');
    expect(new Date(rows.at(-1)!.startUtcMs + 60_000).toISOString()).toBe('2026-10-31T23:00:00.000Z');
    const repeated = rows.filter((r) => new Date(r.wallMs).toISOString().startsWith('2026-10-25T02:30'));
    expect(repeated).toHaveLength(2);
  });

  it('is the same for the same seed, and different for another', () => {
    const again = [...demoMonthRows(month)];
    expect(again.slice(0, 500)).toEqual(rows.slice(0, 500));
    const other = [...demoMonthRows({ ...month, seed: 7 })];
    expect(other[100]!.values).not.toEqual(rows[100]!.values);
  });

  it('carries a calibration hour, an analyser outage, a spike and text cells where it says', () => {
    const events = demoMonthEvents(month);
    expect(events.dstRepeatedHour).toBe('2026-10-25 02:00–02:59');
    expect(rows.filter((r) => r.status === 'calibration')).toHaveLength(60);
    const outage = rows.filter((r) => r.status === 'fault');
    expect(outage.length).toBe(165);
    expect(outage.every((r) => r.values[nox] === null)).toBe(true);
    const peak = Math.max(...rows.filter((r) => r.status === 'valid').map((r) => r.values[nox] as number));
    expect(peak).toBeGreaterThan(200);
    expect(rows.flatMap((r) => r.values).filter((v) => v === '----')).toHaveLength(5);
  });

  it('keeps ordinary NOx in a gas boiler’s usual range (common practice: low-NOx burner, tens of mg/Nm3)', () => {
    const valid = rows.filter((r) => r.status === 'valid').map((r) => r.values[nox] as number).sort((a, b) => a - b);
    const median = valid[Math.floor(valid.length / 2)]!;
    expect(median).toBeGreaterThan(50);
    expect(median).toBeLessThan(90);
  });
});
