import { EngineInputError } from '../hydraulics/errors';
import { createTimestampParser, type TimestampLayout } from '../units/timestamp';
import type { FieldBounds } from './tokenize';

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

/** text[a, b) equals text[c, d), compared from the end (where a new minute differs first). */
function sameSpan(text: string, a: number, b: number, c: number, d: number): boolean {
  if (b - a !== d - c) return false;
  for (let i = b - 1, j = d - 1; i >= a; i--, j--) if (text.charCodeAt(i) !== text.charCodeAt(j)) return false;
  return true;
}

const digit = (text: string, i: number) => text.charCodeAt(i) - 48;

/**
 * Reads a timestamp spread over one or more columns (a full date and time, or date + time of day
 * [+ AM/PM]) with the shared timestamp parser, but only once per wall-clock hour: minutes and
 * seconds are read from the text directly and added to the hour's instant, so a long logger file
 * costs one regular-expression match and zone lookup per hour, not per row, and nothing is
 * allocated per row. Zones change their offset on the hour, so every minute of an hour resolves
 * as the shared parser resolves the hour itself (the same instant, to the last bit: a test holds
 * the two to that). A reader belongs to one text (one file): its caches point into it.
 */
export class TimestampReader {
  private readonly parse: (text: string, field?: string) => number;
  /** The cached minute (and hour) as spans of the text: per column the part before the seconds (minutes), and what follows the seconds. */
  private keyText: string | null = null;
  private keyPiece = -1;
  private readonly minuteStarts: Int32Array;
  private readonly minuteEnds: Int32Array;
  private minuteEpoch = NaN;
  private readonly hourStarts: Int32Array;
  private readonly hourEnds: Int32Array;
  private hourEpoch = NaN;
  /** For one column: the cached minute's field length, and where and how long its seconds are. */
  private fastLength = 0;
  private fastSecondsAt = 0;
  private fastSecondsLength = 0;

  constructor(
    layout: TimestampLayout,
    timeZone: string,
    private readonly columns: readonly number[],
  ) {
    this.parse = createTimestampParser({ layout, timeZone });
    this.minuteStarts = new Int32Array(2 * columns.length);
    this.minuteEnds = new Int32Array(2 * columns.length);
    this.hourStarts = new Int32Array(2 * columns.length);
    this.hourEnds = new Int32Array(2 * columns.length);
  }

  /** The text of the timestamp on the current line, as the slow path and messages see it. */
  fullText(text: string, bounds: FieldBounds): string {
    const parts: string[] = [];
    for (const c of this.columns) parts.push(text.slice(bounds.starts[c], bounds.ends[c]));
    return parts.join(' ');
  }

  /** Seconds since 1970-01-01T00:00Z; throws EngineInputError('time', …) for text that is not a timestamp. */
  read(text: string, bounds: FieldBounds): number {
    const cols = this.columns;
    const n = cols.length;
    // The common case first: one column, written like the cached minute's (same length, seconds in
    // the same place). Then only the text around the seconds is compared, and the seconds read.
    if (n === 1 && text === this.keyText && this.fastLength > 0) {
      const a = bounds.starts[cols[0]];
      const b = bounds.ends[cols[0]];
      if (b - a === this.fastLength) {
        const s0 = a + this.fastSecondsAt;
        const ka = this.minuteStarts[0];
        const se = s0 + this.fastSecondsLength;
        if (sameSpan(text, a, s0, ka, ka + this.fastSecondsAt) && sameSpan(text, se, b, this.minuteStarts[1], this.minuteEnds[1])) {
          const s1 = text.charCodeAt(s0) - 48;
          const s2 = text.charCodeAt(s0 + 1) - 48;
          if (s1 >= 0 && s1 <= 5 && s2 >= 0 && s2 <= 9) {
            let fraction = 0;
            if (se - s0 > 2) {
              const mark = text.charCodeAt(s0 + 2);
              let digits = 0;
              let ok = mark === 46 || mark === 44;
              for (let k = s0 + 3; k < se && ok; k++) {
                const c = text.charCodeAt(k) - 48;
                if (c < 0 || c > 9) ok = false;
                else digits = digits * 10 + c;
              }
              fraction = ok ? digits / POW10[se - s0 - 3] : -1;
            }
            if (fraction >= 0) return this.minuteEpoch + (s1 * 10 + s2) + fraction;
          }
        }
      }
    }
    // The column with hh:mm:ss, and where its minutes and seconds are.
    let piece = -1;
    let minutesStart = -1;
    let secondsStart = -1;
    for (let p = 0; p < n && piece < 0; p++) {
      const a = bounds.starts[cols[p]];
      const b = bounds.ends[cols[p]];
      const c1 = text.indexOf(':', a);
      if (c1 < 0 || c1 >= b) continue;
      const c2 = text.indexOf(':', c1 + 1);
      if (c2 < 0 || c2 >= b) continue;
      piece = p;
      minutesStart = c1 + 1;
      secondsStart = c2 + 1;
    }
    if (piece < 0) return this.parse(this.fullText(text, bounds));

    const pieceEnd = bounds.ends[cols[piece]];
    if (secondsStart - minutesStart !== 3 || secondsStart + 2 > pieceEnd) return this.parse(this.fullText(text, bounds));
    const m1 = digit(text, minutesStart);
    const m2 = digit(text, minutesStart + 1);
    const s1 = digit(text, secondsStart);
    const s2 = digit(text, secondsStart + 1);
    if (m1 < 0 || m1 > 5 || m2 < 0 || m2 > 9 || s1 < 0 || s1 > 5 || s2 < 0 || s2 > 9) return this.parse(this.fullText(text, bounds));
    const minutes = m1 * 10 + m2;
    const whole = s1 * 10 + s2;
    let k = secondsStart + 2;
    let fraction = 0;
    const mark = k < pieceEnd ? text.charCodeAt(k) : 0;
    if (mark === 46 || mark === 44) {
      k++;
      const fractionStart = k;
      let digits = 0;
      while (k < pieceEnd) {
        const c = text.charCodeAt(k);
        if (c < 48 || c > 57) break;
        digits = digits * 10 + (c - 48);
        k++;
      }
      const count = k - fractionStart;
      if (count === 0 || count > 15) return this.parse(this.fullText(text, bounds));
      // digits / 10^count is one correctly rounded division: exactly Number("0.<digits>"), as the
      // shared parser reads the fraction, so both paths give the same instant to the last bit.
      fraction = digits / POW10[count];
    }
    const secondsEnd = k;

    // The cached minute? Every column compared with the seconds cut out.
    const sameText = this.keyText === text && this.keyPiece === piece;
    if (sameText && this.sameAs(text, bounds, piece, secondsStart, secondsEnd, this.minuteStarts, this.minuteEnds)) {
      return this.minuteEpoch + whole + fraction;
    }
    // The cached hour? Then this minute is the hour's instant plus its minutes.
    let minuteEpoch: number;
    if (sameText && this.sameAs(text, bounds, piece, minutesStart, secondsEnd, this.hourStarts, this.hourEnds)) {
      minuteEpoch = this.hourEpoch + minutes * 60;
    } else {
      const hourParts: string[] = [];
      for (let p = 0; p < n; p++) {
        const a = bounds.starts[cols[p]];
        const b = bounds.ends[cols[p]];
        hourParts.push(p === piece ? `${text.slice(a, minutesStart)}00:00${text.slice(secondsEnd, b)}` : text.slice(a, b));
      }
      let hourEpoch: number;
      try {
        hourEpoch = this.parse(hourParts.join(' '));
      } catch (e) {
        // Report the text as written, not the hour built from it.
        if (e instanceof EngineInputError) return this.parse(this.fullText(text, bounds));
        throw e;
      }
      this.remember(bounds, piece, minutesStart, secondsEnd, this.hourStarts, this.hourEnds);
      this.hourEpoch = hourEpoch;
      minuteEpoch = hourEpoch + minutes * 60;
    }
    this.remember(bounds, piece, secondsStart, secondsEnd, this.minuteStarts, this.minuteEnds);
    this.keyText = text;
    this.keyPiece = piece;
    this.minuteEpoch = minuteEpoch;
    if (n === 1 && secondsEnd - secondsStart <= 17) {
      const a = bounds.starts[cols[0]];
      this.fastLength = bounds.ends[cols[0]] - a;
      this.fastSecondsAt = secondsStart - a;
      this.fastSecondsLength = secondsEnd - secondsStart;
    } else {
      this.fastLength = 0;
    }
    return minuteEpoch + whole + fraction;
  }

  /** This line's columns equal the cached spans, with text[cutFrom, cutTo) of the time column left out. */
  private sameAs(text: string, bounds: FieldBounds, piece: number, cutFrom: number, cutTo: number, starts: Int32Array, ends: Int32Array): boolean {
    const cols = this.columns;
    for (let p = 0; p < cols.length; p++) {
      const a = bounds.starts[cols[p]];
      const b = bounds.ends[cols[p]];
      if (p === piece) {
        if (!sameSpan(text, a, cutFrom, starts[2 * p], ends[2 * p]) || !sameSpan(text, cutTo, b, starts[2 * p + 1], ends[2 * p + 1])) return false;
      } else if (!sameSpan(text, a, b, starts[2 * p], ends[2 * p])) {
        return false;
      }
    }
    return true;
  }

  private remember(bounds: FieldBounds, piece: number, cutFrom: number, cutTo: number, starts: Int32Array, ends: Int32Array): void {
    const cols = this.columns;
    for (let p = 0; p < cols.length; p++) {
      const a = bounds.starts[cols[p]];
      const b = bounds.ends[cols[p]];
      starts[2 * p] = a;
      ends[2 * p] = p === piece ? cutFrom : b;
      starts[2 * p + 1] = p === piece ? cutTo : b;
      ends[2 * p + 1] = b;
    }
  }
}
