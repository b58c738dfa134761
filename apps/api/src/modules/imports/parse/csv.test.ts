import { detectDelimiter, readCsv } from './csv';

function rows(text: string, delimiter: ',' | ';' | '\t'): string[][] {
  const out: string[][] = [];
  readCsv(text, delimiter, (fields) => out.push(fields));
  return out;
}

describe('CSV reading', () => {
  it('detects semicolons in a file with decimal commas', () => {
    expect(detectDelimiter('Zeit;NOx;O2\r\n01.10.2026 00:01;61,5;3,2\r\n01.10.2026 00:02;62,5;3,3\r\n')).toBe(';');
  });

  it('detects commas and tabs', () => {
    expect(detectDelimiter('Time,NOx\n2026-10-01 00:01,61.5\n2026-10-01 00:02,62\n')).toBe(',');
    expect(detectDelimiter('Time\tNOx\n2026-10-01 00:01\t61.5\n')).toBe('\t');
  });

  it('keeps quoted delimiters, line breaks and doubled quotes inside a field (RFC 4180 §2)', () => {
    expect(rows('a;"b;c";"say ""hi"""\n"two\nlines";x;y\n', ';')).toEqual([
      ['a', 'b;c', 'say "hi"'],
      ['two\nlines', 'x', 'y'],
    ]);
  });

  it('handles CRLF and a last line without a line break', () => {
    expect(rows('a,b\r\n1,2', ',')).toEqual([['a', 'b'], ['1', '2']]);
  });
});
