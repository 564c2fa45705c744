import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

// The server runs in a child process: an uncaught exception there is a real one (vitest's own
// handlers in this worker would otherwise catch it first), and a dead process is seen as one.
const root = path.resolve(import.meta.dirname, '../..');
const script = `
import { startTestServer } from ${JSON.stringify(path.join(root, 'tests/support/test-server.ts'))};
import { installCrashNet } from ${JSON.stringify(path.join(root, 'server/lib/crash-net.ts'))};
const ts = await startTestServer();
installCrashNet((msg, e) => console.error('crash-net:', msg, e instanceof Error ? e.message : e));
// Routes that fail outside Express's reach, the way a forgotten callback or a floating promise would.
ts.kfield.app.post('/crash/timer', () => {
  setTimeout(() => { throw new Error('thrown from a timer inside a request'); }, 5);
});
ts.kfield.app.post('/crash/promise', () => {
  void Promise.reject(new Error('rejected inside a request'));
});
ts.kfield.app.post('/crash/after-headers', (_req, res) => {
  res.writeHead(200, { 'content-type': 'text/plain' });
  res.write('partial');
  setTimeout(() => { throw new Error('thrown after the headers went out'); }, 5);
});
console.log('LISTENING ' + ts.baseUrl);
`;

let child: ChildProcess;
let baseUrl = '';
let stderr = '';

beforeAll(async () => {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-crash-net-'));
  const file = path.join(dir, 'server.mts');
  fs.writeFileSync(file, script);
  // One process (node with tsx's loader), not the tsx command, which runs the script in a child of
  // its own: killing the command left that child serving after the tests.
  child = spawn(process.execPath, ['--import', 'tsx', file], {
    cwd: root,
    env: { ...process.env, NODE_ENV: 'test', TSX_TSCONFIG_PATH: 'tsconfig.server.json' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stderr!.on('data', (d) => (stderr += d.toString()));
  baseUrl = await new Promise<string>((resolve, reject) => {
    let out = '';
    const timer = setTimeout(() => reject(new Error(`the server did not start; stderr: ${stderr}`)), 60_000);
    child.stdout!.on('data', (d) => {
      out += d.toString();
      const m = /LISTENING (\S+)/.exec(out);
      if (m) {
        clearTimeout(timer);
        resolve(m[1]);
      }
    });
    child.once('exit', (code) => reject(new Error(`the server exited with ${code}; stderr: ${stderr}`)));
  });
}, 90_000);

afterAll(() => {
  child?.kill('SIGKILL');
});

const health = async () => (await fetch(`${baseUrl}/api/health`)).status;

describe('an error that escapes a route', () => {
  it.each(['timer', 'promise'])('thrown from a %s: that request gets a 500 in the error shape, and the server keeps serving', async (kind) => {
    const r = await fetch(`${baseUrl}/crash/${kind}`, { method: 'POST', signal: AbortSignal.timeout(10_000) });
    expect(r.status).toBe(500);
    expect(await r.json()).toEqual({ error: { code: 'INTERNAL', message: expect.any(String) } });
    expect(await health()).toBe(200);
    expect(stderr).toMatch(kind === 'timer' ? /thrown from a timer inside a request/ : /rejected inside a request/);
  });

  it('after the headers went out: the response is cut off, and the server keeps serving', async () => {
    const r = await fetch(`${baseUrl}/crash/after-headers`, { method: 'POST', signal: AbortSignal.timeout(10_000) });
    expect(r.status).toBe(200);
    await expect(r.text()).rejects.toThrow();
    expect(await health()).toBe(200);
  });
});
