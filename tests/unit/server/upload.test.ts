import { createHash } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import express from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { errorMiddleware } from '../../../server/lib/error-middleware';
import { receivedFiles, uploadMiddleware, type ReceivedFile } from '../../../server/lib/upload';

const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');

/** An app that answers what the middleware received, and where a disk file was while the handler ran. */
function appWith(target: { memory: true } | { dir: string }) {
  const app = express();
  app.post('/up', uploadMiddleware({ files: [{ name: 'file', label: 'test file' }], fields: ['name'], maxFileMb: 0.1, limitName: 'TEST_MAX_MB', target }), (req, res) => {
    const f = receivedFiles(req).file as ReceivedFile | undefined;
    res.json({
      body: req.body,
      file: f && { size: f.size, sha256: f.sha256, inMemory: f.buffer ? sha256(f.buffer) : null, path: f.path ?? null, onDisk: f.path ? sha256(fs.readFileSync(f.path)) : null },
    });
  });
  app.use(errorMiddleware(() => undefined));
  return app;
}

const bytes = Buffer.from(Array.from({ length: 5000 }, (_, i) => `${i},${i * 2}`).join('\n'));

describe('uploadMiddleware', () => {
  it('keeps a file in memory with the SHA-256 of the bytes received', async () => {
    const r = await request(appWith({ memory: true })).post('/up').field('name', 'x').attach('file', bytes, 'a.csv');
    expect(r.status).toBe(200);
    expect(r.body).toEqual({ body: { name: 'x' }, file: { size: bytes.length, sha256: sha256(bytes), inMemory: sha256(bytes), path: null, onDisk: null } });
  });

  it('writes a file to the folder, and removes it once the answer is out', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-upload-'));
    const r = await request(appWith({ dir: path.join(dir, 'incoming') })).post('/up').attach('file', bytes, 'a.csv');
    expect(r.status).toBe(200);
    expect(r.body.file).toMatchObject({ size: bytes.length, sha256: sha256(bytes), onDisk: sha256(bytes) });
    await expect.poll(() => fs.existsSync(r.body.file.path)).toBe(false);
  });

  it('leaves nothing in the folder when a file is over the limit, and names the limit', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-upload-'));
    const r = await request(appWith({ dir })).post('/up').attach('file', Buffer.alloc(200 * 1024, 'a'), 'big.csv');
    expect(r.status).toBe(413);
    expect(r.body.error).toMatchObject({ code: 'TOO_LARGE', message: 'The test file is larger than the upload limit of 0.1 MB (TEST_MAX_MB)' });
    await expect.poll(() => fs.readdirSync(dir)).toEqual([]);
  });

  it('refuses a repeated text field, naming it', async () => {
    const r = await request(appWith({ memory: true })).post('/up').field('name', 'a').field('name', 'b').attach('file', bytes, 'a.csv');
    expect(r.status).toBe(400);
    expect(r.body.error).toMatchObject({ message: 'The multipart field "name" was sent twice; send it once', fields: { name: 'Sent twice; send it once' } });
  });

  it('passes a request that is not multipart through untouched', async () => {
    const r = await request(appWith({ memory: true })).post('/up').send('plain');
    expect(r.status).toBe(200);
    expect(r.body.file).toBeUndefined();
  });
});
