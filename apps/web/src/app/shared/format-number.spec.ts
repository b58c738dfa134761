import { formatInUnit, formatNumber } from './format-number';
import { analyserRangeLabel } from './setup-labels';

describe('formatNumber', () => {
  it('groups thousands and keeps a fixed count of decimals when asked', () => {
    expect(formatNumber(1234.5678)).toBe('1,234.568');
    expect(formatNumber(7.1, 2, 2)).toBe('7.10');
    expect(formatNumber(null)).toBe('—');
  });
});

describe('formatInUnit', () => {
  it('reads lb/MMBtu to three decimals and mg/Nm3 to one', () => {
    // An ELV of 0.2 lb/MMBtu: with one decimal 0.153 and 0.213 would both read as the ELV.
    expect(formatInUnit(0.1534, 'lb/MMBtu')).toBe('0.153');
    expect(formatInUnit(0.2134, 'lb/MMBtu')).toBe('0.213');
    expect(formatInUnit(7.1, 'mg/Nm3')).toBe('7.1');
    expect(formatInUnit(68, 'mg/Nm3')).toBe('68.0');
    expect(formatInUnit(98_432.4, 'Nm3/h')).toBe('98,432');
  });
});

describe('analyserRangeLabel', () => {
  it('groups the thousands of a flow range', () => {
    expect(analyserRangeLabel({ unit: 'Nm3/h', rangeMin: 0, rangeMax: 120000 })).toBe('0 – 120,000 Nm3/h');
  });
});
