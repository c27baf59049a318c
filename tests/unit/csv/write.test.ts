import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { csvField, neutraliseFormula, toCsv } from '@/lib/csv/write';

describe('CSV (RFC 4180) with formula neutralising', () => {
  it.each([
    ['plain', 'Polar A', 'Polar A'],
    ['comma quoted', 'Polar, A', '"Polar, A"'],
    ['quotes doubled', 'The "B" fleet', '"The ""B"" fleet"'],
    ['line break quoted', 'two\nlines', '"two\nlines"'],
    ['leading space kept by quoting', ' padded', '" padded"'],
    ['formula =', '=1+2', "'=1+2"],
    ['formula +', '+1', "'+1"],
    ['formula -', '-1+1', "'-1+1"],
    ['formula @', '@SUM(A1)', "'@SUM(A1)"],
    ['tab start', '\tcmd', "'\tcmd"],
    ['formula with comma', '=HYPERLINK("x","y")', `"'=HYPERLINK(""x"",""y"")"`],
  ])('%s', (_label, input, expected) => {
    expect(csvField(input)).toBe(expected);
  });

  it('numbers are written plainly, negative numbers untouched, null empty', () => {
    expect(csvField(-0.046)).toBe('-0.046');
    expect(csvField(0.1 + 0.2)).toBe('0.3');
    expect(csvField(1234567)).toBe('1234567');
    expect(csvField(null)).toBe('');
    expect(csvField(Number.NaN)).toBe('');
    expect(neutraliseFormula('Fleet = A')).toBe('Fleet = A');
  });

  it('ends every record with CRLF and round-trips through papaparse', () => {
    const rows = [
      ['=cmd|" /C calc"!A0', 1, null],
      ['Line\r\nbreak, "quoted"', 2.5, -3],
    ];
    const text = toCsv(['name', 'a', 'b'], rows);
    expect(text.endsWith('\r\n')).toBe(true);
    expect(text.split('\r\n')[0]).toBe('name,a,b');
    const parsed = Papa.parse<string[]>(text, { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toEqual([
      ['name', 'a', 'b'],
      [`'=cmd|" /C calc"!A0`, '1', ''],
      ['Line\r\nbreak, "quoted"', '2.5', '-3'],
    ]);
  });
});
