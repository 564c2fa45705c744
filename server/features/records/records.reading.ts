import { EngineInputError } from '@shared/hydraulics/errors';
import { reduceRecord, type BarometricSeries, type ReducedRecord, type ReductionSettings } from '@shared/hydraulics/reduction';
import { parseSeriesFromBytes, type ParsedSeries } from '@shared/records/parse';
import type { ColumnMapping, FileLayout } from '@shared/records/types';
import type { LoggerSettings, TapeBody } from '@shared/schemas/records';
import { isLengthUnit, lengthSeriesToSi, lengthToSi, type LengthUnit } from '@shared/units/length';
import { isPressureUnit, pascalsPer, pressureToWaterHeadM, STANDARD_GRAVITY, type PressureUnit } from '@shared/units/pressure';
import { parseClockDuration, parseElapsedText, timeToSi } from '@shared/units/time';
import { clockTimeToEpochSeconds } from '@shared/units/timestamp';
import { volumeToSi } from '@shared/units/volume';
import { lttbIndexes } from './lttb';

/** Everything an import produces before it is stored: the reduction and what to keep about it. */
export interface ReadRecord {
  reduced: ReducedRecord;
  clock: 'epoch' | 'elapsed';
  firstReadingSeconds: number;
  sampleCount: number;
  testDate: string | null;
  slugVolumeM3: number | null;
}

/** The value column in SI for the reference: metres for depth and vented, pascals for absolute. */
export function valuesToSi(values: Float64Array, unit: string, reference: ReductionSettings['reference'], densityKgM3: number, field: string): Float64Array {
  if (reference === 'depth') {
    if (!isLengthUnit(unit)) {
      throw new EngineInputError(field, `depth below the measuring point is a length: choose m, cm, mm, ft or in (got "${unit}")`);
    }
    return lengthSeriesToSi(values, unit, values);
  }
  if (reference === 'vented') {
    if (isLengthUnit(unit)) return lengthSeriesToSi(values, unit, values);
    if (isPressureUnit(unit)) {
      // A vented sensor's gauge pressure is the water column above it: h = P / (ρ g).
      const metresPer = pascalsPer(unit, densityKgM3) / (densityKgM3 * STANDARD_GRAVITY);
      for (let i = 0; i < values.length; i++) values[i] *= metresPer;
      return values;
    }
  } else {
    if (isPressureUnit(unit)) {
      const pa = pascalsPer(unit as PressureUnit, densityKgM3);
      for (let i = 0; i < values.length; i++) values[i] *= pa;
      return values;
    }
    if (isLengthUnit(unit)) {
      throw new EngineInputError(field, `an absolute sensor reads pressure: choose Pa, kPa, psi, mbar, hPa, mH2O or ftH2O (got "${unit}")`);
    }
  }
  throw new EngineInputError(field, `unknown unit "${unit}"`);
}

/** A record whose readings are all equal has nothing to recover from, whatever the static level. */
function requireDisplacement(values: Float64Array, field: string, unit: string): void {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (max - min <= 1e-9) {
    throw new EngineInputError(field, `shows no displacement: every reading is ${Number(min.toPrecision(6))} ${unit}; check the value column and its unit`);
  }
}

/** The calendar date of an instant in a time zone, YYYY-MM-DD. */
export function dateInZone(epochSeconds: number, timeZone: string): string | null {
  try {
    const parts = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(new Date(epochSeconds * 1000));
    const get = (t: string) => parts.find((p) => p.type === t)?.value ?? '';
    return `${get('year')}-${get('month')}-${get('day')}`;
  } catch {
    return null;
  }
}

function readFile(bytes: Uint8Array, layout: FileLayout, mapping: ColumnMapping, field: 'file' | 'barometric', mappingField: string, sampled = false): ParsedSeries {
  return parseSeriesFromBytes(bytes, layout, mapping, {
    field,
    what: field === 'file' ? 'The logger file' : 'The barometric file',
    mappingField,
    sampled,
  });
}

export interface LoggerInput {
  file: Uint8Array;
  barometric?: Uint8Array;
  settings: LoggerSettings;
  /** For previews: the files are the first part of longer ones. */
  sampled?: { file?: boolean; barometric?: boolean };
  /** For previews: leave the static level and test start to the engine. */
  suggestOnly?: boolean;
}

/** The barometric series on the record's clock, in pascals. */
export function readBarometric(input: LoggerInput, recordClock: 'epoch' | 'elapsed'): BarometricSeries | undefined {
  const { settings } = input;
  if (settings.reference !== 'absolute') {
    if (input.barometric) {
      throw new EngineInputError('barometric', 'is only used with an absolute (non-vented) sensor; choose the absolute reference or leave the barometric file out');
    }
    return undefined;
  }
  if (!input.barometric) return undefined;
  const b = settings.barometric;
  if (!b) throw new EngineInputError('settings.barometric', 'describe the barometric file: its layout, time and pressure columns and unit');
  const parsed = readFile(input.barometric, b.layout, b.mapping, 'barometric', 'settings.barometric.mapping', input.sampled?.barometric);
  if (parsed.clock !== recordClock) {
    throw new EngineInputError(
      'settings.barometric.mapping.time.format',
      recordClock === 'epoch'
        ? 'the logger file has dates and times, so the barometric file must be read by its dates and times too'
        : 'the logger file counts elapsed time, so the barometric file must count elapsed time on the same clock too',
    );
  }
  const pressurePa = valuesToSi(parsed.value, b.valueUnit, 'absolute', settings.waterDensityKgM3, 'settings.barometric.valueUnit');
  const timeSeconds = parsed.timeSeconds;
  if (b.clockOffsetSeconds !== 0) for (let i = 0; i < timeSeconds.length; i++) timeSeconds[i] += b.clockOffsetSeconds;
  return { timeSeconds, pressurePa };
}

/** The entered static level in metres, in the reference's terms; a pressure is the water's above the sensor, h = P / (ρ g). */
export function staticLevelToSi(level: { value: number; unit: string }, reference: ReductionSettings['reference'], densityKgM3: number): number {
  if (isLengthUnit(level.unit)) return lengthToSi(level.value, level.unit);
  if (isPressureUnit(level.unit)) {
    if (reference === 'depth') {
      throw new EngineInputError('settings.staticLevel.unit', `a depth below the measuring point is a length: choose m, cm, mm, ft or in (got "${level.unit}")`);
    }
    return pressureToWaterHeadM(level.value, level.unit, densityKgM3);
  }
  throw new EngineInputError('settings.staticLevel.unit', `unknown unit "${level.unit}"`);
}

/** The typed test start → seconds on the record's clock: a time of day for timestamps, an elapsed time after the first reading otherwise. */
function testStartFromText(text: string, clock: 'epoch' | 'elapsed', timeZone: string, times: Float64Array): number {
  const field = 'settings.testStartText';
  const first = times[0];
  const last = times[times.length - 1];
  const at = clock === 'epoch' ? clockTimeToEpochSeconds(text, timeZone, first, field) : first + parseElapsedText(text, 's', field);
  if (at < first || at > last) {
    const span = clock === 'epoch' ? `${new Date(first * 1000).toISOString()} to ${new Date(last * 1000).toISOString()} (UTC)` : `0 to ${Number((last - first).toPrecision(6))} s after the first reading`;
    throw new EngineInputError(field, `"${text}" is outside the record, which runs from ${span}`);
  }
  return at;
}

/** A logger upload → the engine's reduction. Throws EngineInputError (including RecordFileError) for bad input. */
export function readLogger(input: LoggerInput): ReadRecord {
  const { settings } = input;
  const parsed = readFile(input.file, settings.layout, settings.mapping, 'file', 'settings.mapping', input.sampled?.file);
  const value = valuesToSi(parsed.value, settings.valueUnit, settings.reference, settings.waterDensityKgM3, 'settings.valueUnit');
  if (settings.reference !== 'absolute') requireDisplacement(value, 'file', 'm');
  const barometric = readBarometric(input, parsed.clock);
  const first = parsed.timeSeconds[0];
  const reduction: ReductionSettings = {
    reference: settings.reference,
    waterDensityKgM3: settings.waterDensityKgM3,
    ...(barometric ? { barometric } : {}),
    ...(!input.suggestOnly && settings.staticLevel ? { staticLevelM: staticLevelToSi(settings.staticLevel, settings.reference, settings.waterDensityKgM3) } : {}),
    ...(!input.suggestOnly && settings.testStartSeconds !== undefined ? { testStartSeconds: first + settings.testStartSeconds } : {}),
    ...(!input.suggestOnly && settings.testStartText !== undefined
      ? { testStartSeconds: testStartFromText(settings.testStartText, parsed.clock, settings.mapping.time.timeZone ?? 'UTC', parsed.timeSeconds) }
      : {}),
  };
  const reduced = reduceWithFields(parsed.timeSeconds, value, reduction, 'logger');
  const zone = settings.mapping.time.timeZone ?? 'UTC';
  return {
    reduced,
    clock: parsed.clock,
    firstReadingSeconds: first,
    sampleCount: parsed.timeSeconds.length,
    testDate: settings.testDate ?? (parsed.clock === 'epoch' ? dateInZone(reduced.testStartSeconds, zone) : null),
    slugVolumeM3: settings.slugVolume ? volumeToSi(settings.slugVolume.value, settings.slugVolume.unit) : null,
  };
}

/** Points of the preview's curve: enough to see a step and the recovery, few enough to send at each change. */
export const PREVIEW_CURVE_POINTS = 400;

/**
 * The logger record as read, before any reduction, for the preview's curve: seconds after the
 * first reading and the value in SI for the reference (m, or Pa for absolute), LTTB-decimated so
 * the step and the recovery keep their shape. Read even where the test start cannot be found, so
 * the candidates can be shown on it.
 */
export function loggerCurve(input: LoggerInput): { secondsAfterFirst: number[]; value: number[]; unit: 'm' | 'Pa'; readings: number } {
  const { settings } = input;
  const parsed = readFile(input.file, settings.layout, settings.mapping, 'file', 'settings.mapping', input.sampled?.file);
  const value = valuesToSi(parsed.value, settings.valueUnit, settings.reference, settings.waterDensityKgM3, 'settings.valueUnit');
  const n = parsed.timeSeconds.length;
  const keep = lttbIndexes(parsed.timeSeconds, value, n, Math.min(n, PREVIEW_CURVE_POINTS));
  const first = parsed.timeSeconds[0];
  return {
    secondsAfterFirst: Array.from(keep, (i) => parsed.timeSeconds[i] - first),
    value: Array.from(keep, (i) => value[i]),
    unit: settings.reference === 'absolute' ? 'Pa' : 'm',
    readings: n,
  };
}

/** Engine fields → the request's fields, so a 400 points at what the user sent. */
const LOGGER_FIELDS: Readonly<Record<string, string>> = {
  record: 'file',
  'record.timeSeconds': 'file',
  'record.value': 'file',
  'barometric.timeSeconds': 'barometric',
  'barometric.pressurePa': 'barometric',
  staticLevelM: 'settings.staticLevel',
  testStartSeconds: 'settings.testStartSeconds',
  waterDensityKgM3: 'settings.waterDensityKgM3',
  reference: 'settings.reference',
};
const TAPE_FIELDS: Readonly<Record<string, string>> = {
  record: 'readings',
  'record.timeSeconds': 'readings',
  'record.value': 'readings',
  staticLevelM: 'static',
  testStartSeconds: 'testStart',
};

function reduceWithFields(t: Float64Array, v: Float64Array, settings: ReductionSettings, kind: 'logger' | 'tape'): ReducedRecord {
  try {
    return reduceRecord({ timeSeconds: t, value: v }, settings);
  } catch (e) {
    if (e instanceof EngineInputError) {
      const map = kind === 'logger' ? LOGGER_FIELDS : TAPE_FIELDS;
      const field = map[e.field];
      if (field) throw new EngineInputError(field, e.problem, { code: e.code, details: e.details ? { ...e.details } : undefined });
    }
    throw e;
  }
}

function tapeSeconds(value: number | string, format: TapeBody['timeFormat'], field: string): number {
  if (format === 'mm:ss') {
    if (typeof value === 'number') throw new EngineInputError(field, `${value} is not written as mm:ss`);
    return parseClockDuration(value, field);
  }
  const n = typeof value === 'number' ? value : Number(value.replace(',', '.'));
  if (!Number.isFinite(n)) throw new EngineInputError(field, `"${value}" is not a number of ${format === 's' ? 'seconds' : 'minutes'}`);
  return timeToSi(n, format);
}

/** The tape test start: in the readings' time format, or as elapsed-time text (1:30, 90 s, 1.5 min). */
function tapeStartSeconds(value: number | string, format: TapeBody['timeFormat']): number {
  if (typeof value === 'number') return tapeSeconds(value, format, 'testStart');
  return parseElapsedText(value, format === 'min' ? 'min' : 's', 'testStart');
}

/** Typed tape readings → the engine's reduction, with errors naming the reading (readings.3.time). */
export function readTape(body: TapeBody): ReadRecord {
  const n = body.readings.length;
  const t = new Float64Array(n);
  const v = new Float64Array(n);
  const unit = body.units as LengthUnit;
  for (let i = 0; i < n; i++) {
    const r = body.readings[i];
    t[i] = tapeSeconds(r.time, body.timeFormat, `readings.${i}.time`);
    if (i > 0 && !(t[i] > t[i - 1])) {
      throw new EngineInputError(
        `readings.${i}.time`,
        `reading ${i + 1} (${String(r.time)}) does not come after reading ${i} (${String(body.readings[i - 1].time)}); times must increase`,
      );
    }
    v[i] = lengthToSi(r.depth, unit);
  }
  requireDisplacement(v, 'readings', 'm');
  const reduction: ReductionSettings = {
    reference: 'depth',
    ...(body.static !== undefined ? { staticLevelM: lengthToSi(body.static, unit) } : {}),
    ...(body.testStart !== undefined ? { testStartSeconds: tapeStartSeconds(body.testStart, body.timeFormat) } : {}),
  };
  const reduced = reduceWithFields(t, v, reduction, 'tape');
  return {
    reduced,
    clock: 'elapsed',
    firstReadingSeconds: t[0],
    sampleCount: n,
    testDate: body.testDate ?? null,
    slugVolumeM3: body.slugVolume ? volumeToSi(body.slugVolume.value, body.slugVolume.unit) : null,
  };
}

/** The typed readings as a CSV, kept as the record's raw file: what was typed, as typed. */
export function tapeCsv(body: TapeBody): string {
  const timeHeader = body.timeFormat === 'mm:ss' ? 'time (mm:ss)' : `time (${body.timeFormat})`;
  const lines = [`${timeHeader},depth to water below measuring point (${body.units})`];
  for (const r of body.readings) lines.push(`${String(r.time)},${r.depth}`);
  return `${lines.join('\r\n')}\r\n`;
}
