/** Column separators a logger export may use. 'whitespace' is one or more spaces or tabs. */
export type Delimiter = 'comma' | 'semicolon' | 'tab' | 'whitespace';

export const DELIMITERS: readonly { id: Delimiter; label: string }[] = [
  { id: 'comma', label: 'Comma (,)' },
  { id: 'semicolon', label: 'Semicolon (;)' },
  { id: 'tab', label: 'Tab' },
  { id: 'whitespace', label: 'Spaces (aligned columns)' },
];

const DELIMITER_CHAR: Readonly<Record<Exclude<Delimiter, 'whitespace'>, string>> = { comma: ',', semicolon: ';', tab: '\t' };

export const MAX_COLUMNS = 512;

/**
 * Field bounds of one line: starts[i]..ends[i] (exclusive), trimmed and without enclosing quotes.
 * It also remembers the last delimiter search, so that a line without the delimiter does not send
 * every following line's search to the end of a large file.
 */
export interface FieldBounds {
  starts: Int32Array;
  ends: Int32Array;
  searchText: string | null;
  searchDelimiter: string;
  searchFrom: number;
  /** Next delimiter at or after searchFrom, or -1 for none. */
  searchFound: number;
}

export function createFieldBounds(): FieldBounds {
  return { starts: new Int32Array(MAX_COLUMNS + 1), ends: new Int32Array(MAX_COLUMNS + 1), searchText: null, searchDelimiter: '', searchFrom: 0, searchFound: -1 };
}

/** text.indexOf(d, from), answered from the previous search when that one already covers `from`. */
function nextDelimiter(text: string, d: string, from: number, out: FieldBounds): number {
  if (out.searchText === text && out.searchDelimiter === d && out.searchFrom <= from && (out.searchFound >= from || out.searchFound < 0)) {
    return out.searchFound;
  }
  const found = text.indexOf(d, from);
  out.searchText = text;
  out.searchDelimiter = d;
  out.searchFrom = from;
  out.searchFound = found;
  return found;
}

/** Returned by splitFields for a line whose quotes do not close. */
export const UNTERMINATED_QUOTE = -1;
/** Returned by splitFields for a line with more than MAX_COLUMNS fields. */
export const TOO_MANY_FIELDS = -2;

const SPACE = 32;
const TAB = 9;
const QUOTE = 34;

/** Index after a quoted field that opens at `open`, or -1 when it does not close before `end`. */
function closingQuote(text: string, open: number, end: number): number {
  let q = open + 1;
  for (;;) {
    q = text.indexOf('"', q);
    if (q < 0 || q >= end) return -1;
    if (q + 1 < end && text.charCodeAt(q + 1) === QUOTE) {
      q += 2;
      continue;
    }
    return q;
  }
}

/**
 * Splits text[lineStart, lineEnd) into fields without allocating: one pass, bounds written into
 * `out`. Spaces around a field are trimmed; a field enclosed in double quotes loses its quotes (a
 * doubled quote inside stays doubled: only header names need unescaping, see fieldText).
 * Returns the number of fields, UNTERMINATED_QUOTE or TOO_MANY_FIELDS.
 */
export function splitFields(text: string, lineStart: number, lineEnd: number, delimiter: Delimiter, out: FieldBounds): number {
  const { starts, ends } = out;
  if (delimiter === 'whitespace') {
    let f = 0;
    let i = lineStart;
    for (;;) {
      while (i < lineEnd) {
        const c = text.charCodeAt(i);
        if (c !== SPACE && c !== TAB) break;
        i++;
      }
      if (i >= lineEnd) return f;
      if (f === MAX_COLUMNS) return TOO_MANY_FIELDS;
      if (text.charCodeAt(i) === QUOTE) {
        const q = closingQuote(text, i, lineEnd);
        if (q < 0) return UNTERMINATED_QUOTE;
        starts[f] = i + 1;
        ends[f] = q;
        f++;
        i = q + 1;
        continue;
      }
      const a = i;
      while (i < lineEnd) {
        const c = text.charCodeAt(i);
        if (c === SPACE || c === TAB) break;
        i++;
      }
      starts[f] = a;
      ends[f] = i;
      f++;
    }
  }

  const d = DELIMITER_CHAR[delimiter];
  const dc = d.charCodeAt(0);
  let f = 0;
  let a = lineStart;
  for (;;) {
    if (f === MAX_COLUMNS) return TOO_MANY_FIELDS;
    while (a < lineEnd && text.charCodeAt(a) === SPACE) a++;
    if (a < lineEnd && text.charCodeAt(a) === QUOTE) {
      const q = closingQuote(text, a, lineEnd);
      if (q < 0) return UNTERMINATED_QUOTE;
      starts[f] = a + 1;
      ends[f] = q;
      f++;
      let k = q + 1;
      while (k < lineEnd && text.charCodeAt(k) !== dc) k++;
      if (k >= lineEnd) return f;
      a = k + 1;
      continue;
    }
    let next = nextDelimiter(text, d, a, out);
    if (next < 0 || next > lineEnd) next = lineEnd;
    let b = next;
    while (b > a && text.charCodeAt(b - 1) === SPACE) b--;
    starts[f] = a;
    ends[f] = b;
    f++;
    if (next >= lineEnd) return f;
    a = next + 1;
  }
}

/** The text of field i, with doubled quotes undone. */
export function fieldText(text: string, bounds: FieldBounds, i: number): string {
  const s = text.slice(bounds.starts[i], bounds.ends[i]);
  return s.includes('""') ? s.replace(/""/g, '"') : s;
}

/** Splits one line (a string) into field strings: for detection and previews, not for the bulk path. */
export function splitLine(line: string, delimiter: Delimiter, bounds: FieldBounds = createFieldBounds()): string[] | null {
  const n = splitFields(line, 0, line.length, delimiter, bounds);
  if (n < 0) return null;
  return Array.from({ length: n }, (_, i) => fieldText(line, bounds, i));
}

/**
 * Number of fields that count: trailing empty fields (a delimiter at the end of every line, as
 * some loggers write) are not columns.
 */
export function significantFieldCount(bounds: FieldBounds, n: number): number {
  let k = n;
  while (k > 0 && bounds.ends[k - 1] === bounds.starts[k - 1]) k--;
  return k;
}

/** Start of each line and its end without the line break, for the first `maxLines` lines. */
export function lineSpans(text: string, maxLines: number, from = 0): { starts: number[]; ends: number[]; next: number } {
  const starts: number[] = [];
  const ends: number[] = [];
  let p = from;
  const n = text.length;
  while (p < n && starts.length < maxLines) {
    let nl = text.indexOf('\n', p);
    if (nl < 0) nl = n;
    let e = nl;
    if (e > p && text.charCodeAt(e - 1) === 13) e--;
    starts.push(p);
    ends.push(e);
    p = nl + 1;
  }
  return { starts, ends, next: p };
}

/** Number of lines in the text (a final line without a line break counts; a final break does not start one). */
export function countLines(text: string): number {
  if (text.length === 0) return 0;
  let count = 0;
  let p = 0;
  for (;;) {
    const nl = text.indexOf('\n', p);
    if (nl < 0) break;
    count++;
    p = nl + 1;
  }
  return p < text.length ? count + 1 : count;
}
