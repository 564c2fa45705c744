import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { EntityManager } from 'typeorm';
import { BUILTIN_BASEMAP_ID, tileStyleUrl } from '@shared/geo/basemap';
import type { Basemap as BasemapDto, BasemapPatch } from '@shared/schemas/basemaps';
import type { AppContext } from '../../context';
import { AppError, badRequest, conflict, notFound } from '../../lib/errors';
import { Site } from '../sites/site.entity';
import { Basemap } from './basemap.entity';
import { genericStyle, kfieldStyle, styleKindOf, type Style } from './basemaps.style';
import { MbtilesFile } from './mbtiles';
import { CopyRefused, copyMbtiles, type CopyLimits, type RunningCopy } from './mbtiles-copy';

/** The folder uploaded basemaps live in: BASEMAP_DIR, or a basemaps folder beside the database file. */
export function basemapDir(config: AppContext['config']): string {
  return path.resolve(config.BASEMAP_DIR || path.join(path.dirname(path.resolve(config.DATABASE_PATH)), 'basemaps'));
}

export const builtInMbtilesPath = (config: AppContext['config']) => path.resolve(config.TILES_DIST, 'basemap.mbtiles');

/** Whether a site may choose this basemap id. */
export async function basemapExists(m: EntityManager, id: string): Promise<boolean> {
  return id === BUILTIN_BASEMAP_ID || (await m.getRepository(Basemap).exists({ where: { id } }));
}

/** The style URL a site's maps use: its own choice, else the instance default, else the built-in basemap. */
export async function siteBasemapStyleUrl(m: EntityManager, chosen: string | null): Promise<string> {
  if (chosen && (await basemapExists(m, chosen))) return tileStyleUrl(chosen);
  const def = await m.getRepository(Basemap).findOne({ where: { isDefault: true }, select: { id: true } });
  return tileStyleUrl(def?.id ?? BUILTIN_BASEMAP_ID);
}

/** Kfield's copies of uploads are named <id>.kfield.mbtiles; any other file name in a row is an upload from before copies. */
export const COPY_SUFFIX = '.kfield.mbtiles';
const isCopy = (fileName: string) => fileName.endsWith(COPY_SUFFIX);

/**
 * Limits on copying an upload (decision 009). The size limit follows BASEMAP_MAX_UPLOAD_MB; the
 * others are fixed here until they earn settings of their own.
 */
export function copyLimitsFor(config: AppContext['config']): CopyLimits {
  return {
    timeMs: 60_000,
    maxBytes: Math.round(config.BASEMAP_MAX_UPLOAD_MB * 1024 * 1024),
    maxTiles: 20_000_000,
    maxTileBytes: 8 * 1024 * 1024,
    maxMetadataBytes: 8 * 1024 * 1024,
    ...overrides,
  };
}

let overrides: Partial<CopyLimits> = {};
/** For tests: tighter limits for the copies that start after this call (null restores the defaults). */
export function overrideCopyLimits(limits: Partial<CopyLimits> | null): void {
  overrides = limits ?? {};
}

export type BasemapsService = ReturnType<typeof createBasemapsService>;

/**
 * The basemaps of this instance: the built-in one from tiles/dist and the uploaded ones, each
 * served from Kfield's copy of the upload. Open MBTiles handles are cached per id (tile routes must
 * not touch the app database), and dropped when a basemap is deleted.
 */
export function createBasemapsService({ config, ds }: AppContext, log: (msg: string) => void = () => undefined) {
  const repo = ds.getRepository(Basemap);
  const dir = basemapDir(config);
  const incoming = path.join(dir, 'incoming');
  const open = new Map<string, MbtilesFile | null>();
  /** Names of uploaded basemaps by id, so tile requests find their file without a query. */
  const known = new Map<string, Basemap>();
  /** Copies of uploads from before copies existed: running, or refused with the reason. */
  const legacyCopies = new Map<string, Promise<void>>();
  const legacyRefusals = new Map<string, string>();
  const running = new Set<RunningCopy>();
  let closed = false;
  let builtInWarned = false;

  // One copy at a time: each is CPU-bound and this server has few cores to share.
  let queue: Promise<unknown> = Promise.resolve();
  function copyInTurn(src: string, dest: string): Promise<Awaited<RunningCopy['done']>> {
    const turn = queue.then(() => {
      if (closed) throw new Error('The server is shutting down');
      fs.mkdirSync(path.dirname(dest), { recursive: true });
      const c = copyMbtiles(src, dest, copyLimitsFor(config));
      running.add(c);
      return c.done.finally(() => running.delete(c));
    });
    queue = turn.catch(() => undefined);
    return turn;
  }

  function builtIn(): MbtilesFile | null {
    if (open.has(BUILTIN_BASEMAP_ID)) return open.get(BUILTIN_BASEMAP_ID)!;
    const file = builtInMbtilesPath(config);
    if (!fs.existsSync(file)) {
      if (!builtInWarned) log(`Kfield: the built-in basemap ${file} has not been built; run npm run tiles`);
      builtInWarned = true;
      return null;
    }
    let f: MbtilesFile | null = null;
    try {
      f = MbtilesFile.open(file);
    } catch (e) {
      log(`Kfield: the built-in basemap ${file} cannot be read: ${(e as Error).message}`);
    }
    open.set(BUILTIN_BASEMAP_ID, f);
    return f;
  }

  async function rowOf(id: string): Promise<Basemap | null> {
    if (known.has(id)) return known.get(id)!;
    if (!/^[0-9a-f-]{36}$/i.test(id)) return null;
    const row = await repo.findOne({ where: { id } });
    if (row) known.set(id, row);
    return row;
  }

  /**
   * Copies an upload from before copies existed, once; the original is deleted when the copy is in
   * place. Until then its tiles answer 503; a refused copy leaves the basemap unusable, with the reason.
   */
  function copyLegacy(row: Basemap): Promise<void> {
    const pending = legacyCopies.get(row.id);
    if (pending) return pending;
    if (legacyRefusals.has(row.id)) return Promise.resolve();
    const src = path.join(dir, row.fileName);
    const fileName = `${row.id}${COPY_SUFFIX}`;
    // Another server on the same database may be copying the same row: each writes its own part.
    const part = path.join(incoming, `${fileName}.${randomUUID().slice(0, 8)}.part`);
    const p = (async () => {
      try {
        const copied = await copyInTurn(src, part);
        if (!(await repo.exists({ where: { id: row.id } }))) {
          fs.rmSync(part, { force: true });
          return;
        }
        fs.renameSync(part, path.join(dir, fileName));
        await repo.update({ id: row.id }, { fileName, sizeBytes: copied.sizeBytes, metadata: copied.metadata });
        known.delete(row.id);
        fs.rmSync(src, { force: true });
        log(`Kfield: basemap ${row.name} (${row.id}) now served from Kfield's copy (${copied.tiles} tiles)`);
      } catch (e) {
        fs.rmSync(part, { force: true });
        if (closed) return;
        const reason = e instanceof CopyRefused ? e.message : `the copy failed (${(e as Error).message})`;
        legacyRefusals.set(row.id, reason);
        log(`Kfield: basemap ${row.name} (${row.id}) could not be copied and is not served: ${reason}`);
      } finally {
        legacyCopies.delete(row.id);
      }
    })();
    legacyCopies.set(row.id, p);
    return p;
  }

  /** Started with the service, in the background: the server answers while older uploads are copied. */
  async function copyAllLegacy(): Promise<void> {
    try {
      // Partial copies left by a server that was killed mid-copy.
      const staleBefore = Date.now() - 2 * copyLimitsFor(config).timeMs - 60_000;
      for (const name of fs.existsSync(incoming) ? fs.readdirSync(incoming) : []) {
        const f = path.join(incoming, name);
        if (name.endsWith('.part') && (fs.statSync(f, { throwIfNoEntry: false })?.mtimeMs ?? Infinity) < staleBefore) fs.rmSync(f, { force: true });
      }
      const rows = await repo.find();
      for (const row of rows) if (!isCopy(row.fileName) && !closed) void copyLegacy(row);
    } catch (e) {
      if (!closed) log(`Kfield: could not look for basemaps to copy: ${(e as Error).message}`);
    }
  }
  setImmediate(() => {
    if (!closed) void copyAllLegacy();
  });

  /**
   * The open file of a basemap, or null when there is no such basemap (or its file is gone).
   * Throws 503 while an older upload is being copied and 404 with the reason when it could not be.
   */
  async function file(id: string): Promise<MbtilesFile | null> {
    if (id === BUILTIN_BASEMAP_ID) return builtIn();
    if (open.has(id)) return open.get(id)!;
    const row = await rowOf(id);
    if (!row) return null;
    if (!isCopy(row.fileName)) {
      const refused = legacyRefusals.get(id);
      if (refused) {
        throw new AppError('BASEMAP_UNUSABLE', `The basemap ${row.name} could not be copied into Kfield: ${refused}. Delete it and upload a file that fits the limits.`, 404);
      }
      void copyLegacy(row);
      throw new AppError('BASEMAP_PREPARING', `The basemap ${row.name} is being prepared; try again in a few seconds`, 503, undefined, { 'Retry-After': '5' });
    }
    let f: MbtilesFile | null = null;
    try {
      f = MbtilesFile.openCopy(path.join(dir, row.fileName), row.metadata);
    } catch (e) {
      log(`Kfield: basemap ${row.name} (${id}) cannot be read: ${(e as Error).message}`);
    }
    open.set(id, f);
    return f;
  }

  /** Synchronous lookup for the tile route once a basemap has been opened. */
  function openFile(id: string): MbtilesFile | null | undefined {
    return open.get(id);
  }

  async function siteCounts(): Promise<Map<string, number>> {
    // Sites without a choice are counted under "".
    const rows = (await ds.query('SELECT COALESCE("basemapId", \'\') AS id, COUNT(*) AS n FROM "sites" GROUP BY COALESCE("basemapId", \'\')')) as { id: string; n: number }[];
    return new Map(rows.map((r) => [r.id, Number(r.n)]));
  }

  function builtInDto(f: MbtilesFile, isDefault: boolean, count: number): BasemapDto {
    return {
      id: BUILTIN_BASEMAP_ID,
      name: 'Built-in basemap (Natural Earth and the invented demo area)',
      builtIn: true,
      isDefault,
      styleKind: styleKindOf(f.metadata),
      styleUrl: tileStyleUrl(BUILTIN_BASEMAP_ID),
      sizeBytes: f.sizeBytes,
      metadata: f.metadata,
      createdAt: null,
      siteCount: count,
    };
  }

  function rowDto(row: Basemap, count: number): BasemapDto {
    return {
      id: row.id,
      name: row.name,
      builtIn: false,
      isDefault: row.isDefault,
      styleKind: styleKindOf(row.metadata),
      styleUrl: tileStyleUrl(row.id),
      sizeBytes: row.sizeBytes,
      metadata: row.metadata,
      createdAt: row.createdAt.toISOString(),
      siteCount: count,
    };
  }

  async function list(): Promise<BasemapDto[]> {
    const rows = await repo.find({ order: { createdAt: 'ASC' } });
    const counts = await siteCounts();
    // Sites without a choice of their own use the instance default.
    const defaultId = rows.find((r) => r.isDefault)?.id ?? BUILTIN_BASEMAP_ID;
    counts.set(defaultId, (counts.get(defaultId) ?? 0) + (counts.get('') ?? 0));
    const b = builtIn();
    const out: BasemapDto[] = [];
    if (b) out.push(builtInDto(b, defaultId === BUILTIN_BASEMAP_ID, counts.get(BUILTIN_BASEMAP_ID) ?? 0));
    return [...out, ...rows.map((r) => rowDto(r, counts.get(r.id) ?? 0))];
  }

  async function get(id: string): Promise<BasemapDto> {
    const found = (await list()).find((b) => b.id === id);
    if (!found) throw notFound('The basemap');
    return found;
  }

  /**
   * Check an uploaded file by copying it into Kfield's own MBTiles within the limits, keep the copy
   * and delete the upload; or refuse it and keep nothing.
   */
  async function upload(upload: { path: string; originalname: string; size: number }, name: string | undefined): Promise<BasemapDto> {
    const id = randomUUID();
    const fileName = `${id}${COPY_SUFFIX}`;
    const part = path.join(incoming, `${fileName}.part`);
    let copied: Awaited<RunningCopy['done']>;
    try {
      copied = await copyInTurn(upload.path, part);
    } catch (e) {
      if (e instanceof CopyRefused) throw new AppError(e.code, e.message, e.status, { file: e.message });
      throw e;
    } finally {
      fs.rmSync(upload.path, { force: true });
    }
    const { metadata } = copied;
    const fallbackName = metadata.title || upload.originalname.replace(/\.mbtiles$/i, '') || 'Uploaded basemap';
    const dest = path.join(dir, fileName);
    fs.renameSync(part, dest);
    try {
      await repo.insert({ id, name: (name || fallbackName).slice(0, 120), fileName, sizeBytes: copied.sizeBytes, metadata, isDefault: false });
    } catch (e) {
      fs.rmSync(dest, { force: true });
      throw e;
    }
    return get(id);
  }

  async function update(id: string, patch: BasemapPatch): Promise<BasemapDto> {
    if (id === BUILTIN_BASEMAP_ID) {
      if (!builtIn()) throw notFound('The basemap');
      if (patch.name !== undefined) throw badRequest('The built-in basemap keeps its name', { name: 'The built-in basemap cannot be renamed' });
      if (patch.isDefault === false) {
        throw badRequest('Make another basemap the instance default instead', { isDefault: 'Choose another basemap as the instance default instead' });
      }
      // The built-in basemap is the default whenever no uploaded one is.
      await ds.transaction(async (m) => m.getRepository(Basemap).update({ isDefault: true }, { isDefault: false }));
      known.clear();
      return get(id);
    }
    const row = await rowOf(id);
    if (!row) throw notFound('The basemap');
    await ds.transaction(async (m) => {
      const r = m.getRepository(Basemap);
      if (patch.isDefault) await r.update({ isDefault: true }, { isDefault: false });
      await r.update({ id }, { ...(patch.name !== undefined ? { name: patch.name } : {}), ...(patch.isDefault !== undefined ? { isDefault: patch.isDefault } : {}) });
    });
    known.clear();
    return get(id);
  }

  async function remove(id: string): Promise<void> {
    if (id === BUILTIN_BASEMAP_ID) throw conflict('BUILT_IN_BASEMAP', 'The built-in basemap cannot be deleted');
    const row = await rowOf(id);
    if (!row) throw notFound('The basemap');
    await ds.transaction(async (m) => {
      // Sites that chose it go back to the instance default.
      await m.getRepository(Site).update({ basemapId: id }, { basemapId: null });
      await m.getRepository(Basemap).delete({ id });
    });
    open.get(id)?.close();
    open.delete(id);
    known.delete(id);
    legacyRefusals.delete(id);
    fs.rmSync(path.join(dir, row.fileName), { force: true });
  }

  /**
   * The style of a basemap with absolute URLs on PUBLIC_URL (maplibre's workers need absolute
   * URLs; the Host header is the caller's to forge) and versioned tile URLs.
   */
  async function style(id: string, glyphVersion: string): Promise<Style> {
    const origin = config.PUBLIC_URL.replace(/\/+$/, '');
    const f = await file(id);
    if (!f) throw id === BUILTIN_BASEMAP_ID ? builtInMissing() : notFound('The basemap');
    const row = id === BUILTIN_BASEMAP_ID ? null : await rowOf(id);
    const prefix = id === BUILTIN_BASEMAP_ID ? '/tiles' : `/tiles/${encodeURIComponent(id)}`;
    const urls = {
      tiles: `${origin}${prefix}/{z}/{x}/{y}.pbf?v=${f.version}`,
      glyphs: `${origin}/tiles/glyphs/{fontstack}/{range}.pbf?v=${glyphVersion}`,
    };
    const name = row?.name ?? 'Kfield';
    return styleKindOf(f.metadata) === 'kfield' ? kfieldStyle(name, f.metadata, urls) : genericStyle(name, f.metadata, urls);
  }

  function close(): void {
    closed = true;
    for (const c of running) c.cancel();
    for (const f of open.values()) f?.close();
    open.clear();
  }

  return { list, get, upload, update, remove, style, file, openFile, close, dir };
}

export const builtInMissing = () =>
  new AppError('BASEMAP_NOT_BUILT', 'The built-in basemap has not been built on this server; run npm run tiles (npm start does it when the files are missing)', 404);
