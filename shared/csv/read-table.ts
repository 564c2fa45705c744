import { inferSchema, initParser, type Schema } from 'udsv';

/** One data record of a delimited file, with the line it starts on (the header is line 1). */
export interface TableRecord {
  line: number;
  values: string[];
}

export interface TableProblem {
  line: number;
  message: string;
}

export interface DelimitedTable {
  delimiter: string;
  header: string[];
  records: TableRecord[];
  /** Records whose number of values differs from the header's: left out of `records`. */
  problems: TableProblem[];
}

export const DELIMITERS = [',', ';', '\t', '|'] as const;
export type Delimiter = (typeof DELIMITERS)[number];
export const DELIMITER_LABELS: Record<Delimiter, string> = { ',': 'comma', ';': 'semicolon', '\t': 'tab', '|': 'vertical bar' };

export class TableError extends Error {}

interface RawRecord {
  line: number;
  text: string;
  fieldCount: number;
}

/**
 * Split the text into records at line breaks outside quotes, counting each record's fields.
 * uDSV (0.7) does the parsing, but it reports no line numbers and silently joins a short row
 * with the next line, so every record is checked against the header before uDSV sees it.
 */
function splitRecords(text: string, delimiter: string): RawRecord[] {
  const out: RawRecord[] = [];
  let line = 1;
  let start = 0;
  let startLine = 1;
  let inQuotes = false;
  let fields = 1;
  const flush = (end: number) => {
    const recordText = text.slice(start, end);
    if (recordText.trim() !== '') out.push({ line: startLine, text: recordText, fieldCount: fields });
  };
  let atFieldStart = true;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (inQuotes) {
      if (c === '"') {
        if (text[i + 1] === '"') i++;
        else inQuotes = false;
      } else if (c === '\n' || (c === '\r' && text[i + 1] !== '\n')) line++;
      continue;
    }
    if (c === '"' && atFieldStart) {
      inQuotes = true;
      atFieldStart = false;
    } else if (c === delimiter) {
      fields++;
      atFieldStart = true;
    } else if (c === '\n' || c === '\r') {
      const end = i;
      if (c === '\r' && text[i + 1] === '\n') i++;
      flush(end);
      line++;
      start = i + 1;
      startLine = line;
      fields = 1;
      atFieldStart = true;
    } else if (c !== ' ') atFieldStart = false;
  }
  if (inQuotes) throw new TableError(`Line ${startLine}: a quoted value is not closed before the end of the file`);
  flush(text.length);
  return out;
}

/** Read a small delimited text file (a few thousand rows): header, records with line numbers, malformed lines. */
export function readDelimitedTable(input: string, delimiter?: Delimiter): DelimitedTable {
  const text = input.replace(/^\uFEFF/, '');
  if (text.trim() === '') throw new TableError('The file is empty');
  if (text.includes('\u0000')) throw new TableError('The file is not text (it contains NUL bytes)');
  const firstLine = text.split(/\r\n|\r|\n/, 1)[0];
  // inferSchema needs a line break; the first line decides the delimiter (tab, bar, semicolon, comma).
  let probe: ReturnType<typeof inferSchema>;
  try {
    probe = inferSchema(`${firstLine}\n`, { col: delimiter ?? null, trim: true });
  } catch {
    // uDSV's inference throws on some malformed headers (a quote opened and not closed on line 1).
    throw new TableError('Line 1: the header line cannot be read as delimited text (is a quoted value left open?)');
  }
  const col = probe.col;
  const raw = splitRecords(text, col);
  if (raw.length === 0) throw new TableError('The file is empty');
  const [head, ...body] = raw;
  const schema: Schema = {
    ...probe,
    encl: '"',
    esc: '"',
    cols: Array.from({ length: head.fieldCount }, (_, i) => ({ name: String(i), type: 's', repl: { empty: '', null: undefined, NaN: undefined } })),
  };
  // skip is uDSV's count of header rows; each record is parsed on its own.
  const parser = initParser({ ...schema, skip: 0 } as Schema);
  const parseOne = (r: RawRecord): string[] => {
    const rows = parser.stringArrs(`${r.text}\n`);
    return (rows[0] ?? []).map((v) => String(v ?? '').trim());
  };
  const header = parseOne(head);
  if (header.every((h) => h === '')) throw new TableError('Line 1: the header row has no column names');
  const records: TableRecord[] = [];
  const problems: TableProblem[] = [];
  for (const r of body) {
    if (r.fieldCount !== header.length) {
      problems.push({ line: r.line, message: `has ${r.fieldCount} values; the header has ${header.length}` });
      continue;
    }
    records.push({ line: r.line, values: parseOne(r) });
  }
  return { delimiter: col, header, records, problems };
}
