import type { RequestHandler } from 'express';
import multer from 'multer';
import { readDelimitedTable, TableError, type DelimitedTable } from '@shared/csv/read-table';
import {
  IMPORT_FIELD_LABELS,
  IMPORT_FIELDS,
  requiredImportFields,
  rowToWellInput,
  type ImportField,
  type ImportProblem,
  type ImportReport,
  type wellImportBodySchema,
} from '@shared/schemas/well-import';
import { displayLengthUnit, wellInputSchema, type Well as WellDto } from '@shared/schemas/wells';
import type { z } from 'zod';
import { lengthFromSi } from '@shared/units/length';
import type { AppContext } from '../../context';
import { AppError, badRequest, notFound } from '../../lib/errors';
import { Site } from '../sites/site.entity';
import { lookupCrs } from '../sites/crs';
import { Well } from './well.entity';
import { buildWellRow, byWellName, nameKey, toWellDto, type WellRow } from './wells.service';

/** A wells CSV is small; this bounds the upload and the JSON text alike. */
export const WELLS_CSV_MAX_BYTES = 2 * 1024 * 1024;

const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: WELLS_CSV_MAX_BYTES, files: 1, fields: 5 } });

/** Bytes of an uploaded file → text: UTF-8, or Windows-1252 (what many spreadsheets save as "CSV"). */
export function decodeText(buf: Buffer): string {
  if (buf.length === 0) throw badRequest('The file is empty', { file: 'The file is empty' });
  if (buf.includes(0)) throw badRequest('The file is not text (it contains NUL bytes)', { file: 'The file is not text: choose a CSV or TXT file' });
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(buf);
  } catch {
    return new TextDecoder('windows-1252').decode(buf);
  }
}

/**
 * Multipart (a `file` and the settings as JSON in `settings`) becomes the same body as the JSON
 * form ({ …settings, csv }), so one schema validates both.
 */
export const multipartImport: RequestHandler = (req, res, next) => {
  if (!req.is('multipart/form-data')) return next();
  upload.single('file')(req, res, (e: unknown) => {
    if (e instanceof multer.MulterError) {
      if (e.code === 'LIMIT_FILE_SIZE') return next(new AppError('TOO_LARGE', `The file is larger than the limit of ${WELLS_CSV_MAX_BYTES} bytes (2 MB)`, 413, { file: 'Larger than 2 MB' }));
      return next(badRequest(`The upload is malformed: ${e.message}`, { [e.field ?? 'file']: e.message }));
    }
    if (e) return next(badRequest('The upload is malformed', { file: 'Could not read the multipart form' }));
    try {
      if (!req.file) throw badRequest('Choose a CSV file to import', { file: 'Choose a CSV file to import' });
      let settings: unknown;
      try {
        settings = JSON.parse(String(req.body?.settings ?? '{}'));
      } catch {
        throw badRequest('The import settings are not valid JSON', { settings: 'Not valid JSON' });
      }
      if (typeof settings !== 'object' || settings === null || Array.isArray(settings)) throw badRequest('The import settings must be a JSON object', { settings: 'Must be a JSON object' });
      req.body = { ...settings, csv: decodeText(req.file.buffer) };
      next();
    } catch (err) {
      next(err);
    }
  });
};

type ImportBody = z.output<typeof wellImportBodySchema>;

interface Checked {
  table: DelimitedTable;
  problems: ImportProblem[];
  rows: { line: number; row: WellRow }[];
}

function readTable(body: ImportBody): DelimitedTable {
  if (body.csv.length > WELLS_CSV_MAX_BYTES) throw new AppError('TOO_LARGE', `The CSV text is larger than the limit of ${WELLS_CSV_MAX_BYTES} bytes (2 MB)`, 413, { csv: 'Larger than 2 MB' });
  try {
    return readDelimitedTable(body.csv, body.delimiter);
  } catch (e) {
    if (e instanceof TableError) throw badRequest(e.message, { csv: e.message });
    throw e;
  }
}

/** Check the whole file against the site: every row's problems by line, and the rows to store. */
export async function checkImport(ctx: AppContext, site: Site, body: ImportBody): Promise<Checked> {
  const table = readTable(body);
  const kind = body.coordinates.kind;
  const mapFields: Record<string, string> = {};
  for (const [field, column] of Object.entries(body.mapping) as [ImportField, string][]) {
    if (kind === 'latlon' && (field === 'x' || field === 'y')) continue;
    if (kind === 'epsg' && (field === 'lat' || field === 'lon')) continue;
    if (!table.header.includes(column)) mapFields[`mapping.${field}`] = `Column "${column}" is not in the file's header (${table.header.map((h) => `"${h}"`).join(', ')})`;
  }
  for (const f of requiredImportFields(kind)) {
    if (!body.mapping[f]) mapFields[`mapping.${f}`] = `Choose the column that holds ${IMPORT_FIELD_LABELS[f].toLowerCase()}`;
  }
  if (body.coordinates.kind === 'epsg' && !lookupCrs(body.coordinates.epsg)) {
    mapFields['coordinates.epsg'] = `Unknown EPSG code ${body.coordinates.epsg}: not a coordinate reference system that proj4 can use`;
  }
  if (Object.keys(mapFields).length) {
    const [k, v] = Object.entries(mapFields)[0];
    throw badRequest(`The column mapping is incomplete — ${k}: ${v}`, mapFields);
  }
  if (table.records.length === 0 && table.problems.length === 0) throw badRequest('The file has a header but no wells', { csv: 'The file has a header but no wells' });

  const problems: ImportProblem[] = table.problems.map((p) => ({ line: p.line, field: null, message: `Line ${p.line} ${p.message}` }));
  const colIndex = new Map(table.header.map((h, i) => [h, i] as const));
  const existing = await ctx.ds.getRepository(Well).find({ where: { siteId: site.id }, select: { id: true, name: true } });
  const taken = new Map<string, string>(existing.map((w) => [nameKey(w.name), `an existing well (${w.name})`]));
  const rows: Checked['rows'] = [];
  for (const rec of table.records) {
    const cells: Partial<Record<ImportField, string>> = {};
    for (const f of IMPORT_FIELDS) {
      const col = body.mapping[f];
      if (col !== undefined) cells[f] = rec.values[colIndex.get(col)!] ?? '';
    }
    const add = (field: string | null, message: string) => problems.push({ line: rec.line, field, message: `Line ${rec.line}: ${message}` });
    const conv = rowToWellInput(cells, body, table.delimiter);
    if (!conv.input) {
      for (const p of conv.problems) add(p.field, p.message);
      continue;
    }
    const parsed = wellInputSchema.safeParse(conv.input);
    if (!parsed.success) {
      const seen = new Set<string>();
      for (const issue of parsed.error.issues) {
        const field = String(issue.path[0] ?? '');
        if (seen.has(field)) continue;
        seen.add(field);
        add(field || null, issue.message);
      }
      continue;
    }
    const built = buildWellRow(site, parsed.data);
    if (!built.ok) {
      for (const [field, message] of Object.entries(built.fields)) add(field, message);
      continue;
    }
    const key = nameKey(parsed.data.name);
    const clash = taken.get(key);
    if (clash) {
      add('name', `the name ${parsed.data.name} is already used by ${clash}`);
      continue;
    }
    taken.set(key, `line ${rec.line}`);
    rows.push({ line: rec.line, row: built.row });
  }
  problems.sort((a, b) => a.line - b.line);
  return { table, problems, rows };
}

export function createWellsImport(ctx: AppContext) {
  async function run(siteId: string, body: ImportBody, dryRun: boolean): Promise<ImportReport> {
    const site = await ctx.ds.getRepository(Site).findOne({ where: { id: siteId } });
    if (!site) throw notFound('The site');
    const { table, problems, rows } = await checkImport(ctx, site, body);
    const base = {
      dryRun,
      delimiter: table.delimiter,
      header: table.header,
      rowCount: table.records.length + table.problems.length,
      validCount: rows.length,
      problems,
    };
    if (dryRun) return { ...base, importedCount: 0, wells: [] };
    if (problems.length) {
      const fields: Record<string, string> = {};
      for (const p of problems) fields[`lines.${p.line}.${p.field ?? 'row'}`] ??= p.message;
      throw new AppError(
        'IMPORT_PROBLEMS',
        `${problems.length} problem${problems.length === 1 ? '' : 's'} in the file; nothing was imported (first: ${problems[0].message})`,
        400,
        fields,
      );
    }
    // All or nothing: one transaction for every row.
    const saved = await ctx.ds.transaction(async (m) => {
      const repo = m.getRepository(Well);
      const out: Well[] = [];
      for (const r of rows) out.push(await repo.save(repo.create(r.row)));
      return out;
    });
    const wells: WellDto[] = saved.map(toWellDto).sort(byWellName);
    return { ...base, importedCount: wells.length, wells };
  }
  return { run };
}

const TEXT_FORMULA = /^[=+\-@\t\r]/;

function csvCell(v: string | number | null, text = false): string {
  if (v === null) return '';
  let s = String(v);
  // A text cell that a spreadsheet would run as a formula gets a leading apostrophe (the import strips it).
  if (text && TEXT_FORMULA.test(s)) s = `'${s}`;
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

const round = (v: number | null, digits: number) => (v === null ? null : Number(v.toFixed(digits)));

/** The wells table as CSV in the site's display units, with the unit in every header; re-importable. */
export function wellsCsv(site: Pick<Site, 'epsgCode' | 'displayUnits'>, wells: WellDto[]): string {
  const u = (g: 'elevation' | 'depth' | 'radius') => displayLengthUnit(site.displayUnits, g);
  const len = (m: number | null, g: 'elevation' | 'depth' | 'radius') => (m === null ? null : round(lengthFromSi(m, u(g)), 4));
  const header = [
    'name',
    `easting (EPSG:${site.epsgCode})`,
    `northing (EPSG:${site.epsgCode})`,
    'longitude (WGS 84)',
    'latitude (WGS 84)',
    `ground elevation (${u('elevation')})`,
    `measuring point elevation (${u('elevation')})`,
    `screen top depth (${u('depth')})`,
    `screen bottom depth (${u('depth')})`,
    `screen top elevation (${u('elevation')})`,
    `screen bottom elevation (${u('elevation')})`,
    `casing radius (${u('radius')})`,
    `screen radius (${u('radius')})`,
    `borehole radius (${u('radius')})`,
    'intake radius',
    'filter pack porosity',
    'hydrostratigraphic unit',
    'aquifer condition',
    `saturated thickness (${u('depth')})`,
    `static water depth below measuring point (${u('depth')})`,
    `static level to screen bottom (${u('depth')})`,
    'status',
    'notes',
  ];
  const lines = [header.map((h) => csvCell(h)).join(',')];
  for (const w of wells) {
    lines.push(
      [
        csvCell(w.name, true),
        csvCell(round(w.siteX, 3)),
        csvCell(round(w.siteY, 3)),
        csvCell(round(w.lon, 8)),
        csvCell(round(w.lat, 8)),
        csvCell(len(w.groundElevationM, 'elevation')),
        csvCell(len(w.measuringPointElevationM, 'elevation')),
        csvCell(len(w.screenTopDepthM, 'depth')),
        csvCell(len(w.screenBottomDepthM, 'depth')),
        csvCell(len(w.screenTopElevationM, 'elevation')),
        csvCell(len(w.screenBottomElevationM, 'elevation')),
        csvCell(len(w.casingRadiusM, 'radius')),
        csvCell(len(w.screenRadiusM, 'radius')),
        csvCell(len(w.boreholeRadiusM, 'radius')),
        csvCell(w.intakeRadius),
        csvCell(w.filterPackPorosity),
        csvCell(w.hydroUnit, true),
        csvCell(w.aquiferCondition),
        csvCell(len(w.saturatedThicknessM, 'depth')),
        csvCell(len(w.staticWaterDepthM, 'depth')),
        csvCell(len(w.staticToScreenBottomM, 'depth')),
        csvCell(w.status),
        csvCell(w.notes, true),
      ].join(','),
    );
  }
  return `${lines.join('\r\n')}\r\n`;
}
