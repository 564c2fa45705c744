import { EngineInputError } from '../hydraulics/errors';
import { isTimeColumnFormat, parseClockDuration, timeToSi, type TimeUnit } from '../units/time';
import { MAX_LINE_ISSUES, RecordFileError, type LineIssue } from './errors';
import { decodeRecordFile, sniffEncoding } from './text';
import { parseDecimal } from './number';
import { TimestampReader } from './timestamp-reader';
import {
  createFieldBounds,
  fieldText,
  lineSpans,
  MAX_COLUMNS,
  significantFieldCount,
  splitFields,
  TOO_MANY_FIELDS,
  UNTERMINATED_QUOTE,
  type Delimiter,
  type FieldBounds,
} from './tokenize';
import type { ColumnMapping, FileLayout } from './types';

export interface ParsedSeries {
  /** On the record's clock: seconds since 1970 for timestamps, elapsed seconds otherwise. */
  timeSeconds: Float64Array;
  /** As written in the file (its own unit), decimal comma already read. */
  value: Float64Array;
  clock: 'epoch' | 'elapsed';
  firstLine: number;
  lastLine: number;
  columnCount: number;
}

export interface ParseOptions {
  /** Which input this is, for messages and error fields: 'file' or 'barometric'. */
  field?: string;
  /** Readable name of the input: "The logger file". */
  what?: string;
  /** Path of the mapping in the request, for errors about it: 'settings.mapping'. */
  mappingField?: string;
  /** The text is the start of a longer file: its last line may be cut and is left out. */
  sampled?: boolean;
  /** For parseSeriesFromBytes: bytes decoded at a time (default CHUNK_BYTES). */
  chunkBytes?: number;
}

/**
 * Fields of a header or units line as names for `count` columns. With aligned columns (spaces as
 * the delimiter) names may hold single spaces and be set apart by two or more.
 */
export function namesFromLine(text: string, span: { start: number; end: number }, delimiter: Delimiter, count: number): string[] {
  const bounds = createFieldBounds();
  const n = splitFields(text, span.start, span.end, delimiter, bounds);
  const direct: string[] = [];
  if (n > 0) for (let i = 0; i < significantFieldCount(bounds, n); i++) direct.push(fieldText(text, bounds, i));
  if (direct.length !== count && delimiter === 'whitespace') {
    const wide = text.slice(span.start, span.end).trim().split(/\s{2,}|\t/);
    if (wide.length === count) return wide;
  }
  return direct;
}

/**
 * The file's columns: as many as the header names when the first reading has room for them
 * (trailing empty fields allowed), otherwise as many as the first reading has. Unnamed columns
 * are called Column 1…n.
 */
export function columnNames(text: string, layout: FileLayout): string[] {
  const bounds = createFieldBounds();
  const data = nthLine(text, layout.firstDataLine);
  if (!data) return [];
  const n = splitFields(text, data.start, data.end, layout.delimiter, bounds);
  if (n <= 0) return [];
  const dataCount = significantFieldCount(bounds, n);
  const header = layout.headerLine === null ? null : nthLine(text, layout.headerLine);
  let names = header ? namesFromLine(text, header, layout.delimiter, dataCount) : [];
  if (names.length !== dataCount && header) {
    const raw = namesFromLine(text, header, layout.delimiter, n);
    names = raw.length >= dataCount && raw.length <= n ? raw : names;
  }
  const count = names.length >= dataCount && names.length <= n ? names.length : dataCount;
  return Array.from({ length: count }, (_, i) => names[i] || `Column ${i + 1}`);
}

/** Start and end (without the line break) of line `line` (1-based), or null past the end. */
export function nthLine(text: string, line: number): { start: number; end: number; next: number } | null {
  let p = 0;
  for (let i = 1; i < line; i++) {
    const nl = text.indexOf('\n', p);
    if (nl < 0) return null;
    p = nl + 1;
  }
  if (p >= text.length && line > 1) return null;
  const spans = lineSpans(text, 1, p);
  if (spans.starts.length === 0) return null;
  return { start: spans.starts[0], end: spans.ends[0], next: spans.next };
}

function describeColumns(names: string[]): string {
  return names.map((n, i) => `${i} "${n}"`).join(', ');
}

function checkMapping(mapping: ColumnMapping, names: string[], mappingField: string): void {
  const n = names.length;
  const missing = (path: string, c: number) =>
    new EngineInputError(path, `column ${c} does not exist; the file has ${n} column${n === 1 ? '' : 's'}: ${describeColumns(names)}`);
  if (!Number.isInteger(mapping.valueColumn) || mapping.valueColumn < 0) {
    throw new EngineInputError(`${mappingField}.valueColumn`, 'must be a column index (0, 1, 2, …)');
  }
  if (mapping.valueColumn >= n) throw missing(`${mappingField}.valueColumn`, mapping.valueColumn);
  const t = mapping.time;
  if (!isTimeColumnFormat(t.format)) throw new EngineInputError(`${mappingField}.time.format`, `unknown time format "${t.format}"`);
  if (t.columns.length === 0) throw new EngineInputError(`${mappingField}.time.columns`, 'name at least one column');
  if (t.format !== 'timestamp' && t.columns.length > 1) {
    throw new EngineInputError(`${mappingField}.time.columns`, 'elapsed time is read from one column; several columns make a date and time');
  }
  t.columns.forEach((c, i) => {
    if (!Number.isInteger(c) || c < 0) throw new EngineInputError(`${mappingField}.time.columns.${i}`, 'must be a column index (0, 1, 2, …)');
    if (c >= n) throw missing(`${mappingField}.time.columns.${i}`, c);
  });
  if (t.columns.includes(mapping.valueColumn)) {
    throw new EngineInputError(`${mappingField}.valueColumn`, `column ${mapping.valueColumn} is also the time column`);
  }
  if (t.format === 'timestamp' && !t.timestampLayout) {
    throw new EngineInputError(`${mappingField}.time.timestampLayout`, 'is required to read dates and times');
  }
}

type TimeReader = (text: string, bounds: FieldBounds) => number;

function timeReaderFor(mapping: ColumnMapping, decimalComma: boolean, mappingField: string): TimeReader {
  const t = mapping.time;
  if (t.format === 'timestamp') {
    let reader: TimestampReader;
    try {
      reader = new TimestampReader(t.timestampLayout!, t.timeZone ?? 'UTC', t.columns);
    } catch (e) {
      if (e instanceof EngineInputError) throw new EngineInputError(`${mappingField}.time.${e.field}`, e.problem);
      throw e;
    }
    return (text, bounds) => reader.read(text, bounds);
  }
  const c = t.columns[0];
  if (t.format === 'mm:ss') {
    return (text, bounds) => parseClockDuration(text.slice(bounds.starts[c], bounds.ends[c]));
  }
  const factor = timeToSi(1, t.format as TimeUnit);
  return (text, bounds) => {
    const v = parseDecimal(text, bounds.starts[c], bounds.ends[c], decimalComma);
    if (v !== v) throw new EngineInputError('time', `"${text.slice(bounds.starts[c], bounds.ends[c])}" is not a number`);
    return factor === 1 ? v : v * factor;
  };
}

function shown(s: string): string {
  return s.length > 40 ? `${s.slice(0, 37)}…` : s;
}

/** A stretch of decoded text holding whole lines: [start, end) of `text`, its first line numbered `line`. */
interface TextChunk {
  text: string;
  start: number;
  end: number;
  line: number;
  /** Set by the reader: the number of the line after the chunk. */
  endLine?: number;
}

/**
 * Reads the mapped time and value columns of a logger export in one pass over the text: no object
 * per row, the readings go straight into two Float64Arrays. Blank lines are skipped. Malformed
 * lines (wrong number of fields, an unclosed quote), values that are not numbers and times that do
 * not increase are collected with their line numbers, up to MAX_LINE_ISSUES, and thrown together
 * as one RecordFileError.
 */
export function parseSeries(text: string, layout: FileLayout, mapping: ColumnMapping, options: ParseOptions = {}): ParsedSeries {
  const field = options.field ?? 'file';
  const start = nthLine(text, layout.firstDataLine);
  if (!start) throw new RecordFileError(field, `ends before line ${layout.firstDataLine}, where the readings should start`);
  let end = text.length;
  if (options.sampled && text.charCodeAt(end - 1) !== 10) {
    const lastBreak = text.lastIndexOf('\n');
    end = lastBreak < 0 ? 0 : lastBreak + 1;
  }
  // One slot per line that has text after its start (a final line break starts no line).
  let capacity = 0;
  for (let q = start.start; q < end; ) {
    capacity++;
    const nl = text.indexOf('\n', q);
    if (nl < 0 || nl >= end) break;
    q = nl + 1;
  }
  return readSeries(text, layout, mapping, options, capacity, [{ text, start: start.start, end, line: layout.firstDataLine }]);
}

/** Bytes of text per decoded chunk of a large file: the whole file never exists as one string. */
export const CHUNK_BYTES = 4 * 1024 * 1024;

/**
 * parseSeries straight from the uploaded bytes, decoding them a few megabytes at a time (each
 * chunk ends at a line break), so a large file is never held as one string beside its bytes.
 * UTF-16 files and files with only carriage returns are decoded whole; a file that is not valid
 * UTF-8 is read as Windows-1252, as decodeRecordFile does.
 */
export function parseSeriesFromBytes(bytes: Uint8Array, layout: FileLayout, mapping: ColumnMapping, options: ParseOptions = {}): ParsedSeries {
  const field = options.field ?? 'file';
  const { encoding, bomLength } = sniffEncoding(bytes, field);
  if (encoding !== 'utf-8' || (bytes.indexOf(10) < 0 && bytes.indexOf(13) >= 0)) {
    return parseSeries(decodeRecordFile(bytes, field).text, layout, mapping, options);
  }
  let k = bomLength;
  while (k < bytes.length && (bytes[k] === 32 || bytes[k] === 9 || bytes[k] === 10 || bytes[k] === 13)) k++;
  if (k === bytes.length) throw new RecordFileError(field, 'holds no readings (only blank lines)');
  const attempt = (label: 'utf-8' | 'windows-1252'): ParsedSeries => {
    const decoder = new TextDecoder(label, { fatal: label === 'utf-8' });
    const decode = (part: Uint8Array): string => {
      try {
        return decoder.decode(part);
      } catch {
        throw new NotUtf8();
      }
    };
    // Where the readings start, in bytes.
    let dataStart = bomLength;
    for (let i = 1; i < layout.firstDataLine; i++) {
      const nl = bytes.indexOf(10, dataStart);
      if (nl < 0) throw new RecordFileError(field, `ends before line ${layout.firstDataLine}, where the readings should start`);
      dataStart = nl + 1;
    }
    if (dataStart >= bytes.length) throw new RecordFileError(field, `ends before line ${layout.firstDataLine}, where the readings should start`);
    let end = bytes.length;
    if (options.sampled && bytes[end - 1] !== 10) {
      const lastBreak = bytes.lastIndexOf(10);
      end = lastBreak < 0 ? 0 : lastBreak + 1;
    }
    let capacity = 0;
    for (let q = dataStart; q < end; ) {
      capacity++;
      const nl = bytes.indexOf(10, q);
      if (nl < 0 || nl >= end) break;
      q = nl + 1;
    }
    const firstLineEnd = bytes.indexOf(10, dataStart);
    const head = decode(bytes.subarray(bomLength, firstLineEnd < 0 ? end : firstLineEnd + 1));
    function* chunks(): Generator<TextChunk> {
      let a = dataStart;
      let line = layout.firstDataLine;
      while (a < end) {
        let b = Math.min(end, a + (options.chunkBytes ?? CHUNK_BYTES));
        if (b < end) {
          const nl = bytes.lastIndexOf(10, b - 1);
          b = nl >= a ? nl + 1 : (bytes.indexOf(10, b) + 1 || end);
        }
        const text = decode(bytes.subarray(a, b));
        const chunk: TextChunk = { text, start: 0, end: text.length, line, endLine: line };
        yield chunk;
        // The reader numbered the chunk's lines; the next chunk goes on from there.
        line = chunk.endLine ?? line;
        a = b;
      }
    }
    return readSeries(head, layout, mapping, options, capacity, chunks());
  };
  try {
    return attempt('utf-8');
  } catch (e) {
    if (e instanceof NotUtf8) return attempt('windows-1252');
    throw e;
  }
}

/** Thrown when the bytes are not UTF-8, to read them again as Windows-1252. */
class NotUtf8 extends Error {}

function readSeries(head: string, layout: FileLayout, mapping: ColumnMapping, options: ParseOptions, capacity: number, chunks: Iterable<TextChunk>): ParsedSeries {
  const field = options.field ?? 'file';
  const what = options.what ?? 'The file';
  const mappingField = options.mappingField ?? 'mapping';
  const names = columnNames(head, layout);
  if (names.length === 0) {
    throw new RecordFileError(field, `has no line ${layout.headerLine ?? layout.firstDataLine} to read the columns from`);
  }
  checkMapping(mapping, names, mappingField);
  const expected = names.length;
  const readTime = timeReaderFor(mapping, layout.decimalComma, mappingField);
  const valueColumn = mapping.valueColumn;
  const timeColumns = mapping.time.columns;
  const firstTimeColumn = Math.min(...timeColumns);
  const lastTimeColumn = Math.max(...timeColumns);
  const decimalComma = layout.decimalComma;
  const delimiter = layout.delimiter;
  // Local bindings: the hot loop should not go through module export getters (CommonJS interop).
  const split = splitFields;
  const decimal = parseDecimal;
  const unterminated = UNTERMINATED_QUOTE;
  const tooMany = TOO_MANY_FIELDS;
  const lastLine = layout.lastDataLine ?? Infinity;

  const time = new Float64Array(capacity);
  const value = new Float64Array(capacity);
  const bounds = createFieldBounds();
  const issues: LineIssue[] = [];
  let truncated = false;
  const issue = (line: number, message: string) => {
    if (issues.length < MAX_LINE_ISSUES) issues.push({ line, message });
    else truncated = true;
  };

  const delimiterChar = delimiter === 'comma' ? ',' : delimiter === 'semicolon' ? ';' : '\t';
  const maxColumns = MAX_COLUMNS;
  let row = 0;
  let previousTime = -Infinity;
  let previousLine = 0;
  // Where the previous reading's time was written (its chunk of text and span), for messages.
  let previousTimeAt = '';
  let previousTimeStart = 0;
  let previousTimeEnd = 0;
  let firstLine = 0;
  let lastRead = 0;
  for (const chunk of chunks) {
    const text = chunk.text;
    const end = chunk.end;
    let line = chunk.line;
    let p = chunk.start;
    // Without a quote in the readings, a simpler split does; aligned columns keep the general one.
    const quoteFree = delimiter !== 'whitespace' && text.indexOf('"', p) < 0;
    let nextDelimiter = -1;
    for (; p < end && line <= lastLine && !truncated; line++) {
      let nl = text.indexOf('\n', p);
      if (nl < 0 || nl >= end) nl = end;
      let e = nl;
      if (e > p && text.charCodeAt(e - 1) === 13) e--;
      const lineStart = p;
      p = nl + 1;
      let blank = true;
      for (let i = lineStart; i < e; i++) {
        const c = text.charCodeAt(i);
        if (c !== 32 && c !== 9) {
          blank = false;
          break;
        }
      }
      if (blank) continue;

      let n: number;
      if (quoteFree) {
        // The common case, no quotes anywhere: fields by indexOf, the next delimiter carried over
        // from line to line so no search runs past it twice.
        const starts = bounds.starts;
        const ends = bounds.ends;
        n = 0;
        let a = lineStart;
        for (;;) {
          while (a < e && text.charCodeAt(a) === 32) a++;
          if (nextDelimiter < a) {
            nextDelimiter = text.indexOf(delimiterChar, a);
            if (nextDelimiter < 0) nextDelimiter = text.length;
          }
          const stop = nextDelimiter < e ? nextDelimiter : e;
          let b = stop;
          while (b > a && text.charCodeAt(b - 1) === 32) b--;
          if (n === maxColumns) {
            n = tooMany;
            break;
          }
          starts[n] = a;
          ends[n] = b;
          n++;
          if (stop === e) break;
          a = stop + 1;
        }
      } else {
        n = split(text, lineStart, e, delimiter, bounds);
      }
      if (n === unterminated) {
        issue(line, 'a quoted field does not close');
        continue;
      }
      if (n === tooMany || n < expected || significantFieldCount(bounds, n) > expected) {
        const found = n === tooMany ? `more than ${MAX_COLUMNS}` : String(significantFieldCount(bounds, n));
        issue(line, `expected ${expected} fields, found ${found}`);
        continue;
      }

      let t: number;
      try {
        t = readTime(text, bounds);
      } catch (err) {
        if (!(err instanceof EngineInputError)) throw err;
        issue(line, `time ${err.problem}`);
        continue;
      }
      const v = decimal(text, bounds.starts[valueColumn], bounds.ends[valueColumn], decimalComma);
      if (v !== v) {
        const raw = fieldText(text, bounds, valueColumn);
        issue(line, raw === '' ? `column "${names[valueColumn]}" is empty` : `"${shown(raw)}" in column "${names[valueColumn]}" is not a number`);
        continue;
      }
      if (!(t > previousTime)) {
        const now = text.slice(bounds.starts[firstTimeColumn], bounds.ends[lastTimeColumn]);
        const before = previousTimeAt.slice(previousTimeStart, previousTimeEnd);
        issue(
          line,
          t === previousTime
            ? `time ${shown(now)} repeats the time on line ${previousLine}; times must increase`
            : `time ${shown(now)} goes backwards from ${shown(before)} on line ${previousLine}`,
        );
        continue;
      }
      previousTime = t;
      previousLine = line;
      previousTimeAt = text;
      previousTimeStart = bounds.starts[firstTimeColumn];
      previousTimeEnd = bounds.ends[lastTimeColumn];
      time[row] = t;
      value[row] = v;
      if (row === 0) firstLine = line;
      lastRead = line;
      row++;
    }

    chunk.endLine = line;
    if (line > lastLine || truncated) break;
  }

  if (issues.length > 0) throw RecordFileError.fromIssues(field, what, issues, truncated);
  if (row === 0) throw new RecordFileError(field, `has no readings from line ${layout.firstDataLine} on`);
  return {
    timeSeconds: row === capacity ? time : time.slice(0, row),
    value: row === capacity ? value : value.slice(0, row),
    clock: mapping.time.format === 'timestamp' ? 'epoch' : 'elapsed',
    firstLine,
    lastLine: lastRead,
    columnCount: expected,
  };
}

/** The first `limit` data lines as field strings, with their line numbers: the mapping preview's table. */
export function previewRows(text: string, layout: FileLayout, limit: number): { line: number; fields: string[] }[] {
  const rows: { line: number; fields: string[] }[] = [];
  const start = nthLine(text, layout.firstDataLine);
  if (!start) return rows;
  const bounds = createFieldBounds();
  const spans = lineSpans(text, limit * 2 + 20, start.start);
  for (let i = 0; i < spans.starts.length && rows.length < limit; i++) {
    const line = layout.firstDataLine + i;
    if (layout.lastDataLine !== null && line > layout.lastDataLine) break;
    if (text.slice(spans.starts[i], spans.ends[i]).trim() === '') continue;
    const n = splitFields(text, spans.starts[i], spans.ends[i], layout.delimiter, bounds);
    const fields: string[] = [];
    if (n < 0) fields.push(text.slice(spans.starts[i], spans.ends[i]));
    else for (let k = 0; k < significantFieldCount(bounds, n); k++) fields.push(fieldText(text, bounds, k));
    rows.push({ line, fields });
  }
  return rows;
}
