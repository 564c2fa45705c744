import { EngineInputError } from '../hydraulics/errors';
import { factorOf, isUnitOf, scaleSeries, type UnitOption } from './unit-option';

export type TimeUnit = 's' | 'min' | 'h' | 'd';

export const TIME_UNITS: readonly UnitOption<TimeUnit>[] = [
  { id: 's', label: 's' },
  { id: 'min', label: 'min' },
  { id: 'h', label: 'h' },
  { id: 'd', label: 'd' },
];

const SECONDS_PER: Readonly<Record<TimeUnit, number>> = { s: 1, min: 60, h: 3600, d: 86400 };

export const isTimeUnit = (value: string): value is TimeUnit => isUnitOf(TIME_UNITS, value);

export function timeToSi(value: number, unit: TimeUnit): number {
  return value * factorOf(SECONDS_PER, unit, 'timeUnit');
}

export function timeFromSi(valueSeconds: number, unit: TimeUnit): number {
  return valueSeconds / factorOf(SECONDS_PER, unit, 'timeUnit');
}

export function timeSeriesToSi(values: ArrayLike<number>, unit: TimeUnit, out?: Float64Array): Float64Array {
  return scaleSeries(values, factorOf(SECONDS_PER, unit, 'timeUnit'), out);
}

/** How a time column is written: a number in a unit, a clock reading, or a timestamp. */
export type TimeColumnFormat = TimeUnit | 'mm:ss' | 'timestamp';

export const TIME_COLUMN_FORMATS: readonly UnitOption<TimeColumnFormat>[] = [
  ...TIME_UNITS.map((u) => ({ id: u.id, label: `elapsed, ${u.label}` })),
  { id: 'mm:ss', label: 'elapsed, mm:ss or h:mm:ss' },
  { id: 'timestamp', label: 'date and time' },
];

export const isTimeColumnFormat = (value: string): value is TimeColumnFormat => isUnitOf(TIME_COLUMN_FORMATS, value);

const CLOCK = /^\s*(-)?(?:(\d+):)?(\d+):(\d+(?:[.,]\d*)?)\s*$/;

/** Elapsed time written as mm:ss(.s) or h:mm:ss(.s), to seconds. */
export function parseClockDuration(text: string, field = 'time'): number {
  const m = CLOCK.exec(text);
  if (!m) throw new EngineInputError(field, `"${text}" is not a duration of the form mm:ss or h:mm:ss`);
  const hours = m[2] === undefined ? 0 : Number(m[2]);
  const minutes = Number(m[3]);
  const seconds = Number(m[4].replace(',', '.'));
  if (seconds >= 60) throw new EngineInputError(field, `"${text}" has ${seconds} seconds; the seconds field must be below 60`);
  if (m[2] !== undefined && minutes >= 60) {
    throw new EngineInputError(field, `"${text}" has ${minutes} minutes; with hours given the minutes field must be below 60`);
  }
  const total = hours * 3600 + minutes * 60 + seconds;
  return m[1] ? -total : total;
}

const ELAPSED_UNIT_WORDS: Readonly<Record<string, TimeUnit>> = {
  s: 's', sec: 's', secs: 's', second: 's', seconds: 's',
  min: 'min', mins: 'min', minute: 'min', minutes: 'min', m: 'min',
  h: 'h', hr: 'h', hrs: 'h', hour: 'h', hours: 'h',
};

/**
 * An elapsed time as a person writes it: "1:30" or "1:02:03" (mm:ss, h:mm:ss), "90 s", "1.5 min",
 * "2 h", or a bare number in `bareUnit`. A decimal comma is accepted.
 */
export function parseElapsedText(text: string, bareUnit: TimeUnit, field = 'time'): number {
  const t = text.trim();
  if (t.includes(':')) return parseClockDuration(t, field);
  const m = /^([+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+))\s*([a-z]*)\.?$/i.exec(t);
  const unit = m ? (m[2] === '' ? bareUnit : ELAPSED_UNIT_WORDS[m[2].toLowerCase()]) : undefined;
  if (!m || !unit) {
    throw new EngineInputError(field, `"${text}" is not an elapsed time: write mm:ss (1:30), h:mm:ss, or a number with s, min or h (90 s)`);
  }
  return timeToSi(Number(m[1].replace(',', '.')), unit);
}
