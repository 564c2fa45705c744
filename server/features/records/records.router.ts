import type { RequestHandler } from 'express';
import { z } from 'zod';
import { errorBodySchema } from '@shared/schemas/common';
import {
  fileQuerySchema,
  loggerSettingsSchema,
  previewSchema,
  previewSettingsSchema,
  recordListSchema,
  recordSchema,
  seriesQuerySchema,
  seriesSchema,
  tapeBodySchema,
} from '@shared/schemas/records';
import type { AppContext } from '../../context';
import { badRequest } from '../../lib/errors';
import type { RouteDef } from '../../lib/route';
import { receivedFiles, uploadMiddleware } from '../../lib/upload';
import { wellParams } from '../wells/wells.router';
import { createRecordsService, type UploadedFile, type UploadedFiles } from './records.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
export const recordParams = z.object({ recordId: z.string().uuid('Record id must be a UUID') });

const binary = (description: string) => z.string().meta({ format: 'binary', description });
const loggerMultipart = z.object({
  file: binary('The logger export (CSV or text), kept verbatim'),
  barometric: binary('The barometric record, for an absolute (non-vented) sensor').optional(),
  settings: z.string().meta({
    description: 'The logger settings as JSON',
    contentMediaType: 'application/json',
    contentSchema: z.toJSONSchema(loggerSettingsSchema, { io: 'input', unrepresentable: 'any' }),
  }),
});
const previewMultipart = z.object({
  file: binary('The logger export, or its first megabytes'),
  barometric: binary('The barometric record').optional(),
  settings: z
    .string()
    .optional()
    .meta({
      description: 'Any part of the settings already chosen, as JSON',
      contentMediaType: 'application/json',
      contentSchema: z.toJSONSchema(previewSettingsSchema, { io: 'input', unrepresentable: 'any' }),
    }),
  sampled: z.string().optional().describe('"file", "barometric" or both, comma-separated: which parts are only the start of a longer file'),
});

/** Logger files in memory, each at most RECORD_MAX_UPLOAD_MB; the settings and sample flags as text fields. */
function uploads(limitMb: number): RequestHandler {
  return uploadMiddleware({
    files: [
      { name: 'file', label: 'logger file' },
      { name: 'barometric', label: 'barometric file' },
    ],
    fields: ['settings', 'sampled'],
    maxFileMb: limitMb,
    limitName: 'RECORD_MAX_UPLOAD_MB',
    target: { memory: true },
  });
}

function filesOf(req: Parameters<RequestHandler>[0]): UploadedFiles {
  const f = receivedFiles(req);
  return { file: f.file as UploadedFile | undefined, barometric: f.barometric as UploadedFile | undefined };
}

/** Content-Disposition for a stored name: an ASCII fallback and the exact name in RFC 5987 form. */
function disposition(name: string): string {
  const ascii = name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name)}`;
}

export function recordsRoutes(ctx: AppContext): RouteDef[] {
  const svc = createRecordsService(ctx);
  const upload = uploads(ctx.config.RECORD_MAX_UPLOAD_MB);
  return [
    {
      method: 'post', path: '/api/wells/:wellId/records', tag: 'Records',
      summary:
        'Add a record to a well: a logger file (multipart: "file", optional "barometric", "settings" JSON) or typed tape readings (JSON); reduced with the engine and stored in one transaction',
      params: wellParams, status: 201,
      requestBodies: { 'multipart/form-data': loggerMultipart, 'application/json': tapeBodySchema },
      before: [upload],
      responses: {
        201: { description: 'The record, with its files and reduction', schema: recordSchema },
        400: err('Bad settings or readings, each field named; a file problem names every line (fields file.lines.<line>); nothing is stored'),
        404: err('Not a member, or no such well'),
        413: err('A file over RECORD_MAX_UPLOAD_MB'),
      },
      handler: (req) => {
        const wellId = String(req.params.wellId);
        if (req.is('multipart/form-data')) return svc.importLogger(wellId, req.user!.id, filesOf(req), req.body?.settings);
        return svc.importTape(wellId, req.user!.id, req.body);
      },
    },
    {
      method: 'post', path: '/api/records/preview', tag: 'Records',
      summary: 'Read a logger file (and a barometric file) without storing it: detected layout, columns, first rows, suggested mapping, test start and static level',
      requestBodies: { 'multipart/form-data': previewMultipart },
      before: [upload],
      responses: {
        200: { description: 'What Kfield reads from the file(s), for the user to confirm or change', schema: previewSchema },
        400: err('No file, an empty or binary file, or bad settings'),
        413: err('A file over RECORD_MAX_UPLOAD_MB'),
      },
      handler: (req) => {
        if (!req.is('multipart/form-data')) {
          throw badRequest('Send the file as multipart/form-data (field "file")', { file: 'Choose a logger file (CSV or text)' });
        }
        return svc.preview(filesOf(req), req.body?.settings, req.body?.sampled);
      },
    },
    {
      method: 'get', path: '/api/wells/:wellId/records', tag: 'Records', summary: "A well's records, newest first",
      params: wellParams,
      responses: { 200: { description: 'Records', schema: recordListSchema }, 404: err('Not a member, or no such well') },
      handler: async (req) => ({ records: await svc.list(String(req.params.wellId)) }),
    },
    {
      method: 'get', path: '/api/records/:recordId', tag: 'Records', summary: 'One record: its settings, reduction figures, files and warnings',
      params: recordParams,
      responses: { 200: { description: 'The record', schema: recordSchema }, 404: err('Not a member, or no such record') },
      handler: (req) => svc.get(String(req.params.recordId)),
    },
    {
      method: 'get', path: '/api/records/:recordId/series', tag: 'Records',
      summary: 'The normalized head H/H0 against time from the test start, downsampled by LTTB on log10 H/H0 (or on H/H0 with ?scale=linear) to ?points (default 2000)',
      params: recordParams, query: seriesQuerySchema,
      responses: { 200: { description: 'The plot series', schema: seriesSchema }, 400: err('Bad points'), 404: err('Not a member, or no such record') },
      handler: (req) => {
        const q = req.query as unknown as z.output<typeof seriesQuerySchema>;
        return svc.series(String(req.params.recordId), q.points, q.scale);
      },
    },
    {
      method: 'get', path: '/api/records/:recordId/file', tag: 'Records',
      summary: 'Download the file as uploaded, byte for byte (?which=raw or barometric); its SHA-256 is in X-Content-SHA256',
      params: recordParams, query: fileQuerySchema,
      responses: {
        200: { description: 'The file as uploaded', contentType: 'application/octet-stream' },
        404: err('Not a member, no such record, or no such file'),
      },
      handler: async (req, res) => {
        const which = (req.query as unknown as z.output<typeof fileQuerySchema>).which;
        const f = await svc.file(String(req.params.recordId), which);
        res.setHeader('Content-Type', f.mediaType);
        res.setHeader('Content-Length', String(f.content.length));
        res.setHeader('Content-Disposition', disposition(f.name));
        res.setHeader('X-Content-SHA256', f.sha256);
        res.setHeader('Repr-Digest', `sha-256=:${Buffer.from(f.sha256, 'hex').toString('base64')}:`);
        res.setHeader('Cache-Control', 'private, no-cache');
        res.status(200).end(f.content);
      },
    },
    {
      method: 'delete', path: '/api/records/:recordId', tag: 'Records', summary: 'Delete a record with its files and series',
      params: recordParams, status: 204,
      responses: { 204: { description: 'Deleted' }, 404: err('Not a member, or no such record') },
      handler: async (req) => {
        await svc.remove(String(req.params.recordId));
      },
    },
  ];
}
