import { describe, expect, it } from 'vitest';
import { csvCell, csvDocument } from '../../../../server/features/exports/csv';
import { readDelimitedTable } from '../../../../shared/csv/read-table';

describe('the exports CSV writer', () => {
  it('neutralises text cells a spreadsheet would run as a formula, and leaves numbers as numbers', () => {
    // OWASP "CSV injection": = + - @ and a leading tab or carriage return.
    expect(csvCell('=SUM(A1:A2)')).toBe("'=SUM(A1:A2)");
    expect(csvCell('+1')).toBe("'+1");
    expect(csvCell('-x')).toBe("'-x");
    expect(csvCell('@cmd')).toBe("'@cmd");
    expect(csvCell('\tx')).toBe("'\tx");
    expect(csvCell('\rx')).toBe(`"'\rx"`);
    expect(csvCell(-1.5)).toBe('-1.5');
    // The shortest text that reads back as the same double.
    const k = 1 / 7e6;
    expect(Number(csvCell(k))).toBe(k);
    expect(csvCell('MW-01')).toBe('MW-01');
  });

  it('quotes per RFC 4180 and reads back through the wells import reader', () => {
    const doc = csvDocument(['a', 'b', 'c'], [['x, "y"', 'line\nbreak', null], [1, -2.5, 'ü']]);
    expect(doc.startsWith('\uFEFFa,b,c\r\n')).toBe(true);
    expect(doc).toContain('"x, ""y"""');
    const t = readDelimitedTable(doc, ',');
    expect(t.header).toEqual(['a', 'b', 'c']);
    expect(t.records.map((r) => r.values)).toEqual([['x, "y"', 'line\nbreak', ''], ['1', '-2.5', 'ü']]);
  });
});
