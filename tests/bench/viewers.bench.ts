import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { HttpSession, rssMb, signedIn, startServerProcess, tempDir } from '../reliability/support';

const VIEWERS = 200;
const RUN_MS = 30_000;
const BASELINE_MS = 10_000;
const SIGN_IN_CONCURRENCY = 8;
const TARGET_P99_MS = 300;
const TARGET_P999_MS = 1000;

interface LoadResult {
  requests: number;
  errors: number;
  errorKinds: Map<string, number>;
  latencies: Float64Array;
  seconds: number;
  peakRssMb: number;
  endRssMb: number;
}

const pct = (sorted: Float64Array, p: number) => sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];

/** `loops` closed loops, each on its own session, until `ms` have passed; every answer timed to its last byte. */
async function load(sessions: HttpSession[], pathsFor: (i: number, n: number) => string, ms: number, pid: number): Promise<LoadResult> {
  const latencies: number[] = [];
  const errorKinds = new Map<string, number>();
  let errors = 0;
  let peak = 0;
  const sampler = setInterval(() => (peak = Math.max(peak, rssMb(pid).now)), 500);
  const started = performance.now();
  const until = started + ms;
  await Promise.all(
    sessions.map(async (s, i) => {
      for (let n = 0; performance.now() < until; n++) {
        const t = performance.now();
        let kind = '';
        try {
          const a = await s.get(pathsFor(i, n), { timeoutMs: 10_000 });
          if (!((a.status >= 200 && a.status < 300) || a.status === 304)) kind = `HTTP ${a.status}`;
        } catch (e) {
          kind = (e as NodeJS.ErrnoException).code ?? (e as Error).message;
        }
        latencies.push(performance.now() - t);
        if (kind) {
          errors++;
          errorKinds.set(kind, (errorKinds.get(kind) ?? 0) + 1);
        }
      }
    }),
  );
  clearInterval(sampler);
  const end = rssMb(pid).now;
  return { requests: latencies.length, errors, errorKinds, latencies: Float64Array.from(latencies).sort(), seconds: (performance.now() - started) / 1000, peakRssMb: Math.max(peak, end), endRssMb: end };
}

function describe(label: string, r: LoadResult) {
  const kinds = [...r.errorKinds].map(([k, n]) => `${k}×${n}`).join(', ');
  return `${label}: ${r.requests} requests in ${r.seconds.toFixed(1)} s (${(r.requests / r.seconds).toFixed(0)}/s), errors ${r.errors}${kinds ? ` (${kinds})` : ''}; p50 ${pct(r.latencies, 50).toFixed(1)} ms, p99 ${pct(r.latencies, 99).toFixed(1)} ms, p99.9 ${pct(r.latencies, 99.9).toFixed(1)} ms, max ${r.latencies[r.latencies.length - 1].toFixed(0)} ms`;
}

/** 200 signed-in Viewers reading the K map's wells layer and the site page at once, against GET /api/health under the same load. */
export async function run(): Promise<void> {
  const dir = tempDir('kfield-bench-viewers-');
  // The limiter counts a sign-in until it succeeds, so 8 at once to one account would meet its limit.
  const server = await startServerProcess({ dbPath: path.join(dir, 'kfield.sqlite'), env: { LOGIN_MAX_FAILURES: '1000', LOGIN_MAX_FAILURES_PER_ACCOUNT_ADDRESS: '1000' } });
  // One keep-alive connection per viewer, as a browser tab would hold.
  const agent = new http.Agent({ keepAlive: true, maxSockets: VIEWERS });
  try {
    const sessions: HttpSession[] = [];
    for (let i = 0; i < VIEWERS; i += SIGN_IN_CONCURRENCY) {
      const batch = Array.from({ length: Math.min(SIGN_IN_CONCURRENCY, VIEWERS - i) }, () => signedIn(server.baseUrl, 'Viewer', agent));
      sessions.push(...(await Promise.all(batch)));
    }
    const { sites } = await sessions[0].getJson<{ sites: { id: string }[] }>('/api/sites');
    const siteId = sites[0].id;
    const { features } = await sessions[0].getJson<{ features: unknown[] }>(`/api/sites/${siteId}/map/wells`);
    // Each viewer opens the site page once before the clock starts, as a browser tab would: the
    // keep-alive connections exist then. (200 connections opened at the same moment while the server
    // is saturated wait in its accept queue for seconds; that is start-up, not the steady state measured.)
    await Promise.all(sessions.map((s) => s.getJson(`/api/sites/${siteId}`)));
    await Promise.all(sessions.map((s) => s.getJson(`/api/sites/${siteId}`)));
    const startRss = rssMb(server.pid).now;

    const baseline = await load(sessions, () => '/api/health', BASELINE_MS, server.pid);
    const viewers = await load(sessions, (i, n) => ((i + n) % 2 ? `/api/sites/${siteId}` : `/api/sites/${siteId}/map/wells`), RUN_MS, server.pid);

    const p99 = pct(viewers.latencies, 99);
    const p999 = pct(viewers.latencies, 99.9);
    const met = (ok: boolean) => (ok ? 'met' : 'NOT met');
    console.log(`${VIEWERS} concurrent signed-in Viewers, closed loops on one keep-alive connection each, loopback, demo site (${features.length} wells)`);
    console.log(`  (a) ${describe(`GET /api/health for ${BASELINE_MS / 1000} s (baseline)`, baseline)}`);
    console.log(`  (b) ${describe(`GET /api/sites/:siteId/map/wells and GET /api/sites/:siteId alternately for ${RUN_MS / 1000} s`, viewers)}`);
    console.log(`  ratio (b)/(a): p99 ${(p99 / pct(baseline.latencies, 99)).toFixed(2)}×, throughput ${(viewers.requests / viewers.seconds / (baseline.requests / baseline.seconds)).toFixed(2)}×`);
    console.log(`  targets: 0 errors: ${met(viewers.errors === 0)} (${viewers.errors}); p99 < ${TARGET_P99_MS} ms: ${met(p99 < TARGET_P99_MS)} (${p99.toFixed(1)} ms); p99.9 < ${TARGET_P999_MS} ms: ${met(p999 < TARGET_P999_MS)} (${p999.toFixed(1)} ms)`);
    console.log(`  server RSS: ${startRss.toFixed(0)} MB after ${VIEWERS} sign-ins, peak ${viewers.peakRssMb.toFixed(0)} MB during the run, ${viewers.endRssMb.toFixed(0)} MB at its end`);
  } finally {
    agent.destroy();
    await server.stop();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}
