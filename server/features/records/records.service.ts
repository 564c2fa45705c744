import { createHash } from 'node:crypto';
import type { DataSource, EntityManager } from 'typeorm';
import { EngineInputError } from '@shared/hydraulics/errors';
import { H0_RATIO_LIMITS } from '@shared/hydraulics/qc';
import { describeLayout, detectLayout, type Detection } from '@shared/records/detect';
import { RecordFileError } from '@shared/records/errors';
import { parseSeries, previewRows } from '@shared/records/parse';
import { decodeRecordFile } from '@shared/records/text';
import type { FileLayout } from '@shared/records/types';
import {
  loggerSettingsSchema,
  previewSettingsSchema,
  tapeBodySchema,
  type FilePreview,
  type LoggerSettings,
  type Preview,
  type RecordDto,
  type RecordTestType,
  type Series,
  type TapeBody,
} from '@shared/schemas/records';
import { AppError, badRequest, notFound } from '../../lib/errors';
import { fieldErrors } from '../../lib/validate';
import { User } from '../users/user.entity';
import { Well } from '../wells/well.entity';
import { lttbIndexes } from './lttb';
import { RecordFile } from './record-file.entity';
import { RecordSeries } from './record-series.entity';
import { RecordEntity } from './record.entity';
import { dateInZone, loggerCurve, readLogger, readTape, tapeCsv, type ReadRecord } from './records.reading';

export interface UploadedFile {
  originalname: string;
  mimetype: string;
  buffer: Buffer;
  size: number;
  /** Computed by the upload storage as the bytes arrived. */
  sha256?: string;
}

export interface UploadedFiles {
  file?: UploadedFile;
  barometric?: UploadedFile;
}

const FIELD_LABELS: Readonly<Record<string, string>> = {
  file: 'The logger file',
  barometric: 'The barometric file',
  readings: 'The tape readings',
  'settings.staticLevel': 'The static level',
  'settings.testStartSeconds': 'The test start',
  'settings.testStartText': 'The test start',
  'settings.staticLevel.unit': 'The static level',
  static: 'The static level',
  testStart: 'The test start',
};

/** An engine or parser refusal → 400 naming the field, and every offending line for a file. */
export function toBadRequest(e: EngineInputError): AppError {
  const label = FIELD_LABELS[e.field] ?? e.field;
  const fields: Record<string, string> = { [e.field]: e.problem };
  if (e instanceof RecordFileError) for (const issue of e.issues) fields[`${e.field}.lines.${issue.line}`] = issue.message;
  return badRequest(`${label}: ${e.problem}`, fields, e instanceof RecordFileError ? 'BAD_RECORD_FILE' : (e.code ?? 'INVALID_INPUT'));
}

function withEngineErrors<T>(run: () => T): T {
  try {
    return run();
  } catch (e) {
    if (e instanceof EngineInputError) throw toBadRequest(e);
    throw e;
  }
}

function parseJsonField(text: string | undefined, field: string): unknown {
  if (text === undefined || text === '') return {};
  try {
    return JSON.parse(text);
  } catch {
    throw badRequest(`The ${field} are not valid JSON`, { [field]: 'Not valid JSON' });
  }
}

function prefixed(fields: Record<string, string>, prefix: string): Record<string, string> {
  return Object.fromEntries(Object.entries(fields).map(([k, v]) => [k === '_' ? prefix : `${prefix}.${k}`, v]));
}

/** The logger settings of a multipart upload, validated with the shared schema; fields are named settings.<path>. */
export function parseLoggerSettings(text: string | undefined): LoggerSettings {
  if (text === undefined || text.trim() === '') {
    throw badRequest('Send the logger settings as JSON in the "settings" field', { settings: 'Required: layout, mapping, units, reference and test type' });
  }
  const result = loggerSettingsSchema.safeParse(parseJsonField(text, 'settings'));
  if (result.success) return result.data;
  const fields = prefixed(fieldErrors(result.error), 'settings');
  const [key, message] = Object.entries(fields)[0];
  throw badRequest(`The settings are invalid — ${key}: ${message}`, fields);
}

export function parseTapeBody(body: unknown): TapeBody {
  const result = tapeBodySchema.safeParse(body ?? {});
  if (result.success) return result.data;
  const fields = fieldErrors(result.error);
  const [key, message] = Object.entries(fields)[0];
  throw badRequest(`The tape readings are invalid — ${key === '_' ? '' : `${key}: `}${message}`, fields);
}

/** A media type as given by the browser, if it is one a text export may carry; otherwise octet-stream. */
function safeMediaType(type: string | undefined): string {
  const t = (type ?? '').toLowerCase().split(';')[0].trim();
  return ['text/csv', 'text/plain', 'text/tab-separated-values', 'application/csv', 'application/vnd.ms-excel', 'application/octet-stream'].includes(t)
    ? t
    : 'application/octet-stream';
}

function safeFileName(name: string | undefined, fallback: string): string {
  // eslint-disable-next-line no-control-regex
  const cleaned = (name ?? '').replace(/[\u0000-\u001f\u007f/\\]/g, '_').trim().slice(0, 200);
  return cleaned || fallback;
}

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/** A Float64Array as BLOB bytes, without copying. */
const blobOf = (a: Float64Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

/** BLOB bytes as a Float64Array; copied only when SQLite's buffer is not 8-byte aligned. */
function float64Of(buf: Buffer): Float64Array {
  if (buf.byteOffset % 8 === 0) return new Float64Array(buf.buffer, buf.byteOffset, buf.byteLength / 8);
  const copy = new Uint8Array(buf.byteLength);
  copy.set(buf);
  return new Float64Array(copy.buffer);
}

export interface StoreInput {
  well: Pick<Well, 'id' | 'siteId'>;
  userId: string | null;
  source: 'tape' | 'logger';
  testType: RecordTestType;
  reference: RecordEntity['reference'];
  settings: Record<string, unknown>;
  read: ReadRecord;
  fieldCrew: string;
  notes: string;
  files: { role: 'raw' | 'barometric'; name: string; mediaType: string; content: Buffer; sha256?: string }[];
  isDemo?: boolean;
}

/** Record, files and series in one go, inside the caller's transaction. */
export async function storeRecord(m: EntityManager, input: StoreInput): Promise<string> {
  const { reduced, read } = { reduced: input.read.reduced, read: input.read };
  const n = reduced.elapsedSeconds.length;
  const record = m.getRepository(RecordEntity).create({
    siteId: input.well.siteId,
    wellId: input.well.id,
    testType: input.testType,
    source: input.source,
    reference: input.reference,
    settings: input.settings,
    testDate: read.testDate,
    clock: read.clock,
    firstReadingSeconds: read.firstReadingSeconds,
    testStartSeconds: reduced.testStartSeconds,
    testStartIndex: reduced.testStartIndex,
    testStartSource: reduced.testStartSource,
    durationSeconds: reduced.elapsedSeconds[n - 1],
    fieldCrew: input.fieldCrew,
    notes: input.notes,
    sampleCount: read.sampleCount,
    h0M: reduced.h0M,
    staticLevelM: reduced.staticLevelM,
    staticSource: reduced.staticSource,
    preTestCount: reduced.preTestCount,
    direction: reduced.testType,
    slugVolumeM3: read.slugVolumeM3,
    createdById: input.userId,
    isDemo: input.isDemo ?? false,
  });
  const { id } = await m.getRepository(RecordEntity).save(record);
  for (const f of input.files) {
    await m.getRepository(RecordFile).insert({
      recordId: id,
      role: f.role,
      name: f.name,
      mediaType: f.mediaType,
      sizeBytes: f.content.length,
      sha256: f.sha256 ?? sha256(f.content),
      content: f.content,
    });
  }
  await m.getRepository(RecordSeries).insert({
    recordId: id,
    count: n,
    elapsedSeconds: blobOf(reduced.elapsedSeconds),
    displacementM: blobOf(reduced.displacementM),
    normalizedHead: blobOf(reduced.normalizedHead),
  });
  return id;
}

const EXPECTED_DIRECTION: Readonly<Record<RecordTestType, 'rising-head' | 'falling-head' | null>> = {
  'slug-in': 'falling-head',
  'slug-out': 'rising-head',
  'bail-down': 'rising-head',
  pneumatic: null,
};

type FileMeta = Pick<RecordFile, 'recordId' | 'role' | 'name' | 'mediaType' | 'sizeBytes' | 'sha256'>;

function toDto(r: RecordEntity, well: Pick<Well, 'name' | 'casingRadiusM'>, files: FileMeta[], creator: Pick<User, 'id' | 'name'> | null): RecordDto {
  const expectedH0M = r.slugVolumeM3 === null ? null : r.slugVolumeM3 / (Math.PI * well.casingRadiusM ** 2);
  const warnings: string[] = [];
  const expectedDirection = EXPECTED_DIRECTION[r.testType];
  if (expectedDirection && expectedDirection !== r.direction) {
    warnings.push(
      `A ${r.testType} test should be ${expectedDirection}, but the water level starts ${r.direction === 'rising-head' ? 'below' : 'above'} static (${r.direction}): check the test type, the reference and the static level.`,
    );
  }
  if (expectedH0M !== null) {
    const ratio = Math.abs(r.h0M) / expectedH0M;
    if (ratio < H0_RATIO_LIMITS.low || ratio > H0_RATIO_LIMITS.high) {
      warnings.push(
        `H0 is ${Math.abs(r.h0M).toFixed(3)} m but the slug volume and casing radius give ${expectedH0M.toFixed(3)} m (ratio ${ratio.toFixed(2)}); the test start or the slug volume may be off.`,
      );
    }
  }
  return {
    id: r.id,
    siteId: r.siteId,
    wellId: r.wellId,
    wellName: well.name,
    testType: r.testType,
    source: r.source,
    reference: r.reference,
    direction: r.direction,
    testDate: r.testDate,
    startedAt: r.clock === 'epoch' ? new Date(r.testStartSeconds * 1000).toISOString() : null,
    fieldCrew: r.fieldCrew,
    notes: r.notes,
    sampleCount: r.sampleCount,
    h0M: r.h0M,
    expectedH0M,
    staticLevelM: r.staticLevelM,
    staticSource: r.staticSource,
    testStartSeconds: r.testStartSeconds - r.firstReadingSeconds,
    testStartSource: r.testStartSource,
    preTestCount: r.preTestCount,
    durationSeconds: r.durationSeconds,
    clock: r.clock,
    settings: r.settings,
    files: files
      .filter((f) => f.recordId === r.id)
      .sort((a, b) => (a.role === b.role ? 0 : a.role === 'raw' ? -1 : 1))
      .map((f) => ({ which: f.role, name: f.name, mediaType: f.mediaType, sizeBytes: f.sizeBytes, sha256: f.sha256 })),
    warnings,
    createdBy: creator ? { id: creator.id, name: creator.name } : null,
    createdAt: r.createdAt.toISOString(),
    isDemo: r.isDemo,
  };
}

function previewOfFile(
  upload: UploadedFile,
  field: 'file' | 'barometric',
  layoutChoice: FileLayout | undefined,
  mappingChoice: LoggerSettings['mapping'] | undefined,
  sampled: boolean,
): { preview: FilePreview; text: string; detection: Detection } {
  const { text, encoding } = decodeRecordFile(upload.buffer, field);
  const role = field === 'file' ? 'record' : 'barometric';
  const detected = detectLayout(text, { role });
  const detection = layoutChoice ? describeLayout(text, layoutChoice, { role, totalLines: detected.totalLines }) : detected;
  const zone = detection.timeZone ?? 'UTC';
  const mapping: LoggerSettings['mapping'] | null = mappingChoice ?? (detection.mapping ? { ...detection.mapping, time: { ...detection.mapping.time, timeZone: zone } } : null);
  const problems: string[] = [];
  let readings = 0;
  let firstTime: number | null = null;
  let lastTime: number | null = null;
  if (mapping) {
    try {
      const s = parseSeries(text, detection.layout, mapping, { field, what: FIELD_LABELS[field], sampled });
      readings = s.timeSeconds.length;
      firstTime = s.timeSeconds[0];
      lastTime = s.timeSeconds[readings - 1];
    } catch (e) {
      if (!(e instanceof EngineInputError)) throw e;
      if (e instanceof RecordFileError && e.issues.length) problems.push(...e.issues.map((i) => `Line ${i.line}: ${i.message}`));
      else problems.push(`${e.field}: ${e.problem}`);
    }
  }
  return {
    text,
    detection,
    preview: {
      name: safeFileName(upload.originalname, field === 'file' ? 'logger-file' : 'barometric-file'),
      sizeBytes: upload.size,
      encoding,
      sampled,
      totalLines: detection.totalLines,
      layout: detection.layout,
      columns: detection.columns,
      preamble: detection.preamble.slice(0, 40),
      rows: previewRows(text, detection.layout, 12),
      mapping,
      valueUnit: detection.valueUnit,
      reference: detection.reference,
      timeZone: detection.timeZone,
      notes: detection.notes,
      problems,
      readings,
      firstTime,
      lastTime,
    },
  };
}

/** Downsampled series kept per (record, scale, points): a record's readings never change once stored. */
const SERIES_CACHE_ENTRIES = 64;

export function createRecordsService({ ds }: { ds: DataSource }) {
  const records = ds.getRepository(RecordEntity);
  const seriesCache = new Map<string, Series>();

  async function wellOrThrow(wellId: string): Promise<Well> {
    const well = await ds.getRepository(Well).findOne({ where: { id: wellId } });
    if (!well) throw notFound('The well');
    return well;
  }

  async function dtosOf(rows: RecordEntity[]): Promise<RecordDto[]> {
    if (rows.length === 0) return [];
    const ids = rows.map((r) => r.id);
    const files = await ds
      .getRepository(RecordFile)
      .createQueryBuilder('f')
      .select(['f.recordId', 'f.role', 'f.name', 'f.mediaType', 'f.sizeBytes', 'f.sha256'])
      .where('f.recordId IN (:...ids)', { ids })
      .getMany();
    const wells = new Map((await ds.getRepository(Well).findBy(rows.map((r) => ({ id: r.wellId })))).map((w) => [w.id, w]));
    const creatorIds = [...new Set(rows.map((r) => r.createdById).filter((x): x is string => !!x))];
    const users = new Map(
      creatorIds.length ? (await ds.getRepository(User).find({ where: creatorIds.map((id) => ({ id })), select: { id: true, name: true } })).map((u) => [u.id, u]) : [],
    );
    return rows.map((r) => toDto(r, wells.get(r.wellId)!, files, r.createdById ? (users.get(r.createdById) ?? null) : null));
  }

  async function get(recordId: string): Promise<RecordDto> {
    const row = await records.findOne({ where: { id: recordId } });
    if (!row) throw notFound('The record');
    return (await dtosOf([row]))[0];
  }

  async function list(wellId: string): Promise<RecordDto[]> {
    const rows = await records.find({ where: { wellId }, order: { createdAt: 'DESC' } });
    return dtosOf(rows);
  }

  async function importLogger(wellId: string, userId: string, files: UploadedFiles, settingsText: string | undefined): Promise<RecordDto> {
    const well = await wellOrThrow(wellId);
    if (!files.file) throw badRequest('Choose the logger file to upload (multipart field "file")', { file: 'Choose a logger file (CSV or text)' });
    const settings = parseLoggerSettings(settingsText);
    const read = withEngineErrors(() => readLogger({ file: files.file!.buffer, barometric: files.barometric?.buffer, settings }));
    const stored: StoreInput['files'] = [
      { role: 'raw', name: safeFileName(files.file.originalname, 'logger-file.csv'), mediaType: safeMediaType(files.file.mimetype), content: files.file.buffer, sha256: files.file.sha256 },
    ];
    if (files.barometric) {
      stored.push({ role: 'barometric', name: safeFileName(files.barometric.originalname, 'barometric-file.csv'), mediaType: safeMediaType(files.barometric.mimetype), content: files.barometric.buffer, sha256: files.barometric.sha256 });
    }
    const id = await withDeferredCheckpoint(() =>
      ds.transaction((m) =>
        storeRecord(m, {
          well,
          userId,
          source: 'logger',
          testType: settings.testType,
          reference: settings.reference,
          settings: settings as unknown as Record<string, unknown>,
          read,
          fieldCrew: settings.fieldCrew,
          notes: settings.notes,
          files: stored,
        }),
      ),
    );
    warmSeries(id);
    return get(id);
  }

  async function importTape(wellId: string, userId: string, rawBody: unknown): Promise<RecordDto> {
    const well = await wellOrThrow(wellId);
    const body = parseTapeBody(rawBody);
    const read = withEngineErrors(() => readTape(body));
    const { readings: _readings, fieldCrew, notes, ...settings } = body;
    const id = await ds.transaction((m) =>
      storeRecord(m, {
        well,
        userId,
        source: 'tape',
        testType: body.testType,
        reference: 'depth',
        settings,
        read,
        fieldCrew,
        notes,
        files: [{ role: 'raw', name: 'tape-readings.csv', mediaType: 'text/csv', content: Buffer.from(tapeCsv(body), 'utf8') }],
      }),
    );
    return get(id);
  }

  /** Layout, columns, first rows and suggested test start and static level, from files that are not stored. */
  function preview(files: UploadedFiles, settingsText: string | undefined, sampledText: string | undefined): Preview {
    if (!files.file) throw badRequest('Choose the logger file to preview (multipart field "file")', { file: 'Choose a logger file (CSV or text)' });
    const parsed = previewSettingsSchema.safeParse(parseJsonField(settingsText, 'settings'));
    if (!parsed.success) {
      const fields = prefixed(fieldErrors(parsed.error), 'settings');
      const [key, message] = Object.entries(fields)[0];
      throw badRequest(`The preview settings are invalid — ${key}: ${message}`, fields);
    }
    const choice = parsed.data;
    const sampled = new Set((sampledText ?? '').split(',').map((s) => s.trim()));
    const main = withEngineErrors(() => previewOfFile(files.file!, 'file', choice.layout, choice.mapping, sampled.has('file')));
    const baro = files.barometric
      ? withEngineErrors(() => previewOfFile(files.barometric!, 'barometric', choice.barometric?.layout, choice.barometric?.mapping, sampled.has('barometric')))
      : null;

    let suggestion: Preview['suggestion'] = null;
    let suggestionProblem: string | null = null;
    let suggestionCode: string | null = null;
    let testStartCandidates: number[] = [];
    let curve: Preview['curve'] = null;
    const reference = choice.reference ?? main.preview.reference;
    const valueUnit = choice.valueUnit ?? main.preview.valueUnit;
    if (!main.preview.mapping) suggestionProblem = 'Choose the time and value columns first.';
    else if (main.preview.problems.length) suggestionProblem = 'Fix the problems with the logger file first.';
    else if (!reference) suggestionProblem = 'Choose what the value column measures (the reference).';
    else if (!valueUnit) suggestionProblem = 'Choose the unit of the value column.';
    else if (reference === 'absolute' && !baro) suggestionProblem = 'Add the barometric file: absolute pressure needs it.';
    else if (reference === 'absolute' && (!baro?.preview.mapping || !baro.preview.valueUnit)) suggestionProblem = 'Choose the time and pressure columns of the barometric file.';
    else {
      const candidate = loggerSettingsSchema.safeParse({
        testType: 'slug-out',
        reference,
        layout: main.preview.layout,
        mapping: main.preview.mapping,
        valueUnit,
        ...(choice.waterDensityKgM3 !== undefined ? { waterDensityKgM3: choice.waterDensityKgM3 } : {}),
        ...(reference === 'absolute' && baro
          ? {
              barometric: {
                layout: baro.preview.layout,
                mapping: baro.preview.mapping,
                valueUnit: choice.barometric?.valueUnit ?? baro.preview.valueUnit,
                clockOffsetSeconds: choice.barometric?.clockOffsetSeconds ?? 0,
              },
            }
          : {}),
      });
      const settings = candidate.success ? candidate.data : null;
      if (!candidate.success) {
        const [key, message] = Object.entries(prefixed(fieldErrors(candidate.error), 'settings'))[0];
        suggestionProblem = `${key}: ${message}`;
      }
      if (settings) {
        try {
          curve = loggerCurve({ file: files.file.buffer, settings, sampled: { file: sampled.has('file') } });
        } catch (e) {
          if (!(e instanceof EngineInputError)) throw e;
        }
        try {
          const read = readLogger({
            file: files.file.buffer,
            barometric: reference === 'absolute' ? files.barometric?.buffer : undefined,
            settings,
            sampled: { file: sampled.has('file'), barometric: sampled.has('barometric') },
            suggestOnly: true,
          });
          const r = read.reduced;
          suggestion = {
            testStartSeconds: r.testStartSeconds - read.firstReadingSeconds,
            staticLevelM: r.staticLevelM,
            staticSource: r.staticSource,
            h0M: r.h0M,
            direction: r.testType,
            testDate: read.clock === 'epoch' ? dateInZone(r.testStartSeconds, settings.mapping.time.timeZone ?? 'UTC') : null,
            startedAt: read.clock === 'epoch' ? new Date(r.testStartSeconds * 1000).toISOString() : null,
          };
        } catch (e) {
          if (!(e instanceof EngineInputError)) throw e;
          suggestionProblem = `${FIELD_LABELS[e.field] ?? e.field}: ${e.problem}`;
          suggestionCode = e.code ?? null;
          const candidates = e.details?.candidatesAfterFirstReadingSeconds;
          if (Array.isArray(candidates)) testStartCandidates = candidates.filter((x): x is number => typeof x === 'number');
        }
      }
    }
    return { file: main.preview, barometric: baro?.preview ?? null, suggestion, suggestionProblem, suggestionCode, testStartCandidates, curve };
  }

  async function series(recordId: string, points: number, scale: 'log' | 'linear' = 'log'): Promise<Series> {
    const key = `${recordId}|${scale}|${points}`;
    const cached = seriesCache.get(key);
    if (cached) {
      // Least recently used goes first: re-insert on every hit.
      seriesCache.delete(key);
      seriesCache.set(key, cached);
      return cached;
    }
    const computed = await computeSeries(recordId, points, scale);
    seriesCache.set(key, computed);
    if (seriesCache.size > SERIES_CACHE_ENTRIES) seriesCache.delete(seriesCache.keys().next().value as string);
    return computed;
  }

  async function computeSeries(recordId: string, points: number, scale: 'log' | 'linear'): Promise<Series> {
    const row = await ds
      .getRepository(RecordSeries)
      .createQueryBuilder('s')
      .select(['s.recordId', 's.count', 's.elapsedSeconds', 's.normalizedHead'])
      .where('s.recordId = :recordId', { recordId })
      .getOne();
    if (!row) throw notFound('The record');
    const t = float64Of(row.elapsedSeconds);
    const h = float64Of(row.normalizedHead);
    const n = row.count;
    // Readings from the test start on; a log axis can show only H/H0 > 0, and LTTB keeps the shape of what is drawn (log H/H0 or H/H0).
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    const source = new Int32Array(n);
    const log = scale === 'log';
    let m = 0;
    let belowStatic = 0;
    for (let i = 0; i < n; i++) {
      const ti = t[i];
      if (ti < 0) continue;
      const hi = h[i];
      if (hi <= 0) belowStatic++;
      if (log && !(hi > 0)) continue;
      x[m] = ti;
      // Natural log: LTTB's choice of points does not depend on the base (it only scales the axis), and ln is quicker.
      y[m] = log ? Math.log(hi) : hi;
      source[m] = i;
      m++;
    }
    const keep = lttbIndexes(x, y, m, points);
    const elapsedSeconds = Array.from(keep, (k) => x[k]);
    const normalizedHead = Array.from(keep, (k) => h[source[k]]);
    // Where readings were left out between two kept points, the line of a log plot breaks.
    const segmentStarts: number[] = [];
    for (let k = 1; k < keep.length; k++) {
      if (source[keep[k]] - source[keep[k - 1]] > keep[k] - keep[k - 1]) segmentStarts.push(k);
    }
    return { recordId, scale, readings: n, plottable: m, omitted: n - m, belowStatic, segmentStarts, elapsedSeconds, normalizedHead };
  }

  async function file(recordId: string, which: 'raw' | 'barometric'): Promise<RecordFile> {
    const f = await ds.getRepository(RecordFile).findOne({ where: { recordId, role: which } });
    if (!f) throw notFound(which === 'raw' ? 'The record’s file' : 'The record’s barometric file');
    return f;
  }

  async function remove(recordId: string): Promise<void> {
    const result = await records.delete({ id: recordId });
    if (!result.affected) throw notFound('The record');
    // Deleting the current key while iterating a Map is well defined in JavaScript.
    for (const key of seriesCache.keys()) if (key.startsWith(`${recordId}|`)) seriesCache.delete(key);
  }

  /**
   * A logger file and its series are tens of megabytes: with SQLite's automatic checkpoint the
   * commit would also copy them from the write-ahead log into the database file before answering.
   * The import turns it off for its own transaction and runs the checkpoint once the answer has
   * gone (SQLite's advice for writers that should not wait on checkpoints: checkpoint separately).
   */
  async function withDeferredCheckpoint<T>(write: () => Promise<T>): Promise<T> {
    const rows: { wal_autocheckpoint: number }[] = await ds.query('PRAGMA wal_autocheckpoint');
    const pages = rows[0]?.wal_autocheckpoint ?? 1000;
    await ds.query('PRAGMA wal_autocheckpoint = 0');
    try {
      return await write();
    } finally {
      await ds.query(`PRAGMA wal_autocheckpoint = ${Number(pages) | 0}`);
      setImmediate(() => void ds.query('PRAGMA wal_checkpoint(PASSIVE)').catch(() => undefined));
    }
  }

  /** The record page asks for the default curve next: compute it after the answer has gone. */
  function warmSeries(recordId: string): void {
    setImmediate(() => void series(recordId, 2000, 'log').catch(() => undefined));
  }

  return { get, list, importLogger, importTape, preview, series, file, remove };
}

export type RecordsService = ReturnType<typeof createRecordsService>;
