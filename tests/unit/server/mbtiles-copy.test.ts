import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { CopyRefused, copyMbtiles, type CopyLimits } from '../../../server/features/basemaps/mbtiles-copy';

const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-copy-'));
const WORKER = path.resolve('server/features/basemaps/mbtiles-copy.worker.mjs');
const LIMITS: CopyLimits = { timeMs: 60_000, maxBytes: 1 << 30, maxTiles: 1_000_000, maxTileBytes: 8 << 20, maxMetadataBytes: 8 << 20 };

/** An MBTiles whose tiles view counts to a billion before answering: minutes per query. */
function endlessView(name: string): string {
  const file = path.join(tmp, name);
  const db = new Database(file);
  db.exec(`CREATE TABLE metadata (name TEXT, value TEXT);
    INSERT INTO metadata VALUES ('format', 'pbf');
    CREATE VIEW tiles AS SELECT 1 AS zoom_level, 0 AS tile_column, 0 AS tile_row, x'1a00' AS tile_data
      WHERE (WITH RECURSIVE c(x) AS (SELECT 1 UNION ALL SELECT x + 1 FROM c WHERE x < 1000000000) SELECT count(*) FROM c) > 0;`);
  db.close();
  return file;
}

const alive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
};

async function gone(pid: number, withinMs: number): Promise<boolean> {
  const until = Date.now() + withinMs;
  while (alive(pid) && Date.now() < until) await new Promise((r) => setTimeout(r, 50));
  return !alive(pid);
}

describe('copying an MBTiles in a process of its own', () => {
  it('stops at the time limit although SQLite is inside one long step, and deletes the partial copy', async () => {
    const dest = path.join(tmp, 'endless.copy');
    const t0 = performance.now();
    const c = copyMbtiles(endlessView('endless.mbtiles'), dest, { ...LIMITS, timeMs: 800 });
    const e = await c.done.catch((x: unknown) => x);
    expect(e).toBeInstanceOf(CopyRefused);
    expect((e as CopyRefused).message).toMatch(/longer than the limit of 0\.8 s/);
    expect(performance.now() - t0).toBeLessThan(3000);
    expect(fs.existsSync(dest)).toBe(false);
  }, 20_000);

  it('does not outlive a server that dies without stopping it', async () => {
    // A stand-in server: starts a copy of an endless view, prints the copy's pid, then is killed.
    const src = endlessView('orphan.mbtiles');
    const script = `
      const { fork } = require('node:child_process');
      const c = fork(${JSON.stringify(WORKER)}, [], { stdio: ['ignore', 'ignore', 'ignore', 'ipc'] });
      c.send({ src: ${JSON.stringify(src)}, dest: ${JSON.stringify(path.join(tmp, 'orphan.copy'))}, limits: ${JSON.stringify({ ...LIMITS, timeMs: 600_000 })} });
      console.log(c.pid);
      setTimeout(() => process.kill(process.pid, 'SIGKILL'), 500);`;
    const server = spawn(process.execPath, ['-e', script], { stdio: ['ignore', 'pipe', 'inherit'] });
    let out = '';
    server.stdout.on('data', (d: Buffer) => (out += d.toString()));
    await new Promise((r) => server.on('exit', r));
    const pid = Number(out.trim());
    expect(pid).toBeGreaterThan(0);
    const stopped = await gone(pid, 4000);
    if (!stopped) process.kill(pid, 'SIGKILL');
    expect(stopped).toBe(true);
  }, 20_000);
});
