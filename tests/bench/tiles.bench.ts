import { spawnSync } from 'node:child_process';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import Database from 'better-sqlite3';
import express from 'express';
import { tmsRow } from '../../shared/geo/tiles';
import { startTestServer } from '../support/test-server';

/*
 * The tile route against a minimal Express route that returns a 30 KB buffer, side by side in
 * one run, over loopback with CONCURRENCY keep-alive clients. The load runs in a worker thread
 * so that the server keeps the main thread (this machine has 2 cores). Rounds alternate between
 * the two so that noise hits both alike. Target: tiles ≥ 0.8 × the minimal route.
 */
const CONCURRENCY = 16;
const ROUND_SECONDS = 2;
const ROUNDS = 8;
const MAX_REQUESTS_PER_ROUND = 20_000;
const TARGET_RATIO = 0.8;

interface LoadResult {
  requests: number;
  seconds: number;
  errors: number;
  bytes: number;
  statuses: Record<string, number>;
}

// Plain CommonJS so the worker needs no TypeScript loader.
const LOAD_WORKER = `
const http = require('node:http');
const { parentPort, workerData } = require('node:worker_threads');
const { urls, concurrency, seconds, maxRequests, headers } = workerData;
const agent = new http.Agent({ keepAlive: true, maxSockets: concurrency });
let next = 0, done = 0, errors = 0, bytes = 0, active = 0;
const statuses = {};
const start = process.hrtime.bigint();
const deadline = start + BigInt(Math.round(seconds * 1e9));
function finish() {
  if (active > 0) return;
  const s = Number(process.hrtime.bigint() - start) / 1e9;
  agent.destroy();
  parentPort.postMessage({ requests: done, seconds: s, errors, bytes, statuses });
}
function one() {
  if (next >= maxRequests || process.hrtime.bigint() > deadline) return finish();
  const url = urls[next++ % urls.length];
  active++;
  const req = http.get(url, { agent, headers }, (res) => {
    statuses[res.statusCode] = (statuses[res.statusCode] || 0) + 1;
    res.on('data', (c) => { bytes += c.length; });
    res.on('end', () => { active--; done++; one(); });
  });
  req.on('error', () => { active--; errors++; one(); });
}
for (let i = 0; i < concurrency; i++) one();
`;

function load(urls: string[], headers: Record<string, string>, seconds: number, maxRequests: number): Promise<LoadResult> {
  return new Promise((resolve, reject) => {
    const w = new Worker(LOAD_WORKER, { eval: true, workerData: { urls, concurrency: CONCURRENCY, seconds, maxRequests, headers } });
    w.once('message', (m: LoadResult) => {
      void w.terminate();
      resolve(m);
    });
    w.once('error', reject);
  });
}

/** Every demo-area tile from zoom 12 to 16 that the built basemap holds, as XYZ paths. */
function demoTilePaths(): string[] {
  const db = new Database(path.resolve('tiles/dist/basemap.mbtiles'), { readonly: true });
  const rows = db.prepare('SELECT zoom_level AS z, tile_column AS x, tile_row AS r FROM tiles WHERE zoom_level >= 12 ORDER BY zoom_level, tile_column, tile_row').all() as { z: number; x: number; r: number }[];
  db.close();
  // A fixed shuffle, so the clients do not walk the file in order.
  const paths = rows.map(({ z, x, r }) => `/tiles/${z}/${x}/${tmsRow(z, r)}.pbf`);
  let seed = 7;
  for (let i = paths.length - 1; i > 0; i--) {
    seed = (Math.imul(seed, 1103515245) + 12345) >>> 0;
    const j = seed % (i + 1);
    [paths[i], paths[j]] = [paths[j], paths[i]];
  }
  return paths;
}

export async function run(): Promise<void> {
  const built = spawnSync(process.execPath, ['tiles/ensure.mjs'], { stdio: 'inherit' });
  if (built.status !== 0) throw new Error('the basemap build failed');

  const ts = await startTestServer();
  const body = Buffer.alloc(30 * 1024);
  for (let i = 0; i < body.length; i++) body[i] = (i * 31 + 7) & 0xff;
  const minimal = express();
  minimal.get('/tile/:n', (_req, res) => {
    res.type('application/x-protobuf').send(body);
  });
  const baseline = http.createServer(minimal);
  await new Promise<void>((r) => baseline.listen(0, '127.0.0.1', () => r()));
  const baseUrl = `http://127.0.0.1:${(baseline.address() as AddressInfo).port}`;

  try {
    const tilePaths = demoTilePaths();
    const tileUrls = tilePaths.map((p) => `${ts.baseUrl}${p}`);
    const baseUrls = tilePaths.map((_p, i) => `${baseUrl}/tile/${i}`);
    const gzip = { 'accept-encoding': 'gzip, deflate, br' };

    // Warm up both (JIT, the open MBTiles handle, the page cache).
    await load(tileUrls, gzip, 1, 3000);
    await load(baseUrls, gzip, 1, 3000);

    const tiles: LoadResult[] = [];
    const base: LoadResult[] = [];
    for (let round = 0; round < ROUNDS; round++) {
      base.push(await load(baseUrls, gzip, ROUND_SECONDS, MAX_REQUESTS_PER_ROUND));
      tiles.push(await load(tileUrls, gzip, ROUND_SECONDS, MAX_REQUESTS_PER_ROUND));
    }
    const rate = (rs: LoadResult[]) => rs.reduce((s, r) => s + r.requests, 0) / rs.reduce((s, r) => s + r.seconds, 0);
    const avgBytes = (rs: LoadResult[]) => rs.reduce((s, r) => s + r.bytes, 0) / Math.max(1, rs.reduce((s, r) => s + r.requests, 0));
    const tileRate = rate(tiles);
    const baseRate = rate(base);
    const ratio = tileRate / baseRate;
    // Each round pairs a baseline run with the tile run right after it; the median pair ratio is
    // the figure least moved by other work on the machine.
    const pairs = tiles.map((t, i) => t.requests / t.seconds / (base[i].requests / base[i].seconds)).sort((a, b) => a - b);
    const median = (pairs[(pairs.length - 1) >> 1] + pairs[pairs.length >> 1]) / 2;
    const statuses = tiles.reduce<Record<string, number>>((acc, r) => {
      for (const [k, v] of Object.entries(r.statuses)) acc[k] = (acc[k] ?? 0) + v;
      return acc;
    }, {});
    const errors = [...tiles, ...base].reduce((s, r) => s + r.errors, 0);
    console.log(`tile route vs a minimal Express route (30 KB buffer), ${CONCURRENCY} keep-alive clients over loopback, ${ROUNDS} alternating rounds of ≤ ${ROUND_SECONDS} s or ${MAX_REQUESTS_PER_ROUND.toLocaleString('en-US')} requests`);
    console.log(`  ${tilePaths.length} distinct demo-area tiles (z12–16), mean ${(avgBytes(tiles) / 1024).toFixed(1)} KB gzipped on the wire; statuses ${JSON.stringify(statuses)}; errors ${errors}`);
    console.log(`  minimal Express route   ${baseRate.toFixed(0).padStart(7)} req/s   (rounds: ${base.map((r) => (r.requests / r.seconds).toFixed(0)).join(', ')})`);
    console.log(`  GET /tiles/{z}/{x}/{y}  ${tileRate.toFixed(0).padStart(7)} req/s   (rounds: ${tiles.map((r) => (r.requests / r.seconds).toFixed(0)).join(', ')})`);
    console.log(`  ratio ${ratio.toFixed(2)} overall, median of the ${ROUNDS} round pairs ${median.toFixed(2)} (target ≥ ${TARGET_RATIO}): ${median >= TARGET_RATIO ? 'met' : 'NOT met'}`);
  } finally {
    await new Promise<void>((r) => baseline.close(() => r()));
    await ts.close();
  }
}
