import { z } from 'zod';
import { REFERENCE_MODES, type ReferenceMode } from '../hydraulics/reduction';
import { LENGTH_UNITS, isLengthUnit, type LengthUnit } from '../units/length';
import { PRESSURE_UNITS, isPressureUnit } from '../units/pressure';
import { TIME_COLUMN_FORMATS, type TimeColumnFormat } from '../units/time';
import { TIMESTAMP_LAYOUTS, type TimestampLayout } from '../units/timestamp';
import { VOLUME_UNITS, type VolumeUnit } from '../units/volume';
import { DELIMITERS, type Delimiter } from '../records/tokenize';
import type { ColumnMapping, FileLayout } from '../records/types';
import { isoDateTime } from './common';

const ids = <T extends string>(options: readonly { id: T }[]) => options.map((o) => o.id) as [T, ...T[]];

export const RECORD_TEST_TYPES = ['slug-in', 'slug-out', 'bail-down', 'pneumatic'] as const;
export type RecordTestType = (typeof RECORD_TEST_TYPES)[number];
export const RECORD_TEST_TYPE_LABELS: Record<RecordTestType, string> = {
  'slug-in': 'Slug test, slug in (falling-head)',
  'slug-out': 'Slug test, slug out (rising-head)',
  'bail-down': 'Bail-down test (rising-head)',
  pneumatic: 'Pneumatic slug test',
};
export const testTypeSchema = z.enum(RECORD_TEST_TYPES, { error: 'Choose slug-in, slug-out, bail-down or pneumatic' });

export const RECORD_SOURCES = ['tape', 'logger'] as const;
export type RecordSource = (typeof RECORD_SOURCES)[number];

export const referenceModeSchema = z.enum(ids(REFERENCE_MODES) as [ReferenceMode, ...ReferenceMode[]], {
  error: 'Choose depth (below the measuring point), vented (head above a vented sensor) or absolute (pressure with a barometric file)',
});

export const delimiterSchema = z.enum(ids(DELIMITERS) as [Delimiter, ...Delimiter[]], { error: 'Choose comma, semicolon, tab or whitespace' });
export const timestampLayoutSchema = z.enum(ids(TIMESTAMP_LAYOUTS) as [TimestampLayout, ...TimestampLayout[]], {
  error: 'Choose a date layout: iso, ymd, mdy or dmy',
});
export const timeColumnFormatSchema = z.enum(ids(TIME_COLUMN_FORMATS) as [TimeColumnFormat, ...TimeColumnFormat[]], {
  error: 'Choose how time is written: s, min, h, d (elapsed), mm:ss, or timestamp',
});
export const lengthUnitIdSchema = z.enum(ids(LENGTH_UNITS) as [LengthUnit, ...LengthUnit[]], { error: 'Choose a length unit: m, cm, mm, ft or in' });
export const volumeUnitSchema = z.enum(ids(VOLUME_UNITS) as [VolumeUnit, ...VolumeUnit[]], { error: 'Choose a volume unit: L, m3, USgal or ft3' });

const VALUE_UNIT_IDS = [...LENGTH_UNITS.map((u) => u.id), ...PRESSURE_UNITS.map((u) => u.id)];
/** The unit of a logger's value column: a length (depth, head) or a pressure. */
export const valueUnitSchema = z
  .string({ error: 'Choose the unit of the value column' })
  .superRefine((u, ctx) => {
    if (!isLengthUnit(u) && !isPressureUnit(u)) {
      ctx.addIssue({ code: 'custom', message: `unknown unit "${u}"; expected one of ${VALUE_UNIT_IDS.join(', ')}` });
    }
  });

const lineNumber = z.number({ error: 'must be a line number' }).int('must be a whole line number').min(1, 'line numbers start at 1');
const columnIndex = z.number({ error: 'must be a column index' }).int('must be a whole column index').min(0, 'column indexes start at 0');

export const fileLayoutSchema = z
  .object({
    delimiter: delimiterSchema,
    headerLine: lineNumber.nullable(),
    unitsLine: lineNumber.nullable().default(null),
    firstDataLine: lineNumber,
    lastDataLine: lineNumber.nullable().default(null),
    decimalComma: z.boolean().default(false),
  })
  .superRefine((l, ctx) => {
    if (l.headerLine !== null && l.headerLine >= l.firstDataLine) {
      ctx.addIssue({ code: 'custom', path: ['headerLine'], message: `the header (line ${l.headerLine}) must come before the first reading (line ${l.firstDataLine})` });
    }
    if (l.unitsLine !== null && (l.unitsLine >= l.firstDataLine || (l.headerLine !== null && l.unitsLine <= l.headerLine))) {
      ctx.addIssue({ code: 'custom', path: ['unitsLine'], message: 'the units line must come after the header and before the first reading' });
    }
    if (l.lastDataLine !== null && l.lastDataLine < l.firstDataLine) {
      ctx.addIssue({ code: 'custom', path: ['lastDataLine'], message: 'the last reading cannot come before the first' });
    }
    if (l.decimalComma && l.delimiter === 'comma') {
      ctx.addIssue({ code: 'custom', path: ['decimalComma'], message: 'a decimal comma needs another delimiter (semicolon, tab or spaces)' });
    }
  }) satisfies z.ZodType<FileLayout, unknown>;

export const timeMappingSchema = z
  .object({
    columns: z.array(columnIndex).min(1, 'choose the time column').max(3, 'a time is read from at most 3 columns (date, time, AM/PM)'),
    format: timeColumnFormatSchema,
    timestampLayout: timestampLayoutSchema.optional(),
    timeZone: z.string().trim().min(1).max(64).default('UTC'),
  })
  .superRefine((t, ctx) => {
    if (t.format === 'timestamp' && !t.timestampLayout) {
      ctx.addIssue({ code: 'custom', path: ['timestampLayout'], message: 'choose the date layout of the timestamps' });
    }
  });

export const columnMappingSchema = z.object({ time: timeMappingSchema, valueColumn: columnIndex }) satisfies z.ZodType<ColumnMapping, unknown>;

const finite = (label: string) => z.number({ error: `${label} must be a number` }).refine(Number.isFinite, `${label} must be a finite number`);
export const lengthValueSchema = z.object({ value: finite('The value'), unit: lengthUnitIdSchema });
/** A static level: a length in the reference's terms, or (vented and absolute sensors) the water's gauge pressure above the sensor. */
export const staticLevelSchema = z.object({
  value: finite('Static level'),
  unit: z.string({ error: 'Choose the unit of the static level' }).refine(
    (u) => isLengthUnit(u) || isPressureUnit(u),
    'Static level unit must be a length (m, cm, mm, ft, in) or a pressure (Pa, kPa, psi, mbar, hPa, mH2O, ftH2O)',
  ),
});
export const volumeValueSchema = z.object({ value: finite('Slug volume').refine((v) => v > 0, 'Slug volume must be greater than 0'), unit: volumeUnitSchema });

const testDateSchema = z.iso.date({ error: 'Test date must be a date, YYYY-MM-DD' });

/** What every record carries besides its readings. */
export const recordMetaSchema = z.object({
  testType: testTypeSchema,
  testDate: testDateSchema.optional(),
  fieldCrew: z.string().trim().max(200, 'Field crew must be at most 200 characters').default(''),
  notes: z.string().trim().max(4000, 'Notes must be at most 4000 characters').default(''),
  slugVolume: volumeValueSchema.optional(),
});

export const barometricSettingsSchema = z.object({
  layout: fileLayoutSchema,
  mapping: columnMappingSchema,
  valueUnit: valueUnitSchema.refine((u) => isPressureUnit(u), 'a barometric record is a pressure: choose Pa, kPa, psi, mbar, hPa, mH2O or ftH2O'),
  /** Added to the barometer's times to put them on the record's clock (a logger set to another zone or clock). */
  clockOffsetSeconds: finite('Clock offset').default(0),
});

/** The "settings" JSON of a logger upload. */
export const loggerSettingsSchema = recordMetaSchema.extend({
  reference: referenceModeSchema,
  layout: fileLayoutSchema,
  mapping: columnMappingSchema,
  valueUnit: valueUnitSchema,
  /**
   * In the reference's terms: depth below the measuring point, or head above the sensor — for a
   * vented or absolute sensor also as the water's pressure above the sensor in a pressure unit
   * (converted with the water density). Omitted: the mean of the pre-test readings.
   */
  staticLevel: staticLevelSchema.optional(),
  /** Seconds after the first reading. Omitted: detected at the step. */
  testStartSeconds: finite('Test start').refine((v) => v >= 0, 'Test start cannot be before the first reading').optional(),
  /**
   * The test start as the crew wrote it: a time of day (14:32:05, in the time column's zone) for a
   * record with timestamps, or an elapsed time after the first reading (1:30, 90 s) otherwise.
   */
  testStartText: z.string({ error: 'Test start must be text' }).trim().min(1, 'Test start is empty').max(40, 'Test start must be at most 40 characters').optional(),
  waterDensityKgM3: finite('Water density').refine((v) => v >= 900 && v <= 1100, 'Water density must lie between 900 and 1100 kg/m³').default(1000),
  barometric: barometricSettingsSchema.optional(),
}).refine((v) => v.testStartSeconds === undefined || v.testStartText === undefined, {
  path: ['testStartText'],
  message: 'Give the test start once: as seconds after the first reading or as a time, not both',
});
export type LoggerSettings = z.output<typeof loggerSettingsSchema>;
export type LoggerSettingsInput = z.input<typeof loggerSettingsSchema>;

export const TAPE_TIME_FORMATS = ['s', 'min', 'mm:ss'] as const;
export type TapeTimeFormat = (typeof TAPE_TIME_FORMATS)[number];
export const MAX_TAPE_READINGS = 5000;

export const tapeReadingSchema = z.object({
  time: z.union([z.number().refine(Number.isFinite, 'must be a finite number'), z.string().trim().min(1, 'enter the time')], {
    error: 'enter the time as a number or mm:ss',
  }),
  depth: finite('Depth'),
});

/** Tape readings typed into the grid: depth to water below the measuring point. */
export const tapeBodySchema = recordMetaSchema.extend({
  source: z.literal('tape').default('tape'),
  readings: z
    .array(tapeReadingSchema, { error: 'readings must be a list of { time, depth }' })
    .min(3, 'Enter at least 3 readings')
    .max(MAX_TAPE_READINGS, `At most ${MAX_TAPE_READINGS} readings can be typed; upload a logger file for more`),
  timeFormat: z.enum(TAPE_TIME_FORMATS, { error: 'Choose how time is written: s, min or mm:ss' }),
  units: lengthUnitIdSchema,
  /** Static water level, depth below the measuring point in `units`. Omitted: the mean of readings before the test start. */
  static: finite('Static level').optional(),
  /** In the readings' time format, or as elapsed-time text (1:30, 90 s, 1.5 min). Omitted: detected at the largest step. */
  testStart: z.union([finite('Test start'), z.string().trim().min(1)]).optional(),
});
export type TapeBody = z.output<typeof tapeBodySchema>;
export type TapeBodyInput = z.input<typeof tapeBodySchema>;

export const recordFileSchema = z.object({
  which: z.enum(['raw', 'barometric']),
  name: z.string(),
  mediaType: z.string(),
  sizeBytes: z.number().int(),
  sha256: z.string(),
});
export type RecordFileInfo = z.infer<typeof recordFileSchema>;

export const recordSchema = z.object({
  id: z.string(),
  siteId: z.string(),
  wellId: z.string(),
  wellName: z.string(),
  testType: testTypeSchema,
  source: z.enum(RECORD_SOURCES),
  reference: referenceModeSchema,
  direction: z.enum(['rising-head', 'falling-head']),
  testDate: z.string().nullable(),
  /** The test start as an instant, when the record has timestamps. */
  startedAt: isoDateTime.nullable(),
  fieldCrew: z.string(),
  notes: z.string(),
  sampleCount: z.number().int(),
  h0M: z.number(),
  /** H0 expected from the slug volume and the casing radius, when a slug volume was given. */
  expectedH0M: z.number().nullable(),
  staticLevelM: z.number(),
  staticSource: z.enum(['entered', 'pre-test']),
  /** Seconds after the first reading. */
  testStartSeconds: z.number(),
  testStartSource: z.enum(['entered', 'detected']),
  preTestCount: z.number().int(),
  /** From the test start to the last reading. */
  durationSeconds: z.number(),
  clock: z.enum(['epoch', 'elapsed']),
  settings: z.record(z.string(), z.unknown()),
  files: z.array(recordFileSchema),
  warnings: z.array(z.string()),
  createdBy: z.object({ id: z.string(), name: z.string() }).nullable(),
  createdAt: isoDateTime,
  isDemo: z.boolean(),
});
export type RecordDto = z.infer<typeof recordSchema>;
export const recordListSchema = z.object({ records: z.array(recordSchema) });

export const seriesQuerySchema = z.object({
  /** log: LTTB on log10 H/H0 of the readings above static (a semi-log plot); linear: on H/H0 itself, every reading from the start. */
  scale: z.enum(['log', 'linear'], { error: 'scale must be log or linear' }).default('log'),
  points: z.coerce
    .number({ error: 'points must be a number' })
    .int('points must be a whole number')
    .min(3, 'points must be at least 3')
    .max(20000, 'points must be at most 20000')
    .default(2000),
});

export const seriesSchema = z.object({
  recordId: z.string(),
  scale: z.enum(['log', 'linear']).optional(),
  /** Every reading of the record. */
  readings: z.number().int(),
  /** Readings the plot can show: from the test start on, with H/H0 > 0 on a log axis. */
  plottable: z.number().int(),
  /** Readings before the test start, or (log) at or below static, left out. */
  omitted: z.number().int(),
  /** Readings after the test start at or below static (H/H0 ≤ 0): many of them mean the water overshot static, as in an oscillating response. */
  belowStatic: z.number().int().optional(),
  /** Indexes into the arrays where the curve starts again after readings left out (a log plot breaks its line there). */
  segmentStarts: z.array(z.number().int()).optional(),
  /** Seconds from the test start. */
  elapsedSeconds: z.array(z.number()),
  normalizedHead: z.array(z.number()),
});
export type Series = z.infer<typeof seriesSchema>;

export const fileQuerySchema = z.object({ which: z.enum(['raw', 'barometric'], { error: 'which must be raw or barometric' }).default('raw') });

/** Preview settings: any part of the logger settings the user has already chosen. */
export const previewSettingsSchema = z.object({
  layout: fileLayoutSchema.optional(),
  mapping: columnMappingSchema.optional(),
  valueUnit: valueUnitSchema.optional(),
  reference: referenceModeSchema.optional(),
  waterDensityKgM3: finite('Water density').optional(),
  barometric: z
    .object({
      layout: fileLayoutSchema.optional(),
      mapping: columnMappingSchema.optional(),
      valueUnit: valueUnitSchema.optional(),
      clockOffsetSeconds: finite('Clock offset').optional(),
    })
    .optional(),
});
export type PreviewSettings = z.input<typeof previewSettingsSchema>;

const recognisedUnitSchema = z.object({ quantity: z.enum(['length', 'pressure', 'time']), id: z.string() }).nullable();

export const filePreviewSchema = z.object({
  name: z.string(),
  sizeBytes: z.number().int(),
  encoding: z.string(),
  /** Only the start of the file was sent; figures are for that part. */
  sampled: z.boolean(),
  totalLines: z.number().int(),
  layout: fileLayoutSchema,
  columns: z.array(
    z.object({
      index: z.number().int(),
      name: z.string(),
      unitText: z.string().nullable(),
      unit: recognisedUnitSchema,
      kind: z.enum(['number', 'timestamp', 'date', 'time', 'meridiem', 'text', 'empty']),
      samples: z.array(z.string()),
    }),
  ),
  preamble: z.array(z.string()),
  rows: z.array(z.object({ line: z.number().int(), fields: z.array(z.string()) })),
  /** The mapping in use: the one sent, or the suggested one. */
  mapping: columnMappingSchema.nullable(),
  valueUnit: z.string().nullable(),
  reference: referenceModeSchema.nullable(),
  timeZone: z.string().nullable(),
  notes: z.array(z.string()),
  /** What stops the readings from being read with this layout and mapping (line-numbered). */
  problems: z.array(z.string()),
  readings: z.number().int(),
  firstTime: z.number().nullable(),
  lastTime: z.number().nullable(),
});
export type FilePreview = z.infer<typeof filePreviewSchema>;

export const previewSchema = z.object({
  file: filePreviewSchema,
  barometric: filePreviewSchema.nullable(),
  suggestion: z
    .object({
      /** Seconds after the first reading. */
      testStartSeconds: z.number(),
      /** In the reference's terms, m. */
      staticLevelM: z.number().nullable(),
      staticSource: z.enum(['entered', 'pre-test']).nullable(),
      h0M: z.number(),
      direction: z.enum(['rising-head', 'falling-head']),
      testDate: z.string().nullable(),
      startedAt: isoDateTime.nullable(),
    })
    .nullable(),
  /** Why no test start and static level could be suggested. */
  suggestionProblem: z.string().nullable(),
  /** The engine's code for it: TEST_START_NOT_FOUND (enter the start), NO_PRE_TEST_READINGS (enter the static level). */
  suggestionCode: z.string().nullable().optional(),
  /** Where the test may start (s after the first reading), when it could not be found: for the user to choose from. */
  testStartCandidates: z.array(z.number()).optional(),
  /** The record as read (before reduction), decimated: for the preview's curve with the start marked. */
  curve: z
    .object({ secondsAfterFirst: z.array(z.number()), value: z.array(z.number()), unit: z.enum(['m', 'Pa']), readings: z.number().int() })
    .nullable()
    .optional(),
});
export type Preview = z.infer<typeof previewSchema>;
