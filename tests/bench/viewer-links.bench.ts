import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { DEMO_OUTLINE_NAME } from '../../server/db/seed/demo-surface';
// mulberry32, the demo area's own generator: every run replays the same people.
import { seeded } from '../../tiles/sources/geometry';
import { HttpSession, rssMb, send, signedIn, startServerProcess, tempDir, type Answer } from '../reliability/support';

/*
 * 200 concurrent viewers of one viewer link, each a person with a browser, and beside them the
 * baseline: the same 200 as signed-in Viewers opening the K map, on the same server, one phase
 * after the other. Target (the viewer-link issue): no errors and p99 < 250 ms for the link.
 *
 * The model of a viewer (seeded random, SEED):
 * - A visit follows the read-only page (src/features/kmap/view/): its first call, GET /api/view/:token;
 *   then, in parallel, the layers the link shows (wells, k-surface, outlines, capture-sketches); once
 *   they are in, the map opens: the basemap style, then the glyph range 0-255 of each font its labels
 *   use and the tiles of the opening view, side by side. The opening view: the wells' box fitted with
 *   the page's 48-px padding (k-map.tsx FIT_PADDING) into its map on a full-HD window (1920×1080 less
 *   the header, the notice and the 22rem side column: MAP_AREA), the zoom clamped to 14–16; 512-px
 *   vector tiles at the floor of the zoom (maplibre's covering tiles: about a dozen here) and the
 *   world source's tile over-zoomed from z8, only within a source's bounds. The page's HTML
 *   (GET /view/:token) and the client's scripts are left out: API calls and tiles only.
 * - Then 2–6 pans, each after a think time of 0.5–2 s: the view moves by 30–70 % of the map in a
 *   random direction (back toward the site once it strays more than a map's width away), and only the
 *   tiles not yet loaded are fetched (the style's tile URLs are versioned and immutable: a browser
 *   keeps them).
 * - A last think time, then the person leaves and a new one opens the link in the same slot with an
 *   empty cache: 200 people are on the page at any moment. The 200 first arrive spread over one mean
 *   visit (ARRIVAL_MS), so that page loads come at the steady rate from the start rather than in
 *   waves (200 arriving within 2 s opened ~1,200 connections at once: the server's listen queue of
 *   511 stood at up to 492 waiting, for seconds, and the waves came back with the visits in step);
 *   the warm-up outlasts the arrivals.
 * - A browser opens at most 6 connections to an origin (HTTP/1.1): each visit has its own keep-alive
 *   agent of 6 sockets and requests beyond 6 wait for one. An idle connection is dropped before the
 *   server's keep-alive timeout runs out (its Keep-Alive hint less a second: Node's agent does so
 *   once it has a timeout of its own), as a browser retries a request on a connection the server has
 *   just closed, which Node's agent does not. A request is timed from getting its
 *   connection to its last byte — the server's answer time, not the page's own queue; the page load
 *   (first call to last opening tile) is printed apart.
 * - Each visit has a client address of its own in X-Forwarded-For, and the server runs with
 *   TRUST_PROXY=true (config.ts: req.ip from that header, as behind a reverse proxy). Real viewers
 *   come from their own addresses, and the view routes' limit (VIEW_REQUESTS_PER_MINUTE, 600) is
 *   per address; one address for all would measure the limiter, not the page. The limit is not raised.
 *
 * The baseline: the signed-in K map page's own calls for the same visits (src/app/routes/site-map.tsx
 * and the workspace): GET /api/sites/:siteId, then map/wells, /api/crs/:code (the page computes the
 * surface in a Web Worker; this is what it fetches for it), outlines, capture-sketches and
 * /api/basemaps in parallel, then the same style, glyphs and tiles (the same map and pans), on 200
 * signed-in sessions.
 *
 * The link is measured for RUN_MS, the baseline for RUN_MS / 2 before it and RUN_MS / 2 after it,
 * each after WARMUP_MS of the same load; a request counts when it starts in a measured window.
 * Errors: any answer but 2xx or 304, and socket errors or time-outs, by kind.
 */
const VIEWERS = 200;
const RUN_MS = 30_000;
const BROWSER_CONNECTIONS = 6;
/** The view page's map on a 1920×1080 window: less 2 × 12 px of margin, a 12-px gap and the 352-px column; less about 104 px of header and notice. */
const MAP_AREA = { width: 1532, height: 976 };
/** src/features/kmap/components/k-map.tsx FIT_PADDING, as the view page fits the site. */
const FIT_PADDING_PX = 48;
const TILE_PX = 512;
const ZOOM = { min: 14, max: 16 };
const PANS = { min: 2, max: 6 };
const THINK_MS = { min: 500, max: 2_000 };
/** A visit's mean length: its pans' and its last think times (the loads themselves are short). */
const ARRIVAL_MS = ((PANS.min + PANS.max) / 2 + 1) * ((THINK_MS.min + THINK_MS.max) / 2);
const WARMUP_MS = ARRIVAL_MS + 2_000;
const PAN_SHARE = { min: 0.3, max: 0.7 };
const SIGN_IN_CONCURRENCY = 8;
const REQUEST_TIMEOUT_MS = 10_000;
const TARGET_P99_MS = 250;
const SEED = 20_261_201;
/** What a browser sends with every request that matters to the server. */
const BROWSER_HEADERS = { 'accept-encoding': 'gzip, deflate, br', accept: '*/*' };

const between = (rnd: () => number, r: { min: number; max: number }) => r.min + rnd() * (r.max - r.min);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const pct = (sorted: Float64Array, p: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] : Number.NaN);

/** Latencies by request kind, errors by kind and the machine's state, over one or more measured windows. */
class Recorder {
  readonly byKind = new Map<string, number[]>();
  readonly errors = new Map<string, number>();
  readonly pageLoads: number[] = [];
  readonly connects: number[] = [];
  visits = 0;
  pans = 0;
  panTiles = 0;
  /** The current measured window (performance.now() times): a request counts when it starts in it. */
  from = Infinity;
  to = Infinity;
  seconds = 0;
  peakRssMb = 0;
  /** The server's and the bench's CPU time in the windows, seconds (the load generator shares the machine). */
  serverCpuS = 0;
  clientCpuS = 0;
  /** The bench's own event-loop delay (p99, ms, the worst window's): high means the load, not the server, was late. */
  clientLagP99Ms = 0;
  readonly loadAverages: number[] = [];
  /** The most connections seen waiting in the server's listen queue (accepted by the kernel, not yet by Node). */
  maxAcceptQueue = 0;
  counts = (t: number) => t >= this.from && t < this.to;
  addConnect(startedAt: number, ms: number) {
    if (this.counts(startedAt)) this.connects.push(ms);
  }
  add(kind: string, startedAt: number, ms: number, failure: string) {
    if (!this.counts(startedAt)) return;
    let l = this.byKind.get(kind);
    if (!l) this.byKind.set(kind, (l = []));
    l.push(ms);
    if (failure) this.errors.set(`${kind} ${failure}`, (this.errors.get(`${kind} ${failure}`) ?? 0) + 1);
  }
}

/** One person's browser for one visit: its own 6 keep-alive connections, address and cookie. */
class Browser {
  private readonly agent = new http.Agent({ keepAlive: true, maxSockets: BROWSER_CONNECTIONS, timeout: REQUEST_TIMEOUT_MS });
  private free = BROWSER_CONNECTIONS;
  private readonly queue: (() => void)[] = [];
  readonly tiles = new Set<string>();
  constructor(
    private readonly headers: Record<string, string>,
    private readonly rec: Recorder,
  ) {
    // Each new connection's TCP set-up time, apart from the requests' times.
    const create = this.agent.createConnection.bind(this.agent) as (...a: unknown[]) => import('node:net').Socket;
    (this.agent as unknown as { createConnection: (...a: unknown[]) => unknown }).createConnection = (...a: unknown[]) => {
      const t = performance.now();
      const socket = create(...a);
      socket.once('connect', () => rec.addConnect(t, performance.now() - t));
      return socket;
    };
  }

  /** GET an absolute URL once a connection is free; null on an error (recorded). */
  async get(kind: string, url: string): Promise<Answer | null> {
    if (this.free === 0) await new Promise<void>((r) => this.queue.push(r));
    else this.free--;
    const t = performance.now();
    let failure = '';
    let answer: Answer | null = null;
    try {
      answer = await send(url, { agent: this.agent, headers: this.headers, timeoutMs: REQUEST_TIMEOUT_MS });
      if (!((answer.status >= 200 && answer.status < 300) || answer.status === 304)) failure = `HTTP ${answer.status}`;
    } catch (e) {
      failure = (e as NodeJS.ErrnoException).code ?? (e as Error).message;
    }
    const next = this.queue.shift();
    if (next) next();
    else this.free++;
    this.rec.add(kind, t, performance.now() - t, failure);
    return failure ? null : answer;
  }
  close() {
    this.agent.destroy();
  }
}

interface Call {
  kind: string;
  path: string;
}

/** What a page calls, in the order it calls it: `first`, then `parallel` beside the style. */
interface Page {
  name: string;
  first: Call;
  parallel: Call[];
  headers: (slot: number) => Record<string, string>;
}

interface TileSource {
  template: string;
  minzoom: number;
  maxzoom: number;
  bounds: [number, number, number, number] | null;
}

interface Basemap {
  styleUrl: string;
  glyphUrls: string[];
  sources: TileSource[];
  /** The opening view: centre in Web-Mercator units (0–1) and the map's zoom. */
  home: { x: number; y: number; zoom: number };
}

const mercX = (lon: number) => (lon + 180) / 360;
const mercY = (lat: number) => {
  const r = (lat * Math.PI) / 180;
  return (1 - Math.log(Math.tan(r) + 1 / Math.cos(r)) / Math.PI) / 2;
};

/** The font stacks a `text-font` value names: the value itself, or each `["literal", [...]]` inside an expression. */
function fontStacks(value: unknown, into: Set<string>, top = true): void {
  if (!Array.isArray(value)) return;
  if (top && value.every((v) => typeof v === 'string')) into.add(value.join(','));
  else if (value[0] === 'literal' && Array.isArray(value[1])) into.add(value[1].join(','));
  else for (const v of value) fontStacks(v, into, false);
}

/** The style's tile sources and glyph URLs, and the opening view fitted to the wells' box. */
async function readBasemap(styleUrl: string, bbox: [number, number, number, number]): Promise<Basemap> {
  const style = (await send(styleUrl, { timeoutMs: REQUEST_TIMEOUT_MS })).json<{
    glyphs?: string;
    sources: Record<string, { type: string; tiles?: string[]; minzoom?: number; maxzoom?: number; bounds?: [number, number, number, number] }>;
    layers: { layout?: Record<string, unknown> }[];
  }>();
  const sources = Object.values(style.sources)
    .filter((s) => s.type === 'vector' && s.tiles?.length)
    .map((s) => ({ template: s.tiles![0], minzoom: s.minzoom ?? 0, maxzoom: s.maxzoom ?? 22, bounds: s.bounds ?? null }));
  const stacks = new Set<string>();
  for (const l of style.layers) fontStacks(l.layout?.['text-font'], stacks);
  const glyphUrls = style.glyphs ? [...stacks].map((f) => style.glyphs!.replace('{fontstack}', encodeURIComponent(f)).replace('{range}', '0-255')) : [];
  const [w, s, e, n] = bbox;
  const dx = Math.max(mercX(e) - mercX(w), 1e-9);
  const dy = Math.max(mercY(s) - mercY(n), 1e-9);
  const fit = Math.log2(Math.min((MAP_AREA.width - 2 * FIT_PADDING_PX) / (dx * TILE_PX), (MAP_AREA.height - 2 * FIT_PADDING_PX) / (dy * TILE_PX)));
  const zoom = Math.min(ZOOM.max, Math.max(ZOOM.min, fit));
  return { styleUrl, glyphUrls, sources, home: { x: (mercX(w) + mercX(e)) / 2, y: (mercY(n) + mercY(s)) / 2, zoom } };
}

/** The tile URLs maplibre asks for to cover the map centred at (x, y) at a zoom. */
function tilesFor(b: Basemap, view: { x: number; y: number; zoom: number }): string[] {
  const urls: string[] = [];
  const halfW = MAP_AREA.width / 2 / (TILE_PX * 2 ** view.zoom);
  const halfH = MAP_AREA.height / 2 / (TILE_PX * 2 ** view.zoom);
  for (const src of b.sources) {
    if (view.zoom < src.minzoom) continue;
    const z = Math.min(src.maxzoom, Math.floor(view.zoom));
    const n = 2 ** z;
    const clamp = (v: number) => Math.min(n - 1, Math.max(0, Math.floor(v * n)));
    const [x0, x1, y0, y1] = [clamp(view.x - halfW), clamp(view.x + halfW), clamp(view.y - halfH), clamp(view.y + halfH)];
    const inside = (x: number, y: number) => {
      if (!src.bounds) return true;
      const [w, s, e, nn] = src.bounds;
      return (x + 1) / n > mercX(w) && x / n < mercX(e) && (y + 1) / n > mercY(nn) && y / n < mercY(s);
    };
    for (let x = x0; x <= x1; x++) for (let y = y0; y <= y1; y++) if (inside(x, y)) urls.push(src.template.replace('{z}', String(z)).replace('{x}', String(x)).replace('{y}', String(y)));
  }
  return [...new Set(urls)];
}

/** Fetch the tiles of a view not yet in the browser's cache, all at once (they queue for the 6 connections). */
async function loadTiles(br: Browser, b: Basemap, view: { x: number; y: number; zoom: number }) {
  const fresh = tilesFor(b, view).filter((u) => !br.tiles.has(u));
  for (const u of fresh) br.tiles.add(u);
  await Promise.all(fresh.map((u) => br.get('tiles', u)));
  return fresh.length;
}

/** One person's visit: the page load, the pans, the last look. */
async function visit(baseUrl: string, page: Page, b: Basemap, slot: number, rnd: () => number, rec: Recorder, until: number) {
  const br = new Browser({ ...BROWSER_HEADERS, ...page.headers(slot) }, rec);
  try {
    const started = performance.now();
    await br.get(page.first.kind, baseUrl + page.first.path);
    await Promise.all(page.parallel.map((c) => br.get(c.kind, baseUrl + c.path)));
    await br.get('style', b.styleUrl);
    await Promise.all([...b.glyphUrls.map((u) => br.get('glyphs', u)), loadTiles(br, b, b.home)]);
    if (rec.counts(started)) rec.pageLoads.push(performance.now() - started);
    if (rec.counts(started)) rec.visits++;
    const view = { ...b.home };
    const pans = Math.round(between(rnd, PANS));
    for (let p = 0; p < pans && performance.now() < until; p++) {
      await sleep(between(rnd, THINK_MS));
      if (performance.now() >= until) break;
      const worldPx = TILE_PX * 2 ** view.zoom;
      const away = Math.hypot((view.x - b.home.x) * worldPx, (view.y - b.home.y) * worldPx);
      const angle = away > MAP_AREA.width ? Math.atan2(b.home.y - view.y, b.home.x - view.x) : rnd() * 2 * Math.PI;
      const share = between(rnd, PAN_SHARE);
      view.x += (Math.cos(angle) * share * MAP_AREA.width) / worldPx;
      view.y += (Math.sin(angle) * share * MAP_AREA.height) / worldPx;
      const t = performance.now();
      const n = await loadTiles(br, b, view);
      if (rec.counts(t)) {
        rec.pans++;
        rec.panTiles += n;
      }
    }
    await sleep(between(rnd, THINK_MS));
  } finally {
    br.close();
  }
}

/**
 * VIEWERS slots, each a run of visits by new people, for a warm-up and then `runMs` measured into
 * `rec`; the visits in flight at the end finish (their requests started after it do not count).
 */
async function phase(baseUrl: string, page: Page, b: Basemap, pid: number, rec: Recorder, runMs: number): Promise<void> {
  rec.from = performance.now() + WARMUP_MS;
  rec.to = rec.from + runMs;
  const port = Number(new URL(baseUrl).port);
  const sampler = setInterval(() => {
    if (!rec.counts(performance.now())) return;
    rec.peakRssMb = Math.max(rec.peakRssMb, rssMb(pid).now);
    rec.maxAcceptQueue = Math.max(rec.maxAcceptQueue, acceptQueue(port));
  }, 250);
  const lag = monitorEventLoopDelay({ resolution: 10 });
  let serverAtFrom = 0;
  let ownAtFrom = process.cpuUsage();
  const marks = [
    setTimeout(() => {
      serverAtFrom = cpuSeconds(pid);
      ownAtFrom = process.cpuUsage();
      lag.enable();
    }, WARMUP_MS),
    setTimeout(() => {
      rec.serverCpuS += cpuSeconds(pid) - serverAtFrom;
      const own = process.cpuUsage(ownAtFrom);
      rec.clientCpuS += (own.user + own.system) / 1e6;
      lag.disable();
      rec.clientLagP99Ms = Math.max(rec.clientLagP99Ms, lag.percentile(99) / 1e6);
      rec.loadAverages.push(os.loadavg()[0]);
      rec.seconds += runMs / 1000;
    }, WARMUP_MS + runMs),
  ];
  await Promise.all(
    Array.from({ length: VIEWERS }, async (_, slot) => {
      const rnd = seeded(SEED + slot + rec.seconds);
      await sleep(rnd() * ARRIVAL_MS);
      for (let n = 0; performance.now() < rec.to; n++) await visit(baseUrl, page, b, slot * 1000 + n, rnd, rec, rec.to);
    }),
  );
  clearInterval(sampler);
  for (const m of marks) clearTimeout(m);
}

/** User + system CPU time of a process so far, seconds (Linux /proc; clock ticks of 10 ms). */
function cpuSeconds(pid: number): number {
  const fields = fs.readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
  return (Number(fields[11]) + Number(fields[12])) / 100;
}

/** Connections waiting in the listen queue of a loopback port (Linux /proc/net/tcp: rx_queue of the LISTEN row). */
function acceptQueue(port: number): number {
  const hex = `:${port.toString(16).toUpperCase().padStart(4, '0')} `;
  for (const line of fs.readFileSync('/proc/net/tcp', 'utf8').split('\n')) {
    const f = line.trim().split(/\s+/);
    if (f[3] === '0A' && `${f[1]} `.endsWith(hex)) return parseInt(f[4].split(':')[1], 16);
  }
  return 0;
}

/** A client address of its own for each visit (X-Forwarded-For; TRUST_PROXY=true on the server). */
const addressOf = (visitor: number) => `10.${(visitor >> 16) & 255}.${(visitor >> 8) & 255}.${visitor & 255}`;

function all(rec: Recorder): Float64Array {
  return Float64Array.from([...rec.byKind.values()].flat()).sort();
}

function figures(l: Float64Array): string {
  return `p50 ${pct(l, 50).toFixed(1)} ms, p99 ${pct(l, 99).toFixed(1)} ms, p99.9 ${pct(l, 99.9).toFixed(1)} ms, max ${(l[l.length - 1] ?? Number.NaN).toFixed(0)} ms`;
}

function report(label: string, page: Page, r: Recorder, paths: Record<string, string>) {
  const l = all(r);
  const errors = [...r.errors.values()].reduce((a, n) => a + n, 0);
  const kinds = [...r.errors].map(([k, n]) => `${k} ×${n}`).join(', ');
  const perPan = (r.panTiles / r.pans).toFixed(1);
  console.log(`  ${label}: ${l.length} requests in ${r.seconds} s (${(l.length / r.seconds).toFixed(0)}/s), ${r.visits} page loads, ${r.pans} pans (${perPan} new tiles each), errors ${errors}${kinds ? ` (${kinds})` : ''}`);
  console.log(`    all requests: ${figures(l)}`);
  const order = [page.first.kind, ...page.parallel.map((c) => c.kind), 'style', 'glyphs', 'tiles'];
  for (const kind of order) {
    const k = Float64Array.from(r.byKind.get(kind) ?? []).sort();
    console.log(`    ${kind.padEnd(9)} ${String(k.length).padStart(6)} × ${(paths[kind] ?? '').padEnd(42)} ${figures(k)}`);
  }
  const connects = Float64Array.from(r.connects).sort();
  console.log(`    new connections: ${connects.length}, TCP set-up ${figures(connects)}; at most ${r.maxAcceptQueue} waiting in the server's listen queue (511)`);
  const loads = Float64Array.from(r.pageLoads).sort();
  console.log(`    page load (first call to last opening tile, 6 connections): p50 ${pct(loads, 50).toFixed(0)} ms, p99 ${pct(loads, 99).toFixed(0)} ms`);
  const machine = r.loadAverages.map((a) => a.toFixed(1)).join(', ');
  console.log(
    `    server: RSS peak ${r.peakRssMb.toFixed(0)} MB, CPU ${(r.serverCpuS / r.seconds).toFixed(2)} cores (${((1000 * r.serverCpuS) / r.visits).toFixed(1)} ms a page load with its pans); the bench: CPU ${(r.clientCpuS / r.seconds).toFixed(2)} cores, event-loop delay p99 ${r.clientLagP99Ms.toFixed(0)} ms; load average ${machine} on ${os.cpus().length} cores`,
  );
  return { p99: pct(l, 99), errors, rate: l.length / r.seconds, busy: Math.max(...r.loadAverages) > os.cpus().length };
}

export async function run(): Promise<void> {
  const dir = tempDir('kfield-bench-viewer-links-');
  // The limiter counts a sign-in until it succeeds, so 8 at once to one account would meet its limit.
  const server = await startServerProcess({
    dbPath: path.join(dir, 'kfield.sqlite'),
    env: { TRUST_PROXY: 'true', LOGIN_MAX_FAILURES: '1000', LOGIN_MAX_FAILURES_PER_ACCOUNT_ADDRESS: '1000' },
  });
  try {
    const lead = await signedIn(server.baseUrl, 'Lead');
    const { sites } = await lead.getJson<{ sites: { id: string; name: string }[] }>('/api/sites');
    const siteId = sites[0].id;
    const site = await lead.getJson<{ epsgCode: number; basemapStyleUrl: string }>(`/api/sites/${siteId}`);
    const { outlines } = await lead.getJson<{ outlines: { id: string; name: string }[] }>(`/api/sites/${siteId}/outlines`);
    const plume = outlines.find((o) => o.name === DEMO_OUTLINE_NAME);
    if (!plume) throw new Error(`the demo site has no outline "${DEMO_OUTLINE_NAME}"`);
    const created = await lead.post(`/api/sites/${siteId}/viewer-links`, {
      label: 'Bench: 200 stakeholders',
      // Every layer; the K surface with its default settings over the demo's plume outline, frozen now.
      layers: { wells: true, surface: true, surfaceSettings: { outlineId: plume.id }, outlines: true, sketches: true },
      showNames: true,
      showConstruction: false,
    });
    if (created.status !== 201) throw new Error(`making the viewer link answered ${created.status}: ${created.text().slice(0, 300)}`);
    const token = created.json<{ url: string }>().url.split('/view/')[1];
    const info = (await send(`${server.baseUrl}/api/view/${token}`)).json<{ basemapStyleUrl: string }>();
    const wells = await lead.getJson<{ bbox: [number, number, number, number]; features: unknown[] }>(`/api/sites/${siteId}/map/wells`);
    // The style URL is the page's own (relative); the tile and glyph URLs in the style are absolute.
    const basemap = await readBasemap(new URL(info.basemapStyleUrl, server.baseUrl).toString(), wells.bbox);
    if (site.basemapStyleUrl !== info.basemapStyleUrl) throw new Error(`the view's style ${info.basemapStyleUrl} is not the site's ${site.basemapStyleUrl}`);

    const v = `/api/view/${token}`;
    const viewPage: Page = {
      name: 'viewer link',
      first: { kind: 'info', path: v },
      parallel: [
        { kind: 'wells', path: `${v}/wells` },
        { kind: 'surface', path: `${v}/k-surface` },
        { kind: 'outlines', path: `${v}/outlines` },
        { kind: 'sketches', path: `${v}/capture-sketches` },
      ],
      headers: (visitor) => ({ 'x-forwarded-for': addressOf(visitor) }),
    };
    const sessions: HttpSession[] = [];
    for (let i = 0; i < VIEWERS; i += SIGN_IN_CONCURRENCY) {
      sessions.push(...(await Promise.all(Array.from({ length: Math.min(SIGN_IN_CONCURRENCY, VIEWERS - i) }, () => signedIn(server.baseUrl, 'Viewer')))));
    }
    const s = `/api/sites/${siteId}`;
    const signedInPage: Page = {
      name: 'signed-in K map',
      first: { kind: 'info', path: s },
      parallel: [
        { kind: 'wells', path: `${s}/map/wells` },
        { kind: 'surface', path: `/api/crs/${site.epsgCode}` },
        { kind: 'outlines', path: `${s}/outlines` },
        { kind: 'sketches', path: `${s}/capture-sketches` },
        { kind: 'basemaps', path: '/api/basemaps' },
      ],
      headers: (visitor) => ({ 'x-forwarded-for': addressOf(visitor), cookie: sessions[Math.floor(visitor / 1000) % VIEWERS].cookie }),
    };

    const tiles = tilesFor(basemap, basemap.home);
    console.log(
      `${VIEWERS} concurrent viewers, loopback, demo site (${wells.features.length} wells); opening view at zoom ${basemap.home.zoom.toFixed(2)}: ${tiles.length} tiles, ${basemap.glyphUrls.length} glyph ranges; ` +
        `${PANS.min}–${PANS.max} pans of ${PAN_SHARE.min * 100}–${PAN_SHARE.max * 100} % of the map after ${THINK_MS.min / 1000}–${THINK_MS.max / 1000} s of thought; ` +
        `the link for ${RUN_MS / 1000} s, the baseline ${RUN_MS / 2000} s before it and ${RUN_MS / 2000} s after (each after a ${WARMUP_MS / 1000} s warm-up)`,
    );
    // The baseline in two halves around the link, so that a load on the machine that drifts during the run weighs on both alike.
    const base = new Recorder();
    const link = new Recorder();
    await phase(server.baseUrl, signedInPage, basemap, server.pid, base, RUN_MS / 2);
    await phase(server.baseUrl, viewPage, basemap, server.pid, link, RUN_MS);
    await phase(server.baseUrl, signedInPage, basemap, server.pid, base, RUN_MS / 2);

    const tileTemplate = 'tiles/{z}/{x}/{y}.pbf (and glyphs, style)';
    const a = report('(a) signed-in K map (baseline)', signedInPage, base, {
      info: 'GET /api/sites/:siteId', wells: 'GET /api/sites/:siteId/map/wells', surface: 'GET /api/crs/:code (surface in the browser)',
      outlines: 'GET /api/sites/:siteId/outlines', sketches: 'GET /api/sites/:siteId/capture-sketches', basemaps: 'GET /api/basemaps', tiles: tileTemplate,
    });
    const b = report('(b) viewer link', viewPage, link, {
      info: 'GET /api/view/:token', wells: 'GET /api/view/:token/wells', surface: 'GET /api/view/:token/k-surface (frozen)',
      outlines: 'GET /api/view/:token/outlines', sketches: 'GET /api/view/:token/capture-sketches', tiles: tileTemplate,
    });
    console.log(`  ratio (b)/(a): p99 ${(b.p99 / a.p99).toFixed(2)}×, throughput ${(b.rate / a.rate).toFixed(2)}×`);
    const pass = b.errors === 0 && b.p99 < TARGET_P99_MS;
    console.log(`  target (viewer link: 0 errors, p99 < ${TARGET_P99_MS} ms): ${pass ? 'PASS' : 'FAIL'} (${b.errors} errors, p99 ${b.p99.toFixed(1)} ms)`);
    if (a.busy || b.busy) console.log(`  note: the machine's load average passed its ${os.cpus().length} cores during the run; the server waited for a core, and the figures say so more than they say the server`);
  } finally {
    await server.stop();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}
