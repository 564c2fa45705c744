import { spawn, type ChildProcess } from 'node:child_process';
import http from 'node:http';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { inferSchema, initParser } from 'udsv';
import { LOGGER_SETTINGS, loggerCsv } from '../reliability/support';
import { DEMO_PASSWORD, demoEmail, freePort } from '../support/test-server';

const ROWS = 1_000_000;
const IMPORT_RUNS = 5;
const SERIES_RUNS = 11;
const TARGET_RATIO = 2;
const TARGET_IMPORT_MS = 3000;
const TARGET_RSS_MB = 500;
const TARGET_SERIES_MS = 100;

// The invented 10 Hz vented-logger export and its upload settings, shared with the reliability tests.
const SETTINGS = { ...LOGGER_SETTINGS, notes: 'Invented benchmark record' };

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

const fmt = (ms: number) => `${ms.toFixed(0).padStart(6)} ms`;

/** The real server in a process of its own (fresh database with the demo data), so its memory is its own. */
async function startServer(): Promise<{ child: ChildProcess; baseUrl: string; close(): Promise<void> }> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-bench-'));
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    env: {
      ...process.env,
      TSX_TSCONFIG_PATH: 'tsconfig.server.json',
      NODE_ENV: 'test',
      HOST: '127.0.0.1',
      PORT: String(port),
      DATABASE_PATH: path.join(dir, 'kfield.sqlite'),
      SMTP_PORT: '0',
      BCRYPT_COST: '10',
      RECORD_MAX_UPLOAD_MB: '200',
      CLIENT_DIST: path.join(dir, 'no-client'),
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let log = '';
  await new Promise<void>((resolve, reject) => {
    const onData = (d: Buffer) => {
      log += d.toString();
      if (log.includes('Kfield is serving')) resolve();
    };
    child.stdout!.on('data', onData);
    child.stderr!.on('data', (d: Buffer) => (log += d.toString()));
    child.once('exit', (code) => reject(new Error(`the server exited (${code}) before serving:\n${log}`)));
  });
  return {
    child,
    baseUrl: `http://127.0.0.1:${port}`,
    close: async () => {
      const exited = new Promise((r) => child.once('exit', r));
      child.kill('SIGTERM');
      await exited;
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Peak resident memory of a process (Linux: VmHWM in /proc/<pid>/status), MB. */
function peakRssMb(pid: number): number {
  const m = /VmHWM:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'));
  return m ? Number(m[1]) / 1024 : NaN;
}

/** One request on a connection of its own: no keep-alive socket the server may have closed meanwhile. */
function send(url: string, method: string, headers: Record<string, string>, body?: Buffer[]): Promise<{ status: number; body: string; headers: http.IncomingHttpHeaders }> {
  return new Promise((resolve, reject) => {
    const length = body ? body.reduce((n, b) => n + b.length, 0) : 0;
    const req = http.request(url, { method, agent: false, headers: { ...headers, ...(body ? { 'content-length': String(length) } : {}) } });
    req.on('response', (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body: Buffer.concat(chunks).toString('utf8'), headers: res.headers }));
    });
    req.on('error', reject);
    for (const part of body ?? []) req.write(part);
    req.end();
  });
}

function postMultipart(url: string, headers: Record<string, string>, settings: string, file: Buffer, name: string) {
  const boundary = `----kfield-bench-${Date.now()}`;
  const head = Buffer.from(
    `--${boundary}\r\nContent-Disposition: form-data; name="settings"\r\n\r\n${settings}\r\n` +
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${name}"\r\nContent-Type: text/csv\r\n\r\n`,
  );
  const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
  return send(url, 'POST', { ...headers, 'content-type': `multipart/form-data; boundary=${boundary}` }, [head, file, tail]);
}

/** A signed-in session: the cookie and the CSRF token. */
async function signIn(baseUrl: string, email: string) {
  const csrf = await send(`${baseUrl}/api/auth/csrf`, 'GET', {});
  let cookie = String(csrf.headers['set-cookie']?.[0] ?? '').split(';')[0];
  const { csrfToken } = JSON.parse(csrf.body) as { csrfToken: string };
  const login = await send(`${baseUrl}/api/auth/login`, 'POST', { 'content-type': 'application/json', cookie, 'x-csrf-token': csrfToken }, [
    Buffer.from(JSON.stringify({ email, password: DEMO_PASSWORD })),
  ]);
  if (login.status !== 200) throw new Error(`sign-in answered ${login.status}`);
  cookie = String(login.headers['set-cookie']?.[0] ?? cookie).split(';')[0];
  return { headers: { cookie, 'x-csrf-token': (JSON.parse(login.body) as { csrfToken: string }).csrfToken } };
}

const getJson = async <T>(url: string, headers: Record<string, string>): Promise<T> => {
  const r = await send(url, 'GET', headers);
  if (r.status !== 200) throw new Error(`GET ${url} answered ${r.status}`);
  return JSON.parse(r.body) as T;
};

/** uDSV's bare parse of the data part: its native string rows (its fastest output). */
function udsvParse(csv: string): number {
  const rows = initParser(inferSchema(csv, { col: ',', header: (h) => [h[0], h[1]] })).stringArrs(csv);
  if (rows.length !== ROWS) throw new Error(`uDSV read ${rows.length} rows`);
  return rows.length;
}

export async function run(): Promise<void> {
  const file = loggerCsv(ROWS);
  const text = file.toString('utf8');
  // The data after the preamble, header and units lines: what uDSV is given.
  let p = 0;
  for (let i = 0; i < 4; i++) p = text.indexOf('\n', p) + 1;
  const csv = text.slice(p);
  let t = performance.now();
  const typed = initParser(inferSchema(csv, { col: ',', header: (h) => [h[0], h[1]] })).typedCols(csv);
  const typedMs = performance.now() - t;
  if ((typed[0] as unknown[]).length !== ROWS) throw new Error('uDSV typed columns: wrong row count');

  const server = await startServer();
  try {
    const { baseUrl } = server;
    const session = await signIn(baseUrl, demoEmail('Analyst'));
    const { sites } = await getJson<{ sites: { id: string }[] }>(`${baseUrl}/api/sites`, session.headers);
    const { wells } = await getJson<{ wells: { id: string; name: string }[] }>(`${baseUrl}/api/sites/${sites[0].id}/wells`, session.headers);
    const wellId = wells.find((w) => w.name === 'MW-15')!.id;

    // Side by side: each run times uDSV's parse here, then the import on the server, so both see the same machine.
    const bare: number[] = [];
    const imports: number[] = [];
    let recordId = '';
    for (let r = 0; r < IMPORT_RUNS; r++) {
      t = performance.now();
      udsvParse(csv);
      bare.push(performance.now() - t);
      t = performance.now();
      const res = await postMultipart(`${baseUrl}/api/wells/${wellId}/records`, session.headers, JSON.stringify(SETTINGS), file, 'bench-1m.csv');
      imports.push(performance.now() - t);
      if (res.status !== 201) throw new Error(`import answered ${res.status}: ${res.body.slice(0, 300)}`);
      const body = JSON.parse(res.body) as { id: string; sampleCount: number };
      if (body.sampleCount !== ROWS) throw new Error(`import read ${body.sampleCount} readings`);
      if (recordId) await send(`${baseUrl}/api/records/${recordId}`, 'DELETE', session.headers);
      recordId = body.id;
    }

    // A points value nobody asked for yet: computed from the stored series (read, log10, LTTB).
    t = performance.now();
    const cold = await getJson<{ elapsedSeconds: number[] }>(`${baseUrl}/api/records/${recordId}/series?points=1999`, session.headers);
    const coldMs = performance.now() - t;
    if (cold.elapsedSeconds.length !== 1999) throw new Error('series: wrong point count');
    const series: number[] = [];
    for (let r = 0; r < SERIES_RUNS + 2; r++) {
      t = performance.now();
      const s = await getJson<{ elapsedSeconds: number[] }>(`${baseUrl}/api/records/${recordId}/series?points=2000`, session.headers);
      const ms = performance.now() - t;
      if (s.elapsedSeconds.length !== 2000) throw new Error('series: wrong point count');
      if (r >= 2) series.push(ms);
    }
    const rssMb = peakRssMb(server.child.pid!);

    const bareMs = median(bare);
    const full = median(imports);
    const ratio = full / bareMs;
    const seriesMs = median(series);
    console.log(`records, ${ROWS.toLocaleString('en-US')}-row logger CSV (${(file.length / 1e6).toFixed(1)} MB), median of ${IMPORT_RUNS} runs, each uDSV then import`);
    console.log(`  (a) uDSV bare parse to string rows (baseline)   ${fmt(bareMs)}   runs: ${bare.map((x) => x.toFixed(0)).join(', ')} ms`);
    console.log(`      uDSV parse to typed columns (for reference) ${fmt(typedMs)}`);
    console.log(`  (b) full import through POST /api/wells/:id/records (upload, parse, reduce, store) ${fmt(full)}   runs: ${imports.map((x) => x.toFixed(0)).join(', ')} ms`);
    console.log(`  ratio (b)/(a) ${ratio.toFixed(2)}×  target ≤ ${TARGET_RATIO}×: ${ratio <= TARGET_RATIO ? 'met' : 'NOT met'}; under ${TARGET_IMPORT_MS} ms: ${full < TARGET_IMPORT_MS ? 'met' : 'NOT met'}`);
    console.log(`  peak RSS of the server process (start-up with the demo, ${IMPORT_RUNS} imports, the series calls) ${rssMb.toFixed(0)} MB  target < ${TARGET_RSS_MB} MB: ${rssMb < TARGET_RSS_MB ? 'met' : 'NOT met'}`);
    console.log(`  GET /api/records/:id/series, first request for a points value (computed: read, log10, LTTB)  ${coldMs.toFixed(1)} ms  target < ${TARGET_SERIES_MS} ms: ${coldMs < TARGET_SERIES_MS ? 'met' : 'NOT met'}`);
    console.log(`  GET /api/records/:id/series?points=2000, median of ${SERIES_RUNS} (kept from the first)  ${seriesMs.toFixed(1)} ms  target < ${TARGET_SERIES_MS} ms: ${seriesMs < TARGET_SERIES_MS ? 'met' : 'NOT met'}`);
  } finally {
    await server.close();
  }
}
