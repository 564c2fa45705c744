import { fork } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { BasemapMetadata } from '@shared/schemas/basemaps';

const WORKER = path.join(path.dirname(fileURLToPath(import.meta.url)), 'mbtiles-copy.worker.mjs');

export interface CopyLimits {
  /** Wall-clock time for the whole copy, from the start of its process. */
  timeMs: number;
  /** Bytes of (gzipped) tiles in the copy. */
  maxBytes: number;
  maxTiles: number;
  /** A single tile, decompressed. */
  maxTileBytes: number;
  maxMetadataBytes: number;
}

export interface CopyResult {
  metadata: BasemapMetadata;
  tiles: number;
  sizeBytes: number;
}

/** An upload refused by the checks or a limit; the message is shown to the Admin as it is. */
export class CopyRefused extends Error {
  constructor(readonly status: 400 | 413, readonly code: string, message: string) {
    super(message);
  }
}

const seconds = (ms: number) => `${Number((ms / 1000).toFixed(1))} s`;
const megabytes = (bytes: number) => `${Number((bytes / 1048576).toPrecision(3))} MB`;

function limitMessage(limit: string, limits: CopyLimits, detail: { z?: number }): CopyRefused {
  if (limit === 'bytes') {
    return new CopyRefused(413, 'TOO_LARGE', `The tiles take more than the limit of ${megabytes(limits.maxBytes)} (BASEMAP_MAX_UPLOAD_MB) once copied`);
  }
  if (limit === 'tiles') return new CopyRefused(413, 'TOO_MANY_TILES', `The file has more than ${limits.maxTiles} tiles, the limit for one basemap`);
  return new CopyRefused(413, 'TILE_TOO_LARGE', `A tile at zoom ${detail.z} is larger than the limit of ${megabytes(limits.maxTileBytes)} for one tile once decompressed`);
}

export interface RunningCopy {
  done: Promise<CopyResult>;
  /** Stops the copy now (its process is killed) and deletes the partial file. */
  cancel(): void;
}

/**
 * Copies an MBTiles file into a new file of Kfield's plain schema (metadata; tiles keyed by
 * zoom_level, tile_column, tile_row; tiles gzipped), in a child process: every query on the
 * source runs there, so a slow view cannot block the server, and the process is killed at the
 * time limit (a worker thread could not be stopped while SQLite runs one long step; decision 009).
 * On any failure `dest` is deleted.
 */
export function copyMbtiles(src: string, dest: string, limits: CopyLimits): RunningCopy {
  const child = fork(WORKER, [], {
    execArgv: ['--max-old-space-size=512'],
    stdio: ['ignore', 'ignore', 'pipe', 'ipc'],
    serialization: 'json',
  });
  let stderr = '';
  child.stderr?.setEncoding('utf8').on('data', (s: string) => {
    stderr = (stderr + s).slice(-2000);
  });
  let answer: { type: string; message?: string; limit?: string; detail?: { z?: number } } & Partial<CopyResult> | null = null;
  let stopped: CopyRefused | Error | null = null;
  const timer = setTimeout(() => {
    stopped = new CopyRefused(400, 'BASEMAP_TOO_SLOW', `Reading the file's tiles took longer than the limit of ${seconds(limits.timeMs)}; a basemap must be quick to read (is its tiles table a slow view?)`);
    child.kill('SIGKILL');
  }, limits.timeMs);
  timer.unref();

  const done = new Promise<CopyResult>((resolve, reject) => {
    child.on('message', (m) => {
      answer = m as typeof answer;
      clearTimeout(timer);
    });
    child.on('error', (e) => {
      stopped ??= e;
      child.kill('SIGKILL');
    });
    child.on('exit', (code, signal) => {
      clearTimeout(timer);
      const a = answer;
      if (!stopped && a?.type === 'done') {
        resolve({ metadata: a.metadata!, tiles: a.tiles!, sizeBytes: a.sizeBytes! });
        return;
      }
      fs.rmSync(dest, { force: true });
      if (stopped) reject(stopped);
      else if (a?.type === 'refused') reject(new CopyRefused(400, 'NOT_VECTOR_MBTILES', a.message!));
      else if (a?.type === 'limit') reject(limitMessage(a.limit!, limits, a.detail ?? {}));
      else reject(new Error(`The basemap copy failed (${a?.message ?? `exit ${code ?? signal}`})${stderr ? `: ${stderr}` : ''}`));
    });
  });
  child.send({ src, dest, limits });
  return {
    done,
    cancel: () => {
      stopped ??= new Error('The basemap copy was cancelled');
      child.kill('SIGKILL');
    },
  };
}
