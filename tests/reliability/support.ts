import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { DEMO_PASSWORD, demoEmail, freePort } from '../support/test-server';

export { DEMO_PASSWORD, demoEmail, freePort };
export const REPO_ROOT = fileURLToPath(new URL('../..', import.meta.url));

export interface ServerProcess {
  child: ChildProcess;
  pid: number;
  port: number;
  baseUrl: string;
  dbPath: string;
  /** Everything the process wrote to stdout and stderr so far. */
  output(): string;
  /** SIGKILL, then wait until the process is gone. */
  kill9(): Promise<void>;
  /** SIGTERM and wait (SIGKILL after 15 s). */
  stop(): Promise<void>;
}

export const tempDir = (prefix: string) => fs.mkdtempSync(path.join(os.tmpdir(), prefix));

/**
 * The real server in a process of its own. Node runs server/index.ts with tsx as an import hook
 * (not through the tsx CLI, which would put the server in a grandchild that survives our SIGKILL).
 */
export async function startServerProcess(opts: { dbPath: string; port?: number; env?: Record<string, string>; readyTimeoutMs?: number }): Promise<ServerProcess> {
  const port = opts.port ?? (await freePort());
  const baseUrl = `http://127.0.0.1:${port}`;
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    cwd: REPO_ROOT,
    env: {
      ...process.env,
      TSX_TSCONFIG_PATH: 'tsconfig.server.json',
      NODE_ENV: 'test',
      HOST: '127.0.0.1',
      PORT: String(port),
      PUBLIC_URL: baseUrl,
      DATABASE_PATH: opts.dbPath,
      SMTP_PORT: '0',
      BCRYPT_COST: '10',
      DEMO_DATA: 'true',
      CLIENT_DIST: path.join(path.dirname(opts.dbPath), 'no-client'),
      ...opts.env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let log = '';
  child.stdout!.on('data', (d: Buffer) => (log += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (log += d.toString()));
  let exited = child.exitCode !== null || child.signalCode !== null;
  const exit = new Promise<void>((r) => child.once('exit', () => ((exited = true), r())));

  const deadline = Date.now() + (opts.readyTimeoutMs ?? 120_000);
  for (;;) {
    if (exited) throw new Error(`the server exited before answering /api/health:\n${log}`);
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`the server did not answer /api/health in time:\n${log}`);
    }
    const ok = await send(`${baseUrl}/api/health`, { timeoutMs: 2000 }).then(
      (r) => r.status === 200,
      () => false,
    );
    if (ok) break;
    await new Promise((r) => setTimeout(r, 100));
  }
  return {
    child,
    pid: child.pid!,
    port,
    baseUrl,
    dbPath: opts.dbPath,
    output: () => log,
    kill9: async () => {
      if (!exited) child.kill('SIGKILL');
      await exit;
    },
    stop: async () => {
      if (exited) return;
      child.kill('SIGTERM');
      const t = setTimeout(() => child.kill('SIGKILL'), 15_000);
      await exit;
      clearTimeout(t);
    },
  };
}

/** Resident memory of a process now and at its peak (Linux /proc), MB. */
export function rssMb(pid: number): { now: number; peak: number } {
  const s = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
  const kb = (k: string) => Number(new RegExp(`${k}:\\s+(\\d+) kB`).exec(s)?.[1] ?? NaN);
  return { now: kb('VmRSS') / 1024, peak: kb('VmHWM') / 1024 };
}

export interface Answer {
  status: number;
  headers: http.IncomingHttpHeaders;
  body: Buffer;
  text(): string;
  json<T = unknown>(): T;
}

export interface SendOptions {
  method?: string;
  headers?: Record<string, string>;
  /** Sent as is; a string is UTF-8. Arrays are written part by part (large uploads without a copy). */
  body?: string | Buffer | Buffer[];
  timeoutMs?: number;
  agent?: http.Agent | false;
}

/** One HTTP request on loopback; rejects on a network error or a timeout, never on a status. */
export function send(url: string, o: SendOptions = {}): Promise<Answer> {
  const parts = o.body === undefined ? [] : Array.isArray(o.body) ? o.body : [Buffer.from(o.body)];
  const length = parts.reduce((n, b) => n + b.length, 0);
  return new Promise((resolve, reject) => {
    const req = http.request(url, {
      method: o.method ?? 'GET',
      agent: o.agent ?? false,
      headers: { ...o.headers, ...(o.body !== undefined ? { 'content-length': String(length) } : {}) },
    });
    if (o.timeoutMs) req.setTimeout(o.timeoutMs, () => req.destroy(new Error(`timed out after ${o.timeoutMs} ms`)));
    req.on('response', (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('error', reject);
      res.on('end', () => {
        const body = Buffer.concat(chunks);
        resolve({
          status: res.statusCode ?? 0,
          headers: res.headers,
          body,
          text: () => body.toString('utf8'),
          json: <T>() => JSON.parse(body.toString('utf8')) as T,
        });
      });
    });
    req.on('error', reject);
    for (const p of parts) req.write(p);
    req.end();
  });
}

export interface MultipartPart {
  name: string;
  value: string | Buffer;
  filename?: string;
  contentType?: string;
}

/** A multipart/form-data body (as parts, so a large file is not copied) and its content type. */
export function multipart(parts: MultipartPart[]): { body: Buffer[]; contentType: string } {
  const boundary = `----kfield-reliability-${Math.random().toString(36).slice(2)}`;
  const body: Buffer[] = [];
  for (const p of parts) {
    const disp = `form-data; name="${p.name}"${p.filename !== undefined ? `; filename="${p.filename}"` : ''}`;
    const type = p.contentType ? `\r\nContent-Type: ${p.contentType}` : '';
    body.push(Buffer.from(`--${boundary}\r\nContent-Disposition: ${disp}${type}\r\n\r\n`, 'utf8'));
    body.push(typeof p.value === 'string' ? Buffer.from(p.value, 'utf8') : p.value);
    body.push(Buffer.from('\r\n'));
  }
  body.push(Buffer.from(`--${boundary}--\r\n`));
  return { body, contentType: `multipart/form-data; boundary=${boundary}` };
}

/** A cookie session against a base URL: sends the session cookie and, on changes, the CSRF token. */
export class HttpSession {
  cookie = '';
  csrf = '';
  constructor(
    public baseUrl: string,
    private agent: http.Agent | false = false,
  ) {}

  private keepCookie(a: Answer) {
    for (const c of a.headers['set-cookie'] ?? []) if (c.startsWith('kfield.sid=')) this.cookie = c.split(';')[0];
  }

  /** Any request; `withCsrf: false` leaves the token out on purpose. */
  async request(method: string, urlPath: string, o: SendOptions & { json?: unknown; withCsrf?: boolean } = {}): Promise<Answer> {
    const headers: Record<string, string> = this.cookie ? { cookie: this.cookie } : {};
    if (method.toUpperCase() !== 'GET' && o.withCsrf !== false && this.csrf) headers['x-csrf-token'] = this.csrf;
    let body = o.body;
    if (o.json !== undefined) {
      headers['content-type'] = 'application/json';
      body = JSON.stringify(o.json);
    }
    const a = await send(this.baseUrl + urlPath, { ...o, method: method.toUpperCase(), body, agent: o.agent ?? this.agent, headers: { ...headers, ...o.headers } });
    this.keepCookie(a);
    return a;
  }
  get(urlPath: string, o: SendOptions = {}) {
    return this.request('GET', urlPath, o);
  }
  post(urlPath: string, json?: unknown, o: SendOptions = {}) {
    return this.request('POST', urlPath, { ...o, json: json ?? {} });
  }
  /** GET a JSON answer that must be 200. */
  async getJson<T>(urlPath: string): Promise<T> {
    const a = await this.get(urlPath);
    if (a.status !== 200) throw new Error(`GET ${urlPath} answered ${a.status}: ${a.text().slice(0, 300)}`);
    return a.json<T>();
  }
  async refreshCsrf(): Promise<this> {
    const a = await this.get('/api/auth/csrf');
    if (a.status !== 200) throw new Error(`GET /api/auth/csrf answered ${a.status}`);
    this.csrf = a.json<{ csrfToken: string }>().csrfToken;
    return this;
  }
  async signIn(email: string, password = DEMO_PASSWORD): Promise<this> {
    await this.refreshCsrf();
    const a = await this.post('/api/auth/login', { email, password });
    if (a.status !== 200) throw new Error(`sign-in of ${email} answered ${a.status}: ${a.text().slice(0, 300)}`);
    this.csrf = a.json<{ csrfToken: string }>().csrfToken;
    return this;
  }
}

export const signedIn = (baseUrl: string, role: Parameters<typeof demoEmail>[0], agent?: http.Agent | false) => new HttpSession(baseUrl, agent).signIn(demoEmail(role));

/**
 * An invented 10 Hz vented-logger export of `rows` readings, the same layout as the records bench
 * (preamble, header, units, timestamp, elapsed, level, temperature), and the upload settings for it.
 */
export function loggerCsv(rows: number): Buffer {
  const lines = ['Invented reliability-test export - no real instrument, site or data', 'Instrument,Fictional vented level logger (invented)', 'Sample interval,0.1 s', '', 'Timestamp,Elapsed,Level,Temperature', ',s,m,degC'];
  const start = Date.UTC(2025, 4, 20, 8, 0, 0);
  let second = -1;
  let prefix = '';
  for (let i = 0; i < rows; i++) {
    const s = Math.floor((start + i * 100) / 1000);
    if (s !== second) {
      second = s;
      const iso = new Date(s * 1000).toISOString();
      prefix = `${iso.slice(0, 10)} ${iso.slice(11, 19)}`;
    }
    const t = i / 10;
    const head = t < 60 ? 4.2 : 4.2 - 0.75 * Math.exp(-(t - 60) / 2500);
    lines.push(`${prefix}.${i % 10},${t.toFixed(1)},${(head + ((i * 7919) % 13) * 1e-5).toFixed(5)},9.${i % 10}`);
  }
  return Buffer.from(`${lines.join('\n')}\n`, 'utf8');
}

export const LOGGER_SETTINGS = {
  testType: 'slug-out',
  reference: 'vented',
  layout: { delimiter: 'comma', headerLine: 5, unitsLine: 6, firstDataLine: 7, lastDataLine: null, decimalComma: false },
  mapping: { time: { columns: [0], format: 'timestamp', timestampLayout: 'iso', timeZone: 'UTC' }, valueColumn: 2 },
  valueUnit: 'm',
  notes: 'Invented reliability-test record',
};
