import { describe, expect, it } from 'vitest';
import { parseCsv, parseNumberCell } from '@/lib/imports/csv';
import { csvField as csvCell } from '@/lib/csv/write';

const COLUMNS = [{ name: 'a', required: true }, { name: 'b' }];

describe('parseCsv', () => {
  it('drops a BOM, reads headers case-insensitively and trimmed, and keys values by column', () => {
    const t = parseCsv('\uFEFF A ,B\n1, x \n', { columns: COLUMNS });
    expect(t.problems).toEqual([]);
    expect(t.columns).toEqual(['a', 'b']);
    expect(t.rows).toEqual([{ line: 2, values: { a: '1', b: 'x' } }]);
  });

  it('reports unknown and unnamed columns as warnings on the header line and ignores their values', () => {
    const t = parseCsv('a,Extra,,b\n1,2,3,4\n', { columns: COLUMNS });
    expect(t.problems).toEqual([]);
    expect(t.warnings.map((w) => [w.line, w.column])).toEqual([
      [1, 'extra'],
      [1, '(column 3)'],
    ]);
    expect(t.rows[0].values).toEqual({ a: '1', b: '4' });
  });

  it('counts lines with the header as line 1, across CRLF, blank lines and quoted values spanning lines', () => {
    const t = parseCsv('a,b\r\n1,x\r\n\r\n2,"two\r\nlines"\r\n3,y', { columns: COLUMNS });
    expect(t.problems).toEqual([]);
    expect(t.rows.map((r) => r.line)).toEqual([2, 4, 6]);
    expect(t.rows[1].values.b).toBe('two\nlines');
  });

  it('a missing required column, a repeated column, a ragged line and an unclosed quote are problems', () => {
    expect(parseCsv('b\n1\n', { columns: COLUMNS }).problems).toEqual([
      { line: 1, column: 'a', message: expect.stringContaining('"a"') },
    ]);
    expect(parseCsv('a,A\n1,2\n', { columns: COLUMNS }).problems).toEqual([
      { line: 1, column: 'a', message: expect.stringContaining('twice') },
    ]);
    const ragged = parseCsv('a,b\n1,2\n1,2,3\n4\n', { columns: COLUMNS });
    expect(ragged.problems.map((p) => p.line)).toEqual([3, 4]);
    expect(ragged.rows.map((r) => r.line)).toEqual([2]);
    const quote = parseCsv('a,b\n1,"open\n', { columns: COLUMNS });
    expect(quote.problems[0]).toMatchObject({ line: 2, column: '' });
  });

  it('an empty file has no header; more rows than allowed stops at the first extra row', () => {
    const empty = parseCsv('\n\n', { columns: COLUMNS });
    expect(empty.headerLine).toBeNull();
    expect(empty.problems).toEqual([{ line: 1, column: '', message: expect.stringContaining('empty') }]);
    const many = parseCsv('a\n1\n2\n3\n4\n', { columns: COLUMNS, maxRows: 2 });
    expect(many.rows).toHaveLength(2);
    expect(many.problems).toEqual([{ line: 4, column: '', message: expect.stringContaining('at most 2') }]);
  });
});

describe('cells', () => {
  it.each([
    ['', null],
    ['  ', null],
    ['1.5', 1.5],
    ['-0.25', -0.25],
    ['.5', 0.5],
    ['1e3', 1000],
    ['+7', 7],
  ])('parseNumberCell(%j) = %j', (input, expected) => {
    expect(parseNumberCell(input)).toBe(expected);
  });

  it.each(['1,5', '12 kg', 'abc', '0x10', '1.2.3'])('parseNumberCell(%j) is NaN (not guessed)', (input) => {
    expect(parseNumberCell(input)).toBeNaN();
  });

  it('the CSV writer quotes commas, quotes and line breaks, and the reader reads its output back', () => {
    expect(csvCell('plain')).toBe('plain');
    expect(csvCell('a,b')).toBe('"a,b"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell(2.5)).toBe('2.5');
    const round = parseCsv(`a,b\n${csvCell('x, "y"\nz')},1\n`, { columns: COLUMNS });
    expect(round.rows[0].values.a).toBe('x, "y"\nz');
  });
});
