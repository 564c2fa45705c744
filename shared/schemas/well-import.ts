import { z } from 'zod';
import type { LengthUnit } from '../units/length';
import { epsgCodeSchema } from './sites';
import {
  aquiferConditionSchema,
  intakeRadiusSchema,
  lengthUnitSchema,
  screenReferenceSchema,
  wellSchema,
  wellStatusSchema,
  type LengthGroup,
  type WellFields,
} from './wells';

/** The well fields a CSV column can be mapped to. */
export const IMPORT_FIELDS = [
  'name',
  'x',
  'y',
  'lat',
  'lon',
  'groundElevation',
  'measuringPointElevation',
  'screenTop',
  'screenBottom',
  'casingRadius',
  'screenRadius',
  'boreholeRadius',
  'intakeRadius',
  'filterPackPorosity',
  'hydroUnit',
  'aquiferCondition',
  'saturatedThickness',
  'staticWaterDepth',
  'staticToScreenBottom',
  'status',
  'notes',
] as const;
export type ImportField = (typeof IMPORT_FIELDS)[number];
export const importFieldSchema = z.enum(IMPORT_FIELDS, { error: 'Unknown well field' });

export const IMPORT_FIELD_LABELS: Record<ImportField, string> = {
  name: 'Name',
  x: 'Easting (x)',
  y: 'Northing (y)',
  lat: 'Latitude',
  lon: 'Longitude',
  groundElevation: 'Ground elevation',
  measuringPointElevation: 'Measuring-point elevation',
  screenTop: 'Screen top',
  screenBottom: 'Screen bottom',
  casingRadius: 'Casing radius',
  screenRadius: 'Screen radius',
  boreholeRadius: 'Borehole radius',
  intakeRadius: 'Intake radius (screen or borehole)',
  filterPackPorosity: 'Filter-pack porosity',
  hydroUnit: 'Hydrostratigraphic unit',
  aquiferCondition: 'Aquifer condition',
  saturatedThickness: 'Saturated thickness',
  staticWaterDepth: 'Static water depth',
  staticToScreenBottom: 'Static level to screen bottom',
  status: 'Status',
  notes: 'Notes',
};

/** The length group whose unit applies to each length field. */
export const IMPORT_FIELD_GROUP: Partial<Record<ImportField, LengthGroup>> = {
  groundElevation: 'elevation',
  measuringPointElevation: 'elevation',
  screenTop: 'depth',
  screenBottom: 'depth',
  casingRadius: 'radius',
  screenRadius: 'radius',
  boreholeRadius: 'radius',
  saturatedThickness: 'depth',
  staticWaterDepth: 'depth',
  staticToScreenBottom: 'depth',
};

export const importCoordinatesSchema = z.discriminatedUnion(
  'kind',
  [z.object({ kind: z.literal('epsg'), epsg: epsgCodeSchema }), z.object({ kind: z.literal('latlon') })],
  { error: 'Choose the coordinates’ EPSG system or latitude/longitude' },
);

export const importSettingsSchema = z.object({
  /** Column delimiter; detected from the header line when left out. */
  delimiter: z.enum([',', ';', '\t', '|'], { error: 'Delimiter must be comma, semicolon, tab or vertical bar' }).optional(),
  /** Well field → the header name of the column it comes from. */
  mapping: z.partialRecord(importFieldSchema, z.string().trim().min(1, 'Choose a column'), {
    error: (iss) => {
      // Unknown keys are reported on the record itself; the issue type does not list that code.
      const keys = (iss as { code: string; keys?: string[] }).code === 'unrecognized_keys' ? ((iss as { keys?: string[] }).keys ?? []) : null;
      return keys ? `Unknown well field${keys.length > 1 ? 's' : ''}: ${keys.join(', ')}` : undefined;
    },
  }),
  units: z.object({ elevation: lengthUnitSchema, depth: lengthUnitSchema, radius: lengthUnitSchema }),
  screenReference: screenReferenceSchema,
  coordinates: importCoordinatesSchema,
  /** Used where the column is not mapped or the cell is empty. */
  defaults: z
    .object({ aquiferCondition: aquiferConditionSchema.default('unconfined'), status: wellStatusSchema.default('active') })
    .default({ aquiferCondition: 'unconfined', status: 'active' }),
});
export type ImportSettings = z.input<typeof importSettingsSchema>;
export type ImportSettingsParsed = z.output<typeof importSettingsSchema>;

export const wellImportBodySchema = importSettingsSchema.extend({
  csv: z.string({ error: 'The CSV text is required (or send the file as multipart form data)' }),
});
export type WellImportBody = z.input<typeof wellImportBodySchema>;

export const importQuerySchema = z.object({
  dryRun: z.enum(['true', 'false', '1', '0'], { error: 'dryRun must be true or false' }).optional().transform((v) => v === 'true' || v === '1'),
});

export const importProblemSchema = z.object({
  /** Line in the file (the header is line 1); 0 for a problem with the whole file. */
  line: z.number(),
  field: z.string().nullable(),
  message: z.string(),
});
export type ImportProblem = z.infer<typeof importProblemSchema>;

export const importReportSchema = z.object({
  dryRun: z.boolean(),
  delimiter: z.string(),
  header: z.array(z.string()),
  rowCount: z.number(),
  validCount: z.number(),
  problems: z.array(importProblemSchema),
  importedCount: z.number(),
  wells: z.array(wellSchema),
});
export type ImportReport = z.infer<typeof importReportSchema>;

const norm = (s: string) => s.toLowerCase().replace(/\(.*?\)|\[.*?\]/g, ' ').replace(/[^a-z0-9]+/g, ' ').trim();

/** Header words that name each field, normalised (lower case, no units in brackets). */
const FIELD_ALIASES: Record<ImportField, string[]> = {
  name: ['name', 'well', 'well name', 'well id', 'id', 'station', 'location'],
  x: ['x', 'easting', 'east', 'e', 'site x', 'x coordinate'],
  y: ['y', 'northing', 'north', 'n', 'site y', 'y coordinate'],
  lat: ['lat', 'latitude'],
  lon: ['lon', 'long', 'lng', 'longitude'],
  groundElevation: ['ground elevation', 'ground', 'ground surface elevation', 'gs elevation', 'gse', 'ground level', 'surface elevation'],
  measuringPointElevation: ['measuring point elevation', 'top of casing elevation', 'top of casing', 'toc elevation', 'toc', 'mp elevation', 'measuring point'],
  screenTop: ['screen top', 'screen top depth', 'top of screen', 'screen top elevation', 'screen from'],
  screenBottom: ['screen bottom', 'screen bottom depth', 'bottom of screen', 'screen bottom elevation', 'screen to'],
  casingRadius: ['casing radius', 'casing inner radius', 'rc'],
  screenRadius: ['screen radius', 'rs'],
  boreholeRadius: ['borehole radius', 'boring radius', 'rw'],
  intakeRadius: ['intake radius', 'intake'],
  filterPackPorosity: ['filter pack porosity', 'porosity', 'pack porosity'],
  hydroUnit: ['hydrostratigraphic unit', 'unit', 'hydro unit', 'formation', 'aquifer'],
  aquiferCondition: ['aquifer condition', 'condition', 'confinement'],
  saturatedThickness: ['saturated thickness', 'aquifer thickness'],
  staticWaterDepth: ['static water depth', 'static water depth below measuring point', 'static water level', 'depth to water', 'dtw', 'swl'],
  staticToScreenBottom: ['static level to screen bottom', 'lw'],
  status: ['status', 'well status'],
  notes: ['notes', 'note', 'comments', 'comment', 'remarks'],
};

/** Prefill a mapping from the header's column names (each column used once). */
export function guessMapping(
  header: readonly string[],
  coordinateKind: 'epsg' | 'latlon',
  screenReference: 'depth' | 'elevation' = 'depth',
): Partial<Record<ImportField, string>> {
  const out: Partial<Record<ImportField, string>> = {};
  const used = new Set<string>();
  const normalized = header.map((h) => ({ h, n: norm(h) }));
  for (const field of IMPORT_FIELDS) {
    if (coordinateKind === 'latlon' && (field === 'x' || field === 'y')) continue;
    if (coordinateKind === 'epsg' && (field === 'lat' || field === 'lon')) continue;
    let aliases = FIELD_ALIASES[field];
    if (field === 'screenTop' || field === 'screenBottom') {
      const other = screenReference === 'depth' ? 'elevation' : 'depth';
      const side = field === 'screenTop' ? 'top' : 'bottom';
      aliases = [`screen ${side} ${screenReference}`, ...aliases.filter((a) => !a.endsWith(other))];
    }
    for (const alias of aliases) {
      const hit = normalized.find((c) => !used.has(c.h) && c.n === alias);
      if (hit) {
        out[field] = hit.h;
        used.add(hit.h);
        break;
      }
    }
  }
  return out;
}

/** Fields that must be mapped for the chosen coordinates. */
export function requiredImportFields(coordinateKind: 'epsg' | 'latlon'): ImportField[] {
  return [
    'name',
    ...(coordinateKind === 'latlon' ? (['lat', 'lon'] as const) : (['x', 'y'] as const)),
    'groundElevation',
    'measuringPointElevation',
    'screenTop',
    'screenBottom',
    'casingRadius',
    'screenRadius',
    'boreholeRadius',
  ];
}

/**
 * Parse a number as written in a CSV cell. With a semicolon or tab delimiter a decimal comma
 * (12,5) is accepted, since spreadsheets in many locales write it so.
 */
export function parseCellNumber(cell: string, delimiter: string): number | null {
  let s = cell.trim();
  if (s === '') return null;
  if (delimiter !== ',' && /^[+-]?\d+,\d+$/.test(s)) s = s.replace(',', '.');
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(s)) return Number.NaN;
  return Number(s);
}

export interface RowConversion {
  input: WellFields | null;
  problems: { field: string; message: string }[];
}

/**
 * One CSV row (cells by field) to well input with the import's units, or the cells' problems.
 * Cross-field checks are left to the well schema.
 */
export function rowToWellInput(cells: Partial<Record<ImportField, string>>, settings: ImportSettingsParsed, delimiter: string): RowConversion {
  const problems: { field: string; message: string }[] = [];
  const num = (field: ImportField, required: boolean): number | null => {
    const raw = cells[field];
    const v = raw === undefined ? null : parseCellNumber(raw, delimiter);
    if (v === null) {
      if (required) problems.push({ field, message: `${IMPORT_FIELD_LABELS[field]} is required` });
      return null;
    }
    if (Number.isNaN(v)) {
      problems.push({ field, message: `${IMPORT_FIELD_LABELS[field]}: "${raw}" is not a number` });
      return null;
    }
    return v;
  };
  const unitOf = (field: ImportField): LengthUnit =>
    (field === 'screenTop' || field === 'screenBottom') && settings.screenReference === 'elevation' ? settings.units.elevation : settings.units[IMPORT_FIELD_GROUP[field]!];
  const len = (field: ImportField) => {
    const v = num(field, true);
    return { value: v ?? 0, unit: unitOf(field) };
  };
  const optLen = (field: ImportField) => {
    const v = num(field, false);
    return v === null ? null : { value: v, unit: unitOf(field) };
  };
  const choice = <T extends string>(field: ImportField, options: readonly T[], fallback: T): T => {
    const raw = (cells[field] ?? '').trim();
    if (raw === '') return fallback;
    const hit = options.find((o) => o === raw.toLowerCase());
    if (!hit) problems.push({ field, message: `${IMPORT_FIELD_LABELS[field]}: "${raw}" is not one of ${options.join(', ')}` });
    return hit ?? fallback;
  };
  const coordinates: WellFields['coordinates'] =
    settings.coordinates.kind === 'latlon'
      ? { kind: 'latlon', lat: num('lat', true) ?? 0, lon: num('lon', true) ?? 0 }
      : { kind: 'epsg', epsg: settings.coordinates.epsg, x: num('x', true) ?? 0, y: num('y', true) ?? 0 };
  const text = (field: ImportField) => {
    const raw = (cells[field] ?? '').trim();
    // A leading apostrophe guards text cells against spreadsheet formulas in our own export.
    return /^'[=+\-@]/.test(raw) ? raw.slice(1) : raw;
  };
  const input: WellFields = {
    name: text('name'),
    coordinates,
    groundElevation: len('groundElevation'),
    measuringPointElevation: len('measuringPointElevation'),
    screenReference: settings.screenReference,
    screenTop: len('screenTop'),
    screenBottom: len('screenBottom'),
    casingRadius: len('casingRadius'),
    screenRadius: len('screenRadius'),
    boreholeRadius: len('boreholeRadius'),
    // Left empty: the well's default (the borehole where it is wider than the screen).
    intakeRadius: (cells.intakeRadius ?? '').trim() === '' ? undefined : choice('intakeRadius', intakeRadiusSchema.options, 'screen'),
    filterPackPorosity: num('filterPackPorosity', false),
    hydroUnit: text('hydroUnit') || null,
    aquiferCondition: choice('aquiferCondition', aquiferConditionSchema.options, settings.defaults.aquiferCondition),
    saturatedThickness: optLen('saturatedThickness'),
    staticWaterDepth: optLen('staticWaterDepth'),
    staticToScreenBottom: optLen('staticToScreenBottom'),
    status: choice('status', wellStatusSchema.options, settings.defaults.status),
    notes: text('notes'),
  };
  return { input: problems.length ? null : input, problems };
}

const UNIT_WORDS: Record<string, LengthUnit> = { m: 'm', metre: 'm', metres: 'm', meter: 'm', meters: 'm', cm: 'cm', mm: 'mm', ft: 'ft', feet: 'ft', foot: 'ft', in: 'in', inch: 'in', inches: 'in' };

/** The length unit a header names in brackets, e.g. "Screen top (ft bgs)" → ft; undefined when none. */
export function guessUnit(header: string): LengthUnit | undefined {
  const m = /[([]\s*([a-z]+)/i.exec(header);
  return m ? UNIT_WORDS[m[1].toLowerCase()] : undefined;
}
