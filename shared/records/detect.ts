import type { ReferenceMode } from '../hydraulics/reduction';
import { pascalsPer, WATER_DENSITY_NOMINAL, type PressureUnit } from '../units/pressure';
import type { TimeColumnFormat } from '../units/time';
import type { TimestampLayout } from '../units/timestamp';
import { parseDecimal } from './number';
import { columnNames, namesFromLine, nthLine } from './parse';
import { countLines, createFieldBounds, fieldText, lineSpans, significantFieldCount, splitFields, type Delimiter, type FieldBounds } from './tokenize';
import type { ColumnInfo, ColumnKind, ColumnMapping, FileLayout } from './types';
import { recogniseUnit, unitInName, type RecognisedUnit } from './units';

/** Lines read from the start of a file to find its layout. */
export const SAMPLE_LINES = 400;
/** Lines read from the end to find a footer. */
const TAIL_LINES = 30;

export interface DetectedColumn extends ColumnInfo {
  unit: RecognisedUnit | null;
  samples: string[];
}

/** What Kfield reads from a file's first lines, shown to the user to confirm or change. */
export interface Detection {
  layout: FileLayout;
  columns: DetectedColumn[];
  /** Lines before the header: logger metadata. */
  preamble: string[];
  /** Suggested mapping; null when no time and value columns could be told apart. */
  mapping: ColumnMapping | null;
  /** Kfield unit id for the suggested value column (m, ft, psi, kPa, …), or null if not written. */
  valueUnit: string | null;
  reference: ReferenceMode | null;
  /** A time zone named in the preamble, or null. */
  timeZone: string | null;
  /** Plain-language remarks: ambiguities and guesses the user should check. */
  notes: string[];
  totalLines: number;
}

const DATE_TIME = /^(?:\d{4}[-/]\d{1,2}[-/]\d{1,2}|\d{1,2}[-/.]\d{1,2}[-/.]\d{4})[T ]+\d{1,2}:\d{2}(?::\d{2}(?:[.,]\d+)?)?\s*(?:[AaPp][Mm])?\s*(?:Z|z|[+-]\d{2}(?::?\d{2})?)?$/;
const DATE = /^(?:\d{4}[-/]\d{1,2}[-/]\d{1,2}|\d{1,2}[-/.]\d{1,2}[-/.]\d{4})$/;
const CLOCK = /^-?\d{1,3}:\d{2}(?::\d{2})?(?:[.,]\d+)?(?:\s*[AaPp][Mm])?$/;
const MERIDIEM = /^[AaPp][Mm]$/;
const COMMA_DECIMAL = /^[+-]?\d+,\d+$/;
const DOT_DECIMAL = /^[+-]?\d*\.\d+(?:[eE][+-]?\d+)?$/;

type FieldKind = 'number' | 'comma-number' | 'timestamp' | 'date' | 'time' | 'meridiem' | 'empty' | 'text';

function kindOfField(s: string): FieldKind {
  if (s === '') return 'empty';
  if (COMMA_DECIMAL.test(s)) return 'comma-number';
  if (parseDecimal(s, 0, s.length, false) === parseDecimal(s, 0, s.length, false)) return 'number';
  if (DATE_TIME.test(s)) return 'timestamp';
  if (DATE.test(s)) return 'date';
  if (CLOCK.test(s)) return 'time';
  if (MERIDIEM.test(s)) return 'meridiem';
  return 'text';
}

interface SampleLine {
  line: number;
  start: number;
  end: number;
}

interface Split {
  fields: string[];
  kinds: FieldKind[];
  dataLike: boolean;
}

function splitSample(text: string, s: SampleLine, delimiter: Delimiter, bounds: FieldBounds): Split | null {
  const n = splitFields(text, s.start, s.end, delimiter, bounds);
  if (n < 0) return null;
  const count = significantFieldCount(bounds, n);
  const fields: string[] = [];
  const kinds: FieldKind[] = [];
  let numbers = 0;
  let others = 0;
  for (let i = 0; i < count; i++) {
    const f = fieldText(text, bounds, i);
    const k = kindOfField(f);
    fields.push(f);
    kinds.push(k);
    if (k === 'number' || k === 'comma-number') numbers++;
    else if (k === 'text') others++;
  }
  return { fields, kinds, dataLike: count >= 2 && numbers >= 1 && others === 0 };
}

interface Run {
  from: number;
  to: number;
  count: number;
  length: number;
}

/** The longest stretch of data-like lines with one field count (blank lines do not break it). */
function longestRun(splits: (Split | null)[]): Run | null {
  let best: Run | null = null;
  let current: Run | null = null;
  for (let i = 0; i < splits.length; i++) {
    const s = splits[i];
    if (s && s.dataLike) {
      if (current && current.count === s.fields.length) {
        current.to = i;
        current.length++;
      } else {
        current = { from: i, to: i, count: s.fields.length, length: 1 };
      }
      if (!best || current.length > best.length) best = { ...current };
    } else {
      current = null;
    }
  }
  return best;
}

const DELIMITER_ORDER: readonly Delimiter[] = ['tab', 'semicolon', 'comma', 'whitespace'];

function looksLikeUnits(fields: string[]): boolean {
  const nonEmpty = fields.filter((f) => f !== '');
  if (nonEmpty.length === 0) return false;
  return nonEmpty.every(
    (f) => f.length <= 16 && (!!recogniseUnit(f) || /^[[(].{0,14}[\])]$/.test(f) || /^(°|deg|µ|us\/|ms\/|%|v$|mv$)/i.test(f)),
  );
}

function tailSample(text: string, total: number, k: number): SampleLine[] {
  const out: SampleLine[] = [];
  let end = text.length;
  if (end > 0 && text.charCodeAt(end - 1) === 10) end--;
  let line = total;
  while (out.length < k && end > 0 && line > 0) {
    const nl = text.lastIndexOf('\n', end - 1);
    const start = nl + 1;
    let e = end;
    if (e > start && text.charCodeAt(e - 1) === 13) e--;
    out.push({ line, start, end: e });
    end = nl;
    line--;
    if (nl < 0) break;
  }
  return out;
}

function timestampLayoutOf(samples: string[]): { layout: TimestampLayout; note: string | null } {
  const first = samples[0] ?? '';
  if (/^\d{4}-\d{2}-\d{2}/.test(first)) return { layout: 'iso', note: null };
  if (/^\d{4}\/\d{1,2}\/\d{1,2}/.test(first)) return { layout: 'ymd', note: null };
  let firstAbove12 = false;
  let secondAbove12 = false;
  let meridiem = false;
  let dots = false;
  for (const s of samples) {
    const m = /^(\d{1,2})([-/.])(\d{1,2})\2\d{4}/.exec(s);
    if (!m) continue;
    if (Number(m[1]) > 12) firstAbove12 = true;
    if (Number(m[3]) > 12) secondAbove12 = true;
    if (m[2] === '.') dots = true;
    if (/[AaPp][Mm]/.test(s)) meridiem = true;
  }
  if (firstAbove12) return { layout: 'dmy', note: null };
  if (secondAbove12) return { layout: 'mdy', note: null };
  if (dots) return { layout: 'dmy', note: null };
  if (meridiem) return { layout: 'mdy', note: 'Dates are read as month/day/year (the times have AM/PM); change the date layout if the logger wrote day/month/year.' };
  return {
    layout: 'mdy',
    note: 'No day above 12 in the first readings, so day and month could be read either way: they are read as month/day/year. Change the date layout if the logger wrote day/month/year.',
  };
}

function elapsedUnitOf(column: DetectedColumn): TimeColumnFormat | null {
  if (column.unit?.quantity === 'time') return column.unit.id;
  const name = column.name.toLowerCase();
  if (/\bmin(ute)?s?\b/.test(name)) return 'min';
  if (/\b(sec(ond)?s?|s)\b/.test(name)) return 's';
  if (/\b(h|hr|hrs|hours?)\b/.test(name)) return 'h';
  if (/\bdays?\b/.test(name)) return 'd';
  return null;
}

const VALUE_NAME = /level|depth|dtw|head|water|wl\b|press|pres\b|lvl|stage|baro|druck|niveau/i;
const NOT_VALUE_NAME = /temp|°|degc|batt|volt|cond|\bec\b|\bph\b|spc|serial|\bid\b|#|\bno\b|index|record|seq|count|sample/i;
const DEPTH_NAME = /depth|dtw|below|bgs|btoc|\btoc\b|\bmp\b|to water/i;

/** Rises from reading to reading, but for a few slips (which the parse then reports by line). */
function increasing(values: number[]): boolean {
  const finite = values.filter((v) => v === v);
  let up = 0;
  for (let i = 1; i < finite.length; i++) if (finite[i] > finite[i - 1]) up++;
  return finite.length >= 2 && up >= 0.9 * (finite.length - 1);
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s.length ? s[Math.floor(s.length / 2)] : NaN;
}

function zoneFromPreamble(preamble: string[]): { zone: string | null; note: string | null } {
  const joined = preamble.join('\n');
  for (const m of joined.matchAll(/\b([A-Z][A-Za-z]+\/[A-Z][A-Za-z_]+(?:\/[A-Z][A-Za-z_]+)?)\b/g)) {
    try {
      new Intl.DateTimeFormat('en-US', { timeZone: m[1] });
      return { zone: m[1], note: `The file names the time zone ${m[1]}.` };
    } catch {
      // Not a zone this runtime knows (or not a zone at all): keep looking.
    }
  }
  const offset = /\b(?:UTC|GMT)\s*([+-])\s*(\d{1,2})(?::?(\d{2}))?\b/.exec(joined);
  if (offset) {
    const hours = Number(offset[2]);
    const minutes = offset[3] ? Number(offset[3]) : 0;
    const written = offset[0].replace(/\s+/g, '');
    if (minutes === 0 && hours <= 14) {
      // IANA's Etc zones count the other way round: UTC+2 is Etc/GMT-2.
      const zone = hours === 0 ? 'UTC' : `Etc/GMT${offset[1] === '+' ? '-' : '+'}${hours}`;
      return { zone, note: `The file gives its clock as ${written}; read as the fixed offset ${zone} (no daylight saving).` };
    }
    return { zone: null, note: `The file gives its clock as ${written}; choose the matching time zone.` };
  }
  if (/\b(UTC|GMT)\b/.test(joined)) return { zone: 'UTC', note: 'The file says its clock is UTC.' };
  return { zone: null, note: null };
}

/**
 * Finds the layout of a logger export from its first lines (and its last, for a footer): the
 * delimiter, the header and units lines, the preamble before them, decimal commas, the kind of
 * every column, and a suggested time and value mapping, reference and time zone.
 */
export function detectLayout(text: string, options: { role?: 'record' | 'barometric' } = {}): Detection {
  const role = options.role ?? 'record';
  const notes: string[] = [];
  const spans = lineSpans(text, SAMPLE_LINES);
  const sample: SampleLine[] = spans.starts.map((start, i) => ({ line: i + 1, start, end: spans.ends[i] }));
  const nonBlank = sample.filter((s) => text.slice(s.start, s.end).trim() !== '');
  const bounds = createFieldBounds();
  const totalLines = countLines(text);

  let best: { delimiter: Delimiter; run: Run; splits: (Split | null)[] } | null = null;
  for (const delimiter of DELIMITER_ORDER) {
    const splits = nonBlank.map((s) => splitSample(text, s, delimiter, bounds));
    const run = longestRun(splits);
    if (run && run.count >= 2 && (!best || run.length > best.run.length)) best = { delimiter, run, splits };
  }

  if (!best) {
    const layout: FileLayout = { delimiter: 'comma', headerLine: null, unitsLine: null, firstDataLine: 1, lastDataLine: null, decimalComma: false };
    return {
      layout,
      columns: [],
      preamble: [],
      mapping: null,
      valueUnit: null,
      reference: null,
      timeZone: null,
      notes: ['No lines of readings (two or more columns of numbers, dates or times) were found in the first lines; set the layout by hand.'],
      totalLines,
    };
  }

  const { delimiter, run, splits } = best;
  const dataSplits = splits.slice(run.from, run.to + 1).filter((s): s is Split => !!s && s.dataLike);
  let commaNumbers = 0;
  let dotNumbers = 0;
  for (const s of dataSplits) {
    for (let i = 0; i < s.kinds.length; i++) {
      if (s.kinds[i] === 'comma-number') commaNumbers++;
      else if (s.kinds[i] === 'number' && DOT_DECIMAL.test(s.fields[i])) dotNumbers++;
    }
  }
  const decimalComma = delimiter !== 'comma' && commaNumbers > 0 && dotNumbers === 0;
  if (commaNumbers > 0 && dotNumbers > 0) notes.push('Some numbers use a decimal point and some a decimal comma; check the decimal mark.');

  const firstData = nonBlank[run.from];
  let headerLine: number | null = null;
  let unitsLine: number | null = null;
  // Step back over rule lines ("-------") that some exports draw under the header.
  const isRule = (i: number) => /^[\s\-=_*+|;,~]+$/.test(text.slice(nonBlank[i].start, nonBlank[i].end));
  let i1 = run.from - 1;
  while (i1 >= 0 && isRule(i1)) i1--;
  let i2 = i1 - 1;
  while (i2 >= 0 && isRule(i2)) i2--;
  const p1 = i1 >= 0 ? splits[i1] : null;
  const p2 = i2 >= 0 ? splits[i2] : null;
  const sameCount = (s: Split | null, i: number) =>
    !!s &&
    !s.dataLike &&
    (s.fields.length === run.count ||
      (delimiter === 'whitespace' && text.slice(nonBlank[i].start, nonBlank[i].end).trim().split(/\s{2,}|\t/).length === run.count));
  if (sameCount(p1, i1)) {
    if (looksLikeUnits(p1!.fields) && sameCount(p2, i2) && !looksLikeUnits(p2!.fields)) {
      unitsLine = nonBlank[i1].line;
      headerLine = nonBlank[i2].line;
    } else {
      headerLine = nonBlank[i1].line;
    }
  }
  // A footer: non-data lines after the last readings.
  let lastDataLine: number | null = null;
  const tail = totalLines <= sample.length ? [...nonBlank].reverse() : tailSample(text, totalLines, TAIL_LINES).filter((s) => text.slice(s.start, s.end).trim() !== '');
  // A footer line has words in it; a line of numbers with a wrong field count is a malformed reading.
  const tailIsData = tail.map((s) => {
    const sp = splitSample(text, s, delimiter, bounds);
    return !(sp && !sp.dataLike && /[A-Za-z]/.test(text.slice(s.start, s.end)));
  });
  const firstDataFromEnd = tailIsData.indexOf(true);
  if (firstDataFromEnd > 0 && tail[firstDataFromEnd].line >= firstData.line) {
    lastDataLine = tail[firstDataFromEnd].line;
    notes.push(`Lines after line ${lastDataLine} are not readings (a footer) and are left out.`);
  }

  const layout: FileLayout = { delimiter, headerLine, unitsLine, firstDataLine: firstData.line, lastDataLine, decimalComma };
  const described = describeLayout(text, layout, { role, totalLines });
  return { ...described, notes: [...notes, ...described.notes] };
}

/**
 * Columns, suggested mapping, reference and time zone for a given layout: what detectLayout found,
 * or one the user chose instead.
 */
export function describeLayout(text: string, layout: FileLayout, options: { role?: 'record' | 'barometric'; totalLines?: number } = {}): Detection {
  const role = options.role ?? 'record';
  const totalLines = options.totalLines ?? countLines(text);
  const notes: string[] = [];
  const bounds = createFieldBounds();
  const { delimiter, decimalComma } = layout;
  const preambleEnd = layout.headerLine ?? layout.firstDataLine;
  const head = lineSpans(text, Math.max(0, preambleEnd - 1));
  const preamble = head.starts.map((st, i) => text.slice(st, head.ends[i]));
  const rows = lineSpans(text, 400, nthLine(text, layout.firstDataLine)?.start ?? text.length);
  const dataSplits: Split[] = [];
  for (let i = 0; i < rows.starts.length && dataSplits.length < 200; i++) {
    const line = layout.firstDataLine + i;
    if (layout.lastDataLine !== null && line > layout.lastDataLine) break;
    if (text.slice(rows.starts[i], rows.ends[i]).trim() === '') continue;
    const sp = splitSample(text, { line, start: rows.starts[i], end: rows.ends[i] }, delimiter, bounds);
    if (sp) dataSplits.push(sp);
  }
  const names = columnNames(text, layout);
  const count = names.length;
  const unitsSpan = layout.unitsLine === null ? null : nthLine(text, layout.unitsLine);
  const unitTexts = unitsSpan ? namesFromLine(text, unitsSpan, delimiter, count) : [];

  const columns: DetectedColumn[] = [];
  for (let c = 0; c < count; c++) {
    const values = dataSplits.map((s) => s.fields[c] ?? '');
    // The column's kind is what most of its values are: a stray "n/a" does not make it text.
    const tally = new Map<ColumnKind, number>();
    let filled = 0;
    for (const s of dataSplits) {
      const k = s.kinds[c] ?? 'empty';
      if (k === 'empty') continue;
      filled++;
      const as: ColumnKind = k === 'comma-number' ? (decimalComma ? 'number' : 'text') : k;
      tally.set(as, (tally.get(as) ?? 0) + 1);
    }
    let kind: ColumnKind = filled === 0 ? 'empty' : 'text';
    for (const [k, n] of tally) if (n >= 0.8 * filled) kind = k;
    const name = names[c];
    const unitText = (unitTexts[c] || unitInName(name) || '').replace(/^\s*[[(]\s*|\s*[\])]\s*$/g, '');
    columns.push({ index: c, name, unitText: unitText || null, kind, unit: recogniseUnit(unitText), samples: values.slice(0, 3) });
  }

  // Time: a full timestamp, or date + time of day (+ AM/PM), or an elapsed-time column.
  let mapping: ColumnMapping | null = null;
  const timestampColumn = columns.find((c) => c.kind === 'timestamp');
  const dateColumn = columns.find((c) => c.kind === 'date');
  const clockColumn = columns.find((c) => c.kind === 'time');
  const numeric = columns.filter((c) => c.kind === 'number');
  const numberValues = (c: DetectedColumn) =>
    dataSplits.slice(0, 200).map((s) => parseDecimal(s.fields[c.index] ?? '', 0, (s.fields[c.index] ?? '').length, decimalComma));
  const elapsedColumn = numeric.find((c) => elapsedUnitOf(c) && /time|elapsed|sec|min|^t\b/i.test(c.name) && increasing(numberValues(c)));
  let timeColumns: number[] | null = null;
  let timeFormat: TimeColumnFormat | null = null;
  let timestampSamples: string[] = [];
  if (timestampColumn) {
    timeColumns = [timestampColumn.index];
    timeFormat = 'timestamp';
    timestampSamples = dataSplits.map((s) => s.fields[timestampColumn.index]);
  } else if (dateColumn && clockColumn) {
    timeColumns = [dateColumn.index, clockColumn.index];
    const meridiem = columns.find((c) => c.kind === 'meridiem');
    if (meridiem) timeColumns.push(meridiem.index);
    timeFormat = 'timestamp';
    timestampSamples = dataSplits.map((s) => timeColumns!.map((c) => s.fields[c]).join(' '));
  } else if (elapsedColumn) {
    timeColumns = [elapsedColumn.index];
    timeFormat = elapsedUnitOf(elapsedColumn);
  } else if (clockColumn) {
    timeColumns = [clockColumn.index];
    timeFormat = 'mm:ss';
    notes.push(`Column "${clockColumn.name}" holds clock readings without a date; they are read as elapsed time (h:mm:ss).`);
  } else {
    const first = numeric.find((c) => increasing(numberValues(c)));
    if (first) {
      timeColumns = [first.index];
      timeFormat = 's';
      notes.push(`Column "${first.name}" is taken as elapsed time in seconds because it increases; check the unit.`);
    }
  }
  if (timeFormat === 'timestamp' && elapsedColumn) {
    notes.push(`The file has both timestamps and an elapsed-time column ("${elapsedColumn.name}"); the timestamps are used, so a barometric file on its own clock lines up.`);
  }
  let timestampLayout: TimestampLayout | undefined;
  if (timeFormat === 'timestamp') {
    const found = timestampLayoutOf(timestampSamples);
    timestampLayout = found.layout;
    if (found.note) notes.push(found.note);
    if (timestampSamples.some((s) => /(?:Z|z|[+-]\d{2}:?\d{2})$/.test(s.trim()))) {
      notes.push('The timestamps carry their own UTC offset; the time zone applies only to readings without one.');
    }
  }

  // Value: the likeliest level or pressure column.
  let valueColumn: DetectedColumn | null = null;
  let bestScore = -Infinity;
  for (const c of numeric) {
    if (timeColumns?.includes(c.index)) continue;
    let score = 0;
    if (VALUE_NAME.test(c.name)) score += 3;
    if (NOT_VALUE_NAME.test(c.name)) score -= 5;
    if (c.unit && c.unit.quantity !== 'time') score += 2;
    if (c.unit?.quantity === 'time') score -= 3;
    const vs = numberValues(c).filter((v) => v === v);
    if (vs.length && Math.max(...vs) > Math.min(...vs)) score += 1;
    if (score > bestScore) {
      bestScore = score;
      valueColumn = c;
    }
  }
  if (timeColumns && timeFormat && valueColumn) {
    mapping = { time: { columns: timeColumns, format: timeFormat, ...(timestampLayout ? { timestampLayout } : {}) }, valueColumn: valueColumn.index };
  } else {
    notes.push('Could not tell the time and value columns apart; choose them below.');
  }

  let reference: ReferenceMode | null = null;
  let valueUnit: string | null = null;
  if (valueColumn) {
    const u = valueColumn.unit;
    const vs = numberValues(valueColumn).filter((v) => v === v);
    if (u?.quantity === 'pressure') {
      valueUnit = u.id;
      const unitText = (valueColumn.unitText ?? '').toLowerCase();
      const pa = median(vs) * pascalsPer(u.id as PressureUnit, WATER_DENSITY_NOMINAL);
      if (/psia/.test(unitText) || /\babs/i.test(valueColumn.name)) reference = 'absolute';
      else if (/psig/.test(unitText) || /gauge|gage|vented/i.test(valueColumn.name)) reference = 'vented';
      else reference = pa > 80_000 ? 'absolute' : 'vented';
      if (role === 'record' && reference === 'absolute' && !/psia/.test(unitText) && !/\babs/i.test(valueColumn.name)) {
        notes.push(`"${valueColumn.name}" reads about ${Math.round(pa / 1000)} kPa, so it looks like absolute pressure (water plus air): it needs a barometric file.`);
      }
    } else if (u?.quantity === 'length') {
      valueUnit = u.id;
      reference = DEPTH_NAME.test(valueColumn.name) ? 'depth' : 'vented';
    } else {
      notes.push(`No unit is written for "${valueColumn.name}"; choose it.`);
    }
  }

  const zone = zoneFromPreamble(preamble);
  if (zone.note) notes.push(zone.note);

  if (dataSplits.length === 0) notes.push(`No readings from line ${layout.firstDataLine} on with this layout.`);
  return { layout, columns, preamble, mapping, valueUnit, reference, timeZone: zone.zone, notes, totalLines };
}
