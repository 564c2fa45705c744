import { describe, expect, it } from 'vitest';
import { readDelimitedTable } from '@shared/csv/read-table';

describe('reading a small delimited table', () => {
  it('detects the delimiter from the header line and keeps each record’s line number', () => {
    const t = readDelimitedTable('name;x\r\nA;1,5\r\n\r\nB;2\r\n');
    expect(t.delimiter).toBe(';');
    expect(t.header).toEqual(['name', 'x']);
    expect(t.records).toEqual([{ line: 2, values: ['A', '1,5'] }, { line: 4, values: ['B', '2'] }]);
  });

  it('reads quoted values with delimiters, doubled quotes and line breaks, and counts lines inside them', () => {
    const t = readDelimitedTable('name,notes,x\n"A, east","say ""hi""",1\n"B","two\nlines",2\nC,3" pipe,3\n');
    expect(t.records.map((r) => [r.line, ...r.values])).toEqual([
      [2, 'A, east', 'say "hi"', '1'],
      [3, 'B', 'two\nlines', '2'],
      [5, 'C', '3" pipe', '3'],
    ]);
  });

  it('reports lines whose number of values differs from the header instead of joining them to the next line', () => {
    const t = readDelimitedTable('a,b,c\n1,2\n3,4,5\n6,7,8,9\n');
    expect(t.records).toEqual([{ line: 3, values: ['3', '4', '5'] }]);
    expect(t.problems).toEqual([
      { line: 2, message: 'has 2 values; the header has 3' },
      { line: 4, message: 'has 4 values; the header has 3' },
    ]);
  });

  it('reads a tab-separated file without a final line break, and a byte-order mark', () => {
    const t = readDelimitedTable('\uFEFFa\tb\n1\t2');
    expect(t.delimiter).toBe('\t');
    expect(t.header).toEqual(['a', 'b']);
    expect(t.records).toEqual([{ line: 2, values: ['1', '2'] }]);
  });

  it.each([
    ['', 'The file is empty'],
    ['  \n \n', 'The file is empty'],
    ['a,b\n\u0000', 'The file is not text (it contains NUL bytes)'],
    ['a,b\n"1,2\n', 'Line 2: a quoted value is not closed before the end of the file'],
    // Found by the reliability fuzzer: uDSV's inference threw a TypeError on this header (a 500).
    ['"; DROP TABLE users; --', 'Line 1: the header line cannot be read'],
  ])('refuses %j: %s', (text, message) => {
    expect(() => readDelimitedTable(text)).toThrow(message);
  });
});
