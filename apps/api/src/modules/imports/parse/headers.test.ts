import { headerHints, looksLikeStatusHeader, looksLikeTimestampHeader, normaliseHeader } from './headers';

describe('headerHints', () => {
  it.each([
    ['NOx [mg/Nm3] dry', 'NOx', 'mg/Nm3', 'dry'],
    ['NOₓ (mg/Nm³)', 'NOx', 'mg/Nm3', null],
    ['SO2 mg/m³ i.N. tr.', 'SO2', 'mg/Nm3', 'dry'],
    ['CO2 [Vol.-%]', 'CO2', '%', null],
    ['CO [ppm]', 'CO', 'ppm', null],
    ['O2 [%] dry', 'O2', '%', 'dry'],
    ['NO2 [mg/Nm3]', 'NO2', 'mg/Nm3', null],
    ['NO [ppm]', 'NO', 'ppm', null],
    ['H2O [%]', 'H2O', '%', null],
    ['Flue gas flow [Nm3/h]', 'flow', 'Nm3/h', null],
    ['Fuel flow [kg/h]', 'fuel_flow', 'kg/h', null],
    ['Temp °C', 'temperature', 'degC', null],
    ['Stack flow [scfh]', 'flow', 'scfh', null],
    ['Stack temp °F', 'temperature', 'degF', null],
    ['Dust [mg/Nm3]', 'dust', 'mg/Nm3', null],
    ['Hg [µg/Nm3]', 'Hg', 'ug/Nm3', null],
    ['Load [MW]', 'load', 'MW', null],
    ['K2_SO2', 'SO2', null, null],
    ['Analyser 1 value', null, null, null],
  ])('reads %s', (header, parameter, unit, basis) => {
    expect(headerHints(header)).toMatchObject({ parameter, unit, basis });
  });

  it('normalises case, superscripts and spacing into one key', () => {
    expect(normaliseHeader('  NOx  [mg/Nm³] ')).toBe(normaliseHeader('nox [mg/nm3]'));
  });

  it('recognises timestamp and status headers', () => {
    expect(looksLikeTimestampHeader('time stamp')).toBe(true);
    expect(looksLikeTimestampHeader('datum/uhrzeit')).toBe(true);
    expect(looksLikeTimestampHeader('nox [mg/nm3]')).toBe(false);
    expect(looksLikeStatusHeader('status')).toBe(true);
    expect(looksLikeStatusHeader('nox status value')).toBe(false);
  });
});
