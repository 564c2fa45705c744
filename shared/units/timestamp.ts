import { EngineInputError } from '../hydraulics/errors';
import type { UnitOption } from './unit-option';

export type TimestampLayout = 'iso' | 'ymd' | 'mdy' | 'dmy';

export const TIMESTAMP_LAYOUTS: readonly UnitOption<TimestampLayout>[] = [
  { id: 'iso', label: 'ISO 8601 — 2024-05-01T13:45:00[.sss][Z|±hh:mm]' },
  { id: 'ymd', label: 'YYYY/MM/DD hh:mm:ss' },
  { id: 'mdy', label: 'MM/DD/YYYY hh:mm:ss [AM|PM]' },
  { id: 'dmy', label: 'DD/MM/YYYY or DD.MM.YYYY hh:mm:ss' },
];

export interface TimestampOptions {
  layout: TimestampLayout;
  /** IANA zone for timestamps that carry no offset, e.g. "America/Chicago"; default "UTC". */
  timeZone?: string;
}

const TIME_PART = String.raw`(?:[T ]+(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?\s*([AaPp][Mm])?)?`;
const OFFSET_PART = String.raw`\s*(Z|z|[+-]\d{2}(?::?\d{2})?)?`;

const DATE_PARTS: Readonly<Record<TimestampLayout, { re: RegExp; order: readonly [number, number, number] }>> = {
  // order gives the capture index of [year, month, day]
  iso: { re: new RegExp(String.raw`^\s*(\d{4})-(\d{2})-(\d{2})` + TIME_PART + OFFSET_PART + String.raw`\s*$`), order: [1, 2, 3] },
  ymd: { re: new RegExp(String.raw`^\s*(\d{4})/(\d{1,2})/(\d{1,2})` + TIME_PART + OFFSET_PART + String.raw`\s*$`), order: [1, 2, 3] },
  mdy: { re: new RegExp(String.raw`^\s*(\d{1,2})/(\d{1,2})/(\d{4})` + TIME_PART + OFFSET_PART + String.raw`\s*$`), order: [3, 1, 2] },
  dmy: { re: new RegExp(String.raw`^\s*(\d{1,2})[./-](\d{1,2})[./-](\d{4})` + TIME_PART + OFFSET_PART + String.raw`\s*$`), order: [3, 2, 1] },
};

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    try {
      f = new Intl.DateTimeFormat('en-US', {
        timeZone,
        hourCycle: 'h23',
        year: 'numeric',
        month: 'numeric',
        day: 'numeric',
        hour: 'numeric',
        minute: 'numeric',
        second: 'numeric',
      });
    } catch {
      throw new EngineInputError('timeZone', `"${timeZone}" is not an IANA time zone known to this runtime`);
    }
    formatters.set(timeZone, f);
  }
  return f;
}

/** Offset of `timeZone` from UTC at the instant `utcMs`, in milliseconds (east positive). */
export function zoneOffsetMs(timeZone: string, utcMs: number): number {
  const parts = formatterFor(timeZone).formatToParts(new Date(utcMs));
  let y = 0, mo = 0, d = 0, h = 0, mi = 0, s = 0;
  for (const p of parts) {
    if (p.type === 'year') y = Number(p.value);
    else if (p.type === 'month') mo = Number(p.value);
    else if (p.type === 'day') d = Number(p.value);
    else if (p.type === 'hour') h = Number(p.value);
    else if (p.type === 'minute') mi = Number(p.value);
    else if (p.type === 'second') s = Number(p.value);
  }
  const wholeSecondMs = Math.floor(utcMs / 1000) * 1000;
  return Date.UTC(y, mo - 1, d, h, mi, s) - wholeSecondMs;
}

const DAY_MS = 86_400_000;

/**
 * The UTC instant of a wall-clock time in `timeZone`. A wall time that occurs twice (clocks set
 * back) resolves to the earlier instant; one that never occurs (clocks set forward) is read with
 * the offset in force before the change, so it lands after the gap.
 */
function zonedWallToUtcMs(timeZone: string, wallAsUtcMs: number): number {
  const before = zoneOffsetMs(timeZone, wallAsUtcMs - DAY_MS);
  const after = zoneOffsetMs(timeZone, wallAsUtcMs + DAY_MS);
  const candidates: number[] = [];
  for (const offset of before === after ? [before] : [before, after]) {
    const utc = wallAsUtcMs - offset;
    if (zoneOffsetMs(timeZone, utc) === offset) candidates.push(utc);
  }
  if (candidates.length === 0) return wallAsUtcMs - before;
  return Math.min(...candidates);
}

function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/**
 * A parser for one time column: returns seconds since 1970-01-01T00:00Z. Zone offsets are cached
 * per wall-clock minute, so a long logger file costs one Intl lookup per minute, not per row.
 */
export function createTimestampParser(options: TimestampOptions): (text: string, field?: string) => number {
  const layout = DATE_PARTS[options.layout];
  if (!layout) {
    throw new EngineInputError('timestampLayout', `unknown layout "${options.layout}" (expected one of ${Object.keys(DATE_PARTS).join(', ')})`);
  }
  const timeZone = options.timeZone ?? 'UTC';
  formatterFor(timeZone);
  const offsetByWallMinute = new Map<number, number>();

  return (text: string, field = 'time'): number => {
    const m = layout.re.exec(text);
    if (!m) throw new EngineInputError(field, `"${text}" does not match the timestamp layout ${options.layout}`);
    const [yi, moi, di] = layout.order;
    const year = Number(m[yi]);
    const month = Number(m[moi]);
    const day = Number(m[di]);
    let hour = m[4] === undefined ? 0 : Number(m[4]);
    const minute = m[5] === undefined ? 0 : Number(m[5]);
    const second = m[6] === undefined ? 0 : Number(m[6]);
    const fraction = m[7] === undefined ? 0 : Number(`0.${m[7]}`);
    const meridiem = m[8]?.toUpperCase();
    if (meridiem) {
      if (hour < 1 || hour > 12) throw new EngineInputError(field, `"${text}" has hour ${hour}; with AM/PM it must be 1–12`);
      hour = (hour % 12) + (meridiem === 'PM' ? 12 : 0);
    }
    if (month < 1 || month > 12) throw new EngineInputError(field, `"${text}" has month ${month}`);
    if (day < 1 || day > daysInMonth(year, month)) throw new EngineInputError(field, `"${text}" has day ${day}, not in that month`);
    if (hour > 23 || minute > 59 || second > 59) throw new EngineInputError(field, `"${text}" is not a valid time of day`);

    const wallMinuteMs = Date.UTC(year, month - 1, day, hour, minute, 0);
    const offsetText = m[9];
    let offsetMs: number;
    if (offsetText !== undefined) {
      offsetMs = parseOffsetMs(offsetText);
    } else {
      const cached = offsetByWallMinute.get(wallMinuteMs);
      if (cached === undefined) {
        offsetMs = wallMinuteMs - zonedWallToUtcMs(timeZone, wallMinuteMs);
        offsetByWallMinute.set(wallMinuteMs, offsetMs);
      } else {
        offsetMs = cached;
      }
    }
    return (wallMinuteMs - offsetMs) / 1000 + second + fraction;
  };
}

function parseOffsetMs(text: string): number {
  if (text === 'Z' || text === 'z') return 0;
  const sign = text[0] === '-' ? -1 : 1;
  const digits = text.slice(1).replace(':', '');
  const hours = Number(digits.slice(0, 2));
  const minutes = digits.length > 2 ? Number(digits.slice(2, 4)) : 0;
  return sign * (hours * 60 + minutes) * 60_000;
}

export function parseTimestamp(text: string, options: TimestampOptions): number {
  return createTimestampParser(options)(text);
}

const CLOCK_TIME = /^\s*(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?\s*([AaPp][Mm])?\s*$/;

/**
 * A time of day typed for a timestamped record ("14:32", "14:32:05", "2:32 PM"), as seconds since
 * 1970 in the record's time zone: on the calendar day of `fromSeconds` (the first reading), or the
 * next day when that falls before it (a record that runs past midnight). A full timestamp in ISO
 * form (2026-11-20 14:32:05) is read as it stands.
 */
export function clockTimeToEpochSeconds(text: string, timeZone: string, fromSeconds: number, field = 'time'): number {
  if (/^\s*\d{4}-\d{2}-\d{2}/.test(text)) return createTimestampParser({ layout: 'iso', timeZone })(text.trim(), field);
  const m = CLOCK_TIME.exec(text);
  if (!m) throw new EngineInputError(field, `"${text}" is not a time of day: write hh:mm or hh:mm:ss (14:32:05), or a date and time (2026-11-20 14:32:05)`);
  let hour = Number(m[1]);
  const minute = Number(m[2]);
  const second = m[3] === undefined ? 0 : Number(m[3]) + (m[4] === undefined ? 0 : Number(`0.${m[4]}`));
  if (m[5]) {
    if (hour < 1 || hour > 12) throw new EngineInputError(field, `"${text}" has hour ${hour}; with AM/PM it must be 1–12`);
    hour = (hour % 12) + (m[5].toUpperCase() === 'PM' ? 12 : 0);
  }
  if (hour > 23 || minute > 59 || second >= 60) throw new EngineInputError(field, `"${text}" is not a valid time of day`);
  const fromMs = fromSeconds * 1000;
  const dayStartWallMs = Math.floor((fromMs + zoneOffsetMs(timeZone, fromMs)) / DAY_MS) * DAY_MS;
  const at = (dayWallMs: number) => zonedWallToUtcMs(timeZone, dayWallMs + (hour * 60 + minute) * 60_000) / 1000 + second;
  const sameDay = at(dayStartWallMs);
  return sameDay < fromSeconds - 0.5 ? at(dayStartWallMs + DAY_MS) : sameDay;
}
