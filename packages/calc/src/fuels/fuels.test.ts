import { CalcInputError } from '../errors';
import { fuelElements, ultimateAnalysisOf, validateFuel } from './index';

describe('validateFuel', () => {
  it('accepts a composition summing to 100 ± 0.5 %', () => {
    expect(() => validateFuel({ kind: 'gas', composition: { CH4: 95, N2: 4.6 } })).not.toThrow();
  });
  it.each([
    [{ kind: 'gas', composition: { CH4: 99 } }, /sums to 99.00/],
    [{ kind: 'gas', composition: { CH4: 101, N2: -1 } }, /at least 0/],
    [{ kind: 'gas', composition: { CH4: 90, Ar: 10 } }, /Unknown gas component "Ar"/],
    [{ kind: 'gas', composition: { N2: 100 } }, /nothing combustible/],
    [{ kind: 'solid', ultimate: { C: 70, H: 5, O: 5, N: 1, S: 1, moisture: 10, ash: 5 } }, /sums to 97.00/],
    [{ kind: 'liquid', ultimate: { C: 86, H: 13, O: 0, N: 0, S: 1, moisture: 0, ash: 0 }, gcvMJPerKg: 0 }, /above 0 MJ\/kg/],
  ])('rejects %j', (fuel, message) => {
    expect(() => validateFuel(fuel as never)).toThrow(CalcInputError);
    expect(() => validateFuel(fuel as never)).toThrow(message);
  });
});

describe('fuelElements / ultimateAnalysisOf', () => {
  it('gives methane 74.87 % C and 25.13 % H by mass', () => {
    // 12.011/16.043 and 4.032/16.043 [derived from IUPAC atomic weights]
    const u = ultimateAnalysisOf({ kind: 'gas', composition: { CH4: 100 } });
    expect(u.C).toBeCloseTo(74.87, 2);
    expect(u.H).toBeCloseTo(25.13, 2);
  });
  it('counts 1/22.414 kmol of gas per Nm3', () => {
    const e = fuelElements({ kind: 'gas', composition: { CH4: 100 } });
    expect(e.C).toBeCloseTo(1 / 22.414, 6);
    expect(e.H).toBeCloseTo(4 / 22.414, 6);
  });
});
