import fc from 'fast-check';
import { WIRE_SIGNIFICANT_DIGITS, toWirePrecision } from './wire-precision';

describe('toWirePrecision', () => {
  it('keeps 10 significant digits of a concentration, an O2 reading and a flow', () => {
    expect(toWirePrecision(66.19490863921483)).toBe(66.19490864);
    expect(toWirePrecision(3.797061794091458)).toBe(3.797061794);
    expect(toWirePrecision(-17.463272426143217)).toBe(-17.46327243);
    expect(toWirePrecision(50477.963455685924)).toBe(50477.96346);
  });

  it('keeps the significant digits of a trace concentration', () => {
    expect(toWirePrecision(0.000012345678912345)).toBe(0.00001234567891);
    expect(toWirePrecision(1.234567891234e-20)).toBe(1.234567891e-20);
  });

  it('drops only the decimals of a very large figure', () => {
    expect(toWirePrecision(98765432109.87)).toBe(98765432110);
  });

  it('gives null for null and for anything not a finite number', () => {
    expect(toWirePrecision(null)).toBeNull();
    expect(toWirePrecision(Number.NaN)).toBeNull();
    expect(toWirePrecision(Number.POSITIVE_INFINITY)).toBeNull();
    expect(toWirePrecision('NaN' as unknown as number)).toBeNull();
  });

  it('leaves zero and whole values as they are', () => {
    expect(toWirePrecision(0)).toBe(0);
    expect(toWirePrecision(140)).toBe(140);
  });

  it('is written as a short decimal in JSON', () => {
    expect(JSON.stringify([toWirePrecision(137.97061794091454), toWirePrecision(4.492654485228643)])).toBe('[137.9706179,4.492654485]');
  });

  it('stays within half a unit of the last kept digit, for any finite value', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e8, max: 1e8 }), (value) => {
        const rounded = toWirePrecision(value)!;
        if (value === 0) return rounded === 0;
        const step = 10 ** (Math.floor(Math.log10(Math.abs(value))) - (WIRE_SIGNIFICANT_DIGITS - 1));
        // Half a step, plus the binary rounding of the result itself.
        return Math.abs(rounded - value) <= step / 2 + Math.abs(value) * Number.EPSILON * 4;
      }),
    );
  });
});
