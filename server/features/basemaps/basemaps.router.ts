import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { Request, RequestHandler, Response } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { BUILTIN_BASEMAP_ID } from '@shared/geo/basemap';
import { isValidTile } from '@shared/geo/tiles';
import {
  basemapChoiceListSchema,
  basemapIdSchema,
  basemapListSchema,
  basemapPatchSchema,
  basemapSchema,
  basemapUploadSchema,
} from '@shared/schemas/basemaps';
import { errorBodySchema } from '@shared/schemas/common';
import type { AppContext } from '../../context';
import { AppError, badRequest, notFound } from '../../lib/errors';
import type { RouteDef } from '../../lib/route';
import { parseOrThrow } from '../../lib/validate';
import { builtInMissing, type BasemapsService } from './basemaps.service';
import { createGlyphStore } from './glyphs';
import { gzipTile, rawTile, type MbtilesFile, type TileHit } from './mbtiles';

const err = (description: string) => ({ description, schema: errorBodySchema });
const PBF = 'application/x-protobuf';
const DAY = 'public, max-age=86400';
/** Tile and glyph URLs in the served styles carry ?v=<version>: those answers never change. */
const IMMUTABLE = 'public, max-age=31536000, immutable';
/** What helmet would add that matters for a tile (the tile routes are mounted ahead of helmet). */
const SECURITY_HEADERS = { 'X-Content-Type-Options': 'nosniff', 'Cross-Origin-Resource-Policy': 'same-origin' };

const basemapParams = z.object({ basemapId: basemapIdSchema });
const versionQuery = z.object({ v: z.string().max(64).optional() });
const glyphParams = z.object({ fontstack: z.string().min(1).max(300), range: z.string().max(16) });

/** Whether an If-None-Match header names this ETag (a list, W/ prefixes and * allowed). */
function matches(header: string | undefined, etag: string): boolean {
  if (!header) return false;
  if (header.trim() === '*') return true;
  return header.split(',').some((t) => t.trim().replace(/^W\//, '') === etag);
}

/** Gzipped copies of tiles stored without compression, so they are compressed once, not per request. */
const gzCache = new Map<string, Buffer>();
function gzipped(hit: TileHit): Buffer {
  if (hit.data[0] === 0x1f && hit.data[1] === 0x8b) return hit.data;
  let gz = gzCache.get(hit.etag);
  if (!gz) {
    gz = gzipTile(hit.data);
    if (gzCache.size >= 2048) gzCache.delete(gzCache.keys().next().value!);
    gzCache.set(hit.etag, gz);
  }
  return gz;
}

const WHOLE = /^\d{1,9}$/;

/**
 * The tile address, checked by hand rather than by a zod schema: this is the route a map view
 * calls hundreds of times (tests/bench/tiles.bench.ts holds it to 0.8× a bare Express route).
 */
function tileAddress(req: Request): { z: number; x: number; y: number } {
  const { z, x, y } = req.params as Record<string, string>;
  if (!WHOLE.test(z) || !WHOLE.test(x) || !WHOLE.test(y)) {
    throw badRequest(`There is no tile ${z}/${x}/${y}: z, x and y are whole numbers`, { z: 'A whole number', x: 'A whole number', y: 'A whole number' });
  }
  const t = { z: Number(z), x: Number(x), y: Number(y) };
  if (!isValidTile(t.z, t.x, t.y)) throw badRequest(`There is no tile ${z}/${x}/${y}: z is at most 24 and x and y are below 2^z`);
  return t;
}

/** The v= of a versioned URL, without parsing the query string into an object. */
function versionOf(req: Request): string | null {
  const q = req.url.indexOf('?');
  return q < 0 ? null : new URLSearchParams(req.url.slice(q + 1)).get('v');
}

async function sendTile(req: Request, res: Response, f: MbtilesFile): Promise<void> {
  const { z: zoom, x, y } = tileAddress(req);
  const cache = versionOf(req) === f.version ? IMMUTABLE : DAY;
  const hit = f.getTile(zoom, x, y);
  if (!hit) {
    res.writeHead(204, { 'Cache-Control': cache, ...SECURITY_HEADERS });
    res.end();
    return;
  }
  const headers: Record<string, string> = { 'Cache-Control': cache, ETag: hit.etag, Vary: 'Accept-Encoding', ...SECURITY_HEADERS };
  if (matches(req.headers['if-none-match'], hit.etag)) {
    res.writeHead(304, headers);
    res.end();
    return;
  }
  const gzipOk = /\bgzip\b/i.test(req.headers['accept-encoding'] ?? '');
  const body = gzipOk ? gzipped(hit) : await rawTile(hit.data);
  headers['Content-Type'] = PBF;
  headers['Content-Length'] = String(body.length);
  if (gzipOk) headers['Content-Encoding'] = 'gzip';
  res.writeHead(200, headers);
  res.end(body);
}

/**
 * The public tile, style and glyph routes (not under /api): viewer-link pages read them without
 * an account. They are mounted ahead of the session middleware, so a tile never touches the
 * session store and never sets a cookie.
 */
export function basemapTileRoutes(ctx: AppContext, svc: BasemapsService): RouteDef[] {
  const glyphs = createGlyphStore(ctx.config);
  const tileResponses = {
    200: { description: 'A Mapbox Vector Tile, gzip-encoded (Content-Encoding: gzip), with an ETag', contentType: PBF },
    204: { description: 'No tile there (outside the basemap or empty)' },
    304: { description: 'Not modified (If-None-Match matched the ETag)' },
    400: err('Not a tile address'),
    404: err('No such basemap, or an older upload that could not be copied within the limits'),
    503: err('An older upload is being copied; try again after Retry-After seconds'),
  };

  async function fileOrThrow(id: string): Promise<MbtilesFile> {
    const f = svc.openFile(id) ?? (await svc.file(id));
    if (!f) throw id === BUILTIN_BASEMAP_ID ? builtInMissing() : notFound('The basemap');
    return f;
  }

  const styleResponses = {
    200: { description: 'A MapLibre style (version 8) with absolute tile and glyph URLs on PUBLIC_URL' },
    404: err('No such basemap, or an older upload that could not be copied within the limits'),
    503: err('An older upload is being copied; try again after Retry-After seconds'),
  };
  const style = async (res: Response, id: string) => {
    const s = await svc.style(id, glyphs.glyphVersion());
    // Uploads and deletions change styles: revalidate every time (Express answers 304 on a matching ETag).
    res.setHeader('Cache-Control', 'no-cache');
    for (const [k, v] of Object.entries(SECURITY_HEADERS)) res.setHeader(k, v);
    return s;
  };

  // Glyphs before the tile route (both have four segments); the tile route next, as it is the one
  // hit hundreds of times per map view.
  return [
    {
      method: 'get', path: '/tiles/glyphs/:fontstack/:range.pbf', tag: 'Basemaps',
      summary: 'Label glyphs (SDF PBF) of Roboto Flex Regular or Bold for 256 code points, e.g. /tiles/glyphs/Roboto Flex Regular/0-255.pbf',
      params: glyphParams, query: versionQuery,
      responses: { 200: { description: 'Glyph PBF (an empty fontstack where the font has no glyphs)', contentType: PBF }, 304: { description: 'Not modified' }, 400: err('Not a glyph range'), 404: err('Glyphs not built') },
      handler: (req, res) => {
        const { fontstack, range } = req.params as { fontstack: string; range: string };
        const g = glyphs.get(fontstack, range);
        if (!g) throw new AppError('GLYPHS_NOT_BUILT', 'The label glyphs have not been built on this server; run npm run tiles', 404);
        const cache = (req.query as { v?: string }).v === glyphs.glyphVersion() ? IMMUTABLE : DAY;
        if (matches(req.headers['if-none-match'], g.etag)) {
          res.writeHead(304, { ETag: g.etag, 'Cache-Control': cache, ...SECURITY_HEADERS });
          res.end();
          return;
        }
        res.writeHead(200, { 'Content-Type': PBF, 'Content-Length': String(g.body.length), ETag: g.etag, 'Cache-Control': cache, ...SECURITY_HEADERS });
        res.end(g.body);
      },
    },
    {
      method: 'get', path: '/tiles/:z/:x/:y.pbf', tag: 'Basemaps', summary: 'A tile of the built-in basemap (XYZ addressing)',
      responses: tileResponses,
      handler: async (req, res) => sendTile(req, res, await fileOrThrow(BUILTIN_BASEMAP_ID)),
    },
    {
      method: 'get', path: '/tiles/style.json', tag: 'Basemaps', summary: 'The built-in basemap’s style',
      responses: styleResponses,
      handler: (_req, res) => style(res, BUILTIN_BASEMAP_ID),
    },
    {
      method: 'get', path: '/tiles/:basemapId/style.json', tag: 'Basemaps',
      summary: 'A basemap’s style: Kfield’s own for tilesets with Kfield’s layer names, otherwise one generated from the layer list',
      params: basemapParams, responses: styleResponses,
      handler: (req, res) => style(res, String(req.params.basemapId)),
    },
    {
      method: 'get', path: '/tiles/:basemapId/:z/:x/:y.pbf', tag: 'Basemaps', summary: 'A tile of a basemap ("default" is the built-in one)',
      params: basemapParams, responses: tileResponses,
      handler: async (req, res) => sendTile(req, res, await fileOrThrow(String(req.params.basemapId))),
    },
  ];
}

/** multipart/form-data with the MBTiles file in `file` (and an optional `name`), streamed to disk. */
function uploadMiddleware(ctx: AppContext, svc: BasemapsService): RequestHandler {
  const maxBytes = Math.round(ctx.config.BASEMAP_MAX_UPLOAD_MB * 1024 * 1024);
  const incoming = path.join(svc.dir, 'incoming');
  const upload = multer({
    storage: multer.diskStorage({
      destination: (_req, _file, cb) => {
        fs.mkdir(incoming, { recursive: true }, (e) => cb(e, incoming));
      },
      filename: (_req, _file, cb) => cb(null, `${crypto.randomBytes(12).toString('hex')}.upload`),
    }),
    limits: { fileSize: maxBytes, files: 1, fields: 4, fieldSize: 4096 },
  });
  return (req, res, next) => {
    if (!req.is('multipart/form-data')) {
      return next(badRequest('Send the MBTiles file as multipart/form-data in a field named "file"', { file: 'Choose an MBTiles file' }));
    }
    upload.single('file')(req, res, (e: unknown) => {
      // Whatever happens next, a refused or failed upload leaves nothing behind.
      const tmp = req.file?.path;
      if (tmp) res.on('close', () => fs.rm(tmp, { force: true }, () => undefined));
      if (e instanceof multer.MulterError) {
        if (e.code === 'LIMIT_FILE_SIZE') {
          return next(new AppError('TOO_LARGE', `The file is larger than the limit of ${ctx.config.BASEMAP_MAX_UPLOAD_MB} MB (BASEMAP_MAX_UPLOAD_MB)`, 413, { file: 'Too large' }));
        }
        return next(badRequest(`The upload is malformed: ${e.message}`, { [e.field ?? 'file']: e.message }));
      }
      if (e) return next(badRequest('The upload could not be read', { file: 'Could not read the multipart form' }));
      if (!req.file) return next(badRequest('Choose an MBTiles file to upload', { file: 'Choose an MBTiles file' }));
      next();
    });
  };
}

export function basemapApiRoutes(ctx: AppContext, svc: BasemapsService): RouteDef[] {
  return [
    {
      method: 'get', path: '/api/basemaps', tag: 'Basemaps', summary: 'The basemaps a site can use (for choosing a site’s basemap)',
      responses: { 200: { description: 'Basemaps', schema: basemapChoiceListSchema } },
      handler: async () => ({
        basemaps: (await svc.list()).map(({ id, name, builtIn, isDefault, styleUrl }) => ({ id, name, builtIn, isDefault, styleUrl })),
      }),
    },
    {
      method: 'get', path: '/api/admin/basemaps', tag: 'Basemaps', summary: 'Every basemap with its metadata, size and how many sites use it',
      responses: { 200: { description: 'Basemaps', schema: basemapListSchema } },
      handler: async () => ({ basemaps: await svc.list() }),
    },
    {
      method: 'post', path: '/api/admin/basemaps', tag: 'Basemaps',
      summary: 'Upload a vector MBTiles basemap (multipart: file, optional name); it is copied into Kfield’s own MBTiles within a time and size limit, and anything that is not SQLite, MBTiles and format pbf, or does not fit the limits, is refused and nothing is kept',
      status: 201,
      // The body is multipart, read by the upload middleware; its text fields are checked in the handler.
      requestBodies: { 'multipart/form-data': basemapUploadSchema.extend({ file: z.string().describe('The .mbtiles file') }) },
      before: [uploadMiddleware(ctx, svc)],
      responses: {
        201: { description: 'The new basemap', schema: basemapSchema },
        400: err('Not a vector MBTiles file (the message says why), too slow to read within the time limit, or no file'),
        413: err('Larger than BASEMAP_MAX_UPLOAD_MB, as uploaded or once copied, or more tiles or a larger tile than the limits'),
      },
      handler: (req) => svc.upload(req.file!, parseOrThrow(basemapUploadSchema, req.body ?? {}, 'request body').name),
    },
    {
      method: 'patch', path: '/api/admin/basemaps/:basemapId', tag: 'Basemaps', summary: 'Rename a basemap or make it the instance default',
      params: basemapParams, body: basemapPatchSchema,
      responses: { 200: { description: 'The basemap', schema: basemapSchema }, 400: err('Invalid change'), 404: err('No such basemap') },
      handler: (req) => svc.update(String(req.params.basemapId), req.body),
    },
    {
      method: 'delete', path: '/api/admin/basemaps/:basemapId', tag: 'Basemaps', summary: 'Delete an uploaded basemap; sites that used it go back to the instance default',
      params: basemapParams, status: 204,
      responses: { 204: { description: 'Deleted' }, 404: err('No such basemap'), 409: err('The built-in basemap cannot be deleted') },
      handler: async (req) => {
        await svc.remove(String(req.params.basemapId));
      },
    },
  ];
}
