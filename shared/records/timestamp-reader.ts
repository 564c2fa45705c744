import { EngineInputError } from '../hydraulics/errors';
import { createTimestampParser, type TimestampLayout } from '../units/timestamp';
import type { FieldBounds } from './tokenize';

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

/**
 * Reads a timestamp spread over one or more columns (a full date and time, or date + time of day
 * [+ AM/PM]) with the shared timestamp parser, but only once per wall-clock minute: the seconds
 * are read from the text directly and added to the minute's instant, so a long logger file costs
 * one regular-expression match per minute, not per row, and nothing is allocated per row.
 */
export class TimestampReader {
  private readonly parse: (text: string, field?: string) => number;
  /** The cached minute: each column's text (the seconds column cut before its seconds), then what follows the seconds. */
  private keyPieces: string[] = [];
  private keyPiece = -1;
  private keyEpoch = NaN;

  constructor(
    layout: TimestampLayout,
    timeZone: string,
    private readonly columns: readonly number[],
  ) {
    this.parse = createTimestampParser({ layout, timeZone });
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
    let piece = -1;
    let secondsStart = -1;
    for (let p = 0; p < cols.length && piece < 0; p++) {
      const a = bounds.starts[cols[p]];
      const b = bounds.ends[cols[p]];
      const c1 = text.indexOf(':', a);
      if (c1 < 0 || c1 >= b) continue;
      const c2 = text.indexOf(':', c1 + 1);
      if (c2 < 0 || c2 >= b) continue;
      piece = p;
      secondsStart = c2 + 1;
    }
    if (piece < 0) return this.parse(this.fullText(text, bounds));

    const pieceEnd = bounds.ends[cols[piece]];
    if (secondsStart + 2 > pieceEnd) return this.parse(this.fullText(text, bounds));
    const d1 = text.charCodeAt(secondsStart) - 48;
    const d2 = text.charCodeAt(secondsStart + 1) - 48;
    if (d1 < 0 || d1 > 5 || d2 < 0 || d2 > 9) return this.parse(this.fullText(text, bounds));
    const whole = d1 * 10 + d2;
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
      const n = k - fractionStart;
      if (n === 0 || n > 15) return this.parse(this.fullText(text, bounds));
      // digits / 10^n is one correctly rounded division: exactly Number("0.<digits>"), as the
      // shared parser reads the fraction, so both paths give the same instant to the last bit.
      fraction = digits / POW10[n];
    }
    const secondsEnd = k;

    // Is this the cached minute? Compare every piece with the seconds cut out (no allocation).
    const key = this.keyPieces;
    let same = key.length === cols.length + 1;
    for (let p = 0; p < cols.length && same; p++) {
      const a = bounds.starts[cols[p]];
      const b = bounds.ends[cols[p]];
      if (p === piece) {
        same = secondsStart - a === key[p].length && text.startsWith(key[p], a) && b - secondsEnd === key[cols.length].length && text.startsWith(key[cols.length], secondsEnd);
      } else {
        same = b - a === key[p].length && text.startsWith(key[p], a);
      }
    }
    if (same && this.keyPiece === piece) return this.keyEpoch + whole + fraction;

    const pieces: string[] = [];
    const minuteParts: string[] = [];
    for (let p = 0; p < cols.length; p++) {
      const a = bounds.starts[cols[p]];
      const b = bounds.ends[cols[p]];
      if (p === piece) {
        pieces.push(text.slice(a, secondsStart));
        minuteParts.push(`${text.slice(a, secondsStart)}00${text.slice(secondsEnd, b)}`);
      } else {
        pieces.push(text.slice(a, b));
        minuteParts.push(text.slice(a, b));
      }
    }
    pieces.push(text.slice(secondsEnd, pieceEnd));
    let minuteEpoch: number;
    try {
      minuteEpoch = this.parse(minuteParts.join(' '));
    } catch (e) {
      // Report the text as written, not the minute built from it.
      if (e instanceof EngineInputError) return this.parse(this.fullText(text, bounds));
      throw e;
    }
    this.keyPieces = pieces;
    this.keyPiece = piece;
    this.keyEpoch = minuteEpoch;
    return minuteEpoch + whole + fraction;
  }
}
