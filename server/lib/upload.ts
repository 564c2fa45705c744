import { createHash, randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { Writable } from 'node:stream';
import type { Request, RequestHandler, Response } from 'express';
import multer from 'multer';
import { AppError, badRequest } from './errors';

/** A received file: in memory (`buffer`) or on disk (`path`), with its SHA-256 computed as it arrived. */
export interface ReceivedFile {
  fieldname: string;
  originalname: string;
  mimetype: string;
  size: number;
  sha256: string;
  buffer?: Buffer;
  path?: string;
}

export interface UploadOptions {
  /** File fields, each accepted at most once; `label` names it in messages ("logger file"). */
  files: { name: string; label: string }[];
  /** Text fields, each accepted at most once. */
  fields?: string[];
  /** The per-file limit in MB and the setting it comes from, both named in a 413. */
  maxFileMb: number;
  limitName: string;
  /** The per-field limit for text fields (default 1 MB). */
  maxFieldBytes?: number;
  /** Where files go: memory, or a folder (files there are removed when the response closes; move what you keep). */
  target: { memory: true } | { dir: string };
}

const MB = 1024 * 1024;
// Room for the multipart boundaries and part headers around the allowed content.
const OVERHEAD_BYTES = 64 * 1024;

const megabytes = (bytes: number) => `${Math.round((bytes / MB) * 100) / 100} MB`;

function memoryStorage(): multer.StorageEngine {
  return {
    _handleFile(_req, file, cb) {
      // Chunks as they come, joined once at the end: the size is known only from the bytes received.
      const chunks: Buffer[] = [];
      const hash = createHash('sha256');
      let size = 0;
      file.stream.on('data', (chunk: Buffer) => {
        hash.update(chunk);
        chunks.push(chunk);
        size += chunk.length;
      });
      file.stream.on('error', (e: Error) => cb(e));
      file.stream.on('end', () => {
        cb(null, { buffer: Buffer.concat(chunks, size), size, sha256: hash.digest('hex') } as Partial<Express.Multer.File>);
      });
    },
    _removeFile(_req, file, cb) {
      delete (file as { buffer?: Buffer }).buffer;
      cb(null);
    },
  };
}

function diskStorage(dir: string): multer.StorageEngine {
  return {
    _handleFile(_req, file, cb) {
      fs.mkdir(dir, { recursive: true }, (mkdirError) => {
        if (mkdirError) return cb(mkdirError);
        const target = path.join(dir, `${randomBytes(12).toString('hex')}.upload`);
        const out: Writable = fs.createWriteStream(target, { flags: 'wx' });
        const hash = createHash('sha256');
        let size = 0;
        let failed = false;
        const fail = (e: Error) => {
          if (failed) return;
          failed = true;
          file.stream.unpipe(out);
          file.stream.resume();
          out.destroy();
          fs.rm(target, { force: true }, () => cb(e));
        };
        file.stream.on('data', (chunk: Buffer) => {
          hash.update(chunk);
          size += chunk.length;
        });
        file.stream.on('error', fail);
        out.on('error', fail);
        out.on('finish', () => {
          if (!failed) cb(null, { path: target, size, sha256: hash.digest('hex') } as Partial<Express.Multer.File>);
        });
        file.stream.pipe(out);
      });
    },
    _removeFile(_req, file, cb) {
      if (!file.path) return cb(null);
      fs.rm(file.path, { force: true }, () => cb(null));
    },
  };
}

const LINGER_MS = 1500;

/**
 * For a body refused before its end: once the answer is out, Node reads and drops what the client
 * still sends; shortly after, the connection is closed if the body has still not ended. Closing at
 * once (Connection: close) would reset the connection over the unread bytes and the client could
 * lose the answer.
 */
function closeAfterAnswer(req: Request, res: Response): void {
  res.once('finish', () => {
    const socket = req.socket;
    const timer = setTimeout(() => {
      if (!req.complete) socket.destroy();
    }, LINGER_MS);
    timer.unref();
    socket.once('close', () => clearTimeout(timer));
  });
}

const twice = (name: string) =>
  badRequest(`The multipart field "${name}" was sent twice; send it once`, { [name]: 'Sent twice; send it once' });

/**
 * multipart/form-data under limits enforced on the bytes as they arrive, never sized from a header:
 * each file at most maxFileMb (413), the whole body at most the sum of what the fields allow (413,
 * and the connection is closed soon after rather than read to its end), each field at most once and no field
 * that was not asked for (400). Requests that are not multipart pass through untouched.
 */
export function uploadMiddleware(opts: UploadOptions): RequestHandler {
  const textFields = opts.fields ?? [];
  const maxFileBytes = Math.floor(opts.maxFileMb * MB);
  const maxFieldBytes = opts.maxFieldBytes ?? MB;
  const maxTotalBytes = maxFileBytes * opts.files.length + maxFieldBytes * textFields.length + OVERHEAD_BYTES;
  const labels = new Map(opts.files.map((f) => [f.name, f.label]));
  const expected = [...opts.files.map((f) => f.name), ...textFields].map((n) => `"${n}"`).join(', ');
  const unexpected = (name: string) =>
    badRequest(`Unexpected multipart field "${name}"; the fields are ${expected}`, { [name]: 'Unexpected field' });
  const tooLargeInAll = () =>
    new AppError(
      'TOO_LARGE',
      `The upload is larger than the limit of ${opts.maxFileMb} MB per file (${opts.limitName}); at most ${megabytes(maxTotalBytes)} in all`,
      413,
    );

  const storage = 'dir' in opts.target ? diskStorage(opts.target.dir) : memoryStorage();
  const parse = (req: Request, onField: (busboy: NodeJS.EventEmitter) => void, onBody: (body: NodeJS.ReadableStream) => void) =>
    multer({
      storage,
      limits: {
        fileSize: maxFileBytes,
        files: opts.files.length,
        fieldSize: maxFieldBytes,
        // One more than allowed of each, so that a repeat reaches the check that names it.
        fields: textFields.length + 1,
        parts: opts.files.length + textFields.length + 1,
      },
      defParamCharset: 'utf8',
      // multer 2.5 feeds busboy through this hook (missing from @types/multer 2.3).
      streamHandler: (r: Request, busboy: NodeJS.WritableStream & NodeJS.EventEmitter) => {
        onField(busboy);
        onBody(r);
        r.pipe(busboy);
      },
    } as multer.Options).fields(opts.files.map((f) => ({ name: f.name, maxCount: 1 })));

  return (req, res, next) => {
    if (!req.is('multipart/form-data')) return next();
    const declared = Number(req.headers['content-length']);
    if (Number.isFinite(declared) && declared > maxTotalBytes) {
      closeAfterAnswer(req, res);
      return next(tooLargeInAll());
    }

    let settled = false;
    const finish = (e?: unknown) => {
      if (settled) return;
      settled = true;
      req.off('data', count);
      next(e);
    };
    let received = 0;
    const count = (chunk: Buffer) => {
      received += chunk.length;
      if (received > maxTotalBytes) {
        closeAfterAnswer(req, res);
        finish(tooLargeInAll());
      }
    };
    if ('dir' in opts.target) {
      // Whatever the handler did not move away is removed once the answer is out.
      res.on('close', () => {
        for (const f of Object.values(receivedFiles(req))) if (f?.path) fs.rm(f.path, { force: true }, () => undefined);
      });
    }

    const seen = new Set<string>();
    const onField = (busboy: NodeJS.EventEmitter) => {
      busboy.on('field', (name: string) => {
        const problem = !textFields.includes(name) ? unexpected(name) : seen.has(name) ? twice(name) : null;
        seen.add(name);
        // multer's error listener aborts the parse and answers with this once the body is drained.
        if (problem) busboy.emit('error', problem);
      });
    };
    const onBody = (body: NodeJS.ReadableStream) => body.on('data', count);

    parse(req, onField, onBody)(req, res, (e: unknown) => {
      if (settled) {
        // Already answered (the body went over its limit); nothing received now is wanted.
        for (const f of Object.values(receivedFiles(req))) if (f?.path) fs.rm(f.path, { force: true }, () => undefined);
        return;
      }
      if (!e) return finish();
      if (e instanceof AppError) return finish(e);
      if (e instanceof multer.MulterError) {
        const field = e.field ?? '';
        switch (e.code) {
          case 'LIMIT_FILE_SIZE':
            return finish(
              new AppError('TOO_LARGE', `The ${labels.get(field) ?? 'file'} is larger than the upload limit of ${opts.maxFileMb} MB (${opts.limitName})`, 413, {
                [field || 'file']: `Larger than the limit of ${opts.maxFileMb} MB`,
              }),
            );
          case 'LIMIT_FIELD_VALUE':
            return finish(new AppError('TOO_LARGE', `The multipart field "${field}" is larger than the limit of ${megabytes(maxFieldBytes)}`, 413, { [field]: `Larger than ${megabytes(maxFieldBytes)}` }));
          case 'LIMIT_UNEXPECTED_FILE':
            return finish(labels.has(field) ? twice(field) : unexpected(field));
          case 'LIMIT_FILE_COUNT':
          case 'LIMIT_FIELD_COUNT':
          case 'LIMIT_PART_COUNT':
            return finish(badRequest(`The upload has more parts than expected; the fields are ${expected}, each once`));
          default:
            return finish(badRequest(`The upload is malformed: ${e.message}`, field ? { [field]: e.message } : undefined));
        }
      }
      // A file system error is the server's; anything else (busboy's parse errors) is the request's.
      if ((e as NodeJS.ErrnoException)?.syscall) return finish(e);
      finish(badRequest('The upload is malformed: the multipart form could not be read', { [opts.files[0]?.name ?? 'file']: 'Could not read the multipart form' }));
    });
  };
}

/** The received files by field, one each. */
export function receivedFiles(req: Request): Record<string, ReceivedFile | undefined> {
  const files = (req.files ?? {}) as unknown as Record<string, ReceivedFile[] | undefined>;
  return Object.fromEntries(Object.entries(files).map(([k, v]) => [k, v?.[0]]));
}
