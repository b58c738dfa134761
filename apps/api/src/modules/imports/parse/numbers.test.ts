import { parseDecimalText } from './numbers';

describe('parseDecimalText', () => {
  it.each([
    ['12.5', 12.5],
    ['12,5', 12.5],
    ['-0,03', -0.03],
    ['+7', 7],
    ['1.5E-3', 0.0015],
    ['1,234.5', 1234.5],
    ['1.234,5', 1234.5],
    ['1 234,5', 1234.5],
    ['1\u00a0234,5', 1234.5],
    [' 42 ', 42],
    [',5', 0.5],
  ])('reads %s as %d', (text, value) => {
    expect(parseDecimalText(text)).toBe(value);
  });

  it.each(['', 'n/a', '----', '#N/A', '12.5.3', '1,2,3', 'NaN', 'Infinity', '12 mg'])('refuses %j', (text) => {
    expect(parseDecimalText(text)).toBeNull();
  });
});
