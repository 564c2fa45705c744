import { createHash } from 'node:crypto';
import { IsNull } from 'typeorm';
import type { z } from 'zod';
import { CAUTIONS } from '@shared/cautions';
import { crossValidate, nextTestSpots } from '@shared/geo/cross-validation';
import { gridFor, idwAt, idwGrid, type GridSpec, type IdwOptions, type IdwPoint } from '@shared/geo/idw';
import { polygonMask } from '@shared/geo/polygon-mask';
import { wellK } from '@shared/hydraulics/well-k';
import type { CrossValidation, KAt, KSurface, kSurfaceQuerySchema } from '@shared/schemas/ksurface';
import type { AppContext } from '../../context';
import { badRequest, notFound } from '../../lib/errors';
import { FitEntity } from '../fits/fit.entity';
import { MapVersion } from '../map/map-version.entity';
import { Site } from '../sites/site.entity';
import { Well } from '../wells/well.entity';
import { gridCrsFor, type GridCrs } from './grid-crs';
import { outlineInGrid } from './outline-geometry';
import { OutlineEntity } from './outline.entity';

export type SurfaceQuery = z.output<typeof kSurfaceQuerySchema>;

/** Grids above this are refused (the surface is computed on the server's main thread for now). */
export const MAX_SURFACE_CELLS = 1_000_000;
export const FEW_WELLS = 5;
const NEXT_TEST_SPOTS = 5;
/** Computed surfaces kept per service: at most this many, and this many base64 characters of cells in all (32 MB). */
const MAX_CACHED_SURFACES = 64;
const MAX_CACHED_SURFACE_CHARS = 32 * 1024 * 1024;

export interface SurfaceWell {
  well: Well;
  kMetersPerSecond: number;
  log10K: number;
  x: number;
  y: number;
}

export interface SurfaceInputs {
  site: Site;
  crs: GridCrs;
  wells: SurfaceWell[];
  points: IdwPoint[];
  outline: OutlineEntity | null;
  options: IdwOptions;
}

const cellsFor = (b: { minX: number; minY: number; maxX: number; maxY: number }, cell: number) =>
  Math.max(1, Math.ceil((b.maxX - b.minX) / cell - 1e-9)) * Math.max(1, Math.ceil((b.maxY - b.minY) / cell - 1e-9));

function matchesFilter(w: Well, q: SurfaceQuery): boolean {
  if (q.units && q.units.length && !q.units.includes(w.hydroUnit ?? '')) return false;
  // A well counts when its screen overlaps the range (as the K map's filter); screen top is the higher elevation.
  if (q.screenElevationMinM !== undefined && w.screenTopElevationM < q.screenElevationMinM) return false;
  if (q.screenElevationMaxM !== undefined && w.screenBottomElevationM > q.screenElevationMaxM) return false;
  return true;
}

export function createKSurfaceService(ctx: AppContext) {
  const { ds } = ctx;

  /** The site and the query's outline (refused when it is not this site's): what a surface is laid out on. */
  async function siteAndOutline(siteId: string, q: SurfaceQuery): Promise<{ site: Site; outline: OutlineEntity | null }> {
    const site = await ds.getRepository(Site).findOneBy({ id: siteId });
    if (!site) throw notFound('The site');
    const outline = q.outlineId ? await ds.getRepository(OutlineEntity).findOneBy({ id: q.outlineId, siteId }) : null;
    if (q.outlineId && !outline) throw badRequest('No such outline on this site', { outlineId: 'No such outline on this site' });
    return { site, outline };
  }

  /** The wells with a Well K (the geometric mean of Checked, not superseded fits: the same rule as wellKFor), filtered. */
  async function inputs(siteId: string, q: SurfaceQuery, known?: { site: Site; outline: OutlineEntity | null }): Promise<SurfaceInputs> {
    const { site, outline } = known ?? (await siteAndOutline(siteId, q));
    const fits = await ds.getRepository(FitEntity).find({
      where: { siteId, status: 'checked', supersededAt: IsNull() },
      select: { id: true, wellId: true, kMetersPerSecond: true },
    });
    const byWell = new Map<string, number[]>();
    for (const f of fits) if (f.kMetersPerSecond > 0) byWell.set(f.wellId, [...(byWell.get(f.wellId) ?? []), f.kMetersPerSecond]);
    const all = await ds.getRepository(Well).find({ where: { siteId }, order: { name: 'ASC' } });
    const chosen = all.filter((w) => byWell.has(w.id) && matchesFilter(w, q));
    const centre = all.length ? { lon: all.reduce((a, w) => a + w.lon, 0) / all.length, lat: all.reduce((a, w) => a + w.lat, 0) / all.length } : null;
    const crs = gridCrsFor(site, centre);
    const wells: SurfaceWell[] = chosen.map((well) => {
      const k = wellK(byWell.get(well.id)!);
      const [x, y] = crs.siteToGrid(well.siteX, well.siteY);
      return { well, kMetersPerSecond: k.kMetersPerSecond, log10K: k.log10Mean, x, y };
    });
    const options: IdwOptions = { power: q.power, neighbours: q.neighbours ?? null, searchRadiusM: q.searchRadiusM ?? null };
    return { site, crs, wells, points: wells.map((w) => ({ x: w.x, y: w.y, z: w.log10K, id: w.well.id })), outline, options };
  }

  function enoughWells(inp: SurfaceInputs): void {
    if (inp.wells.length < 2) {
      const m = `A K surface needs at least 2 wells with a checked K; ${inp.wells.length === 0 ? 'none match' : 'only 1 matches'} these filters`;
      throw badRequest(m, { wells: m }, 'TOO_FEW_WELLS');
    }
  }

  /** The grid over the outline's bounds (or the wells' extent plus 10 % each side), and the outline's mask. */
  function grid(inp: SurfaceInputs, cellSizeM: number | undefined): { grid: GridSpec; mask: Uint8Array | null } {
    let b: { minX: number; minY: number; maxX: number; maxY: number };
    let rings: number[][][][] | null = null;
    if (inp.outline) {
      rings = outlineInGrid(inp.outline.geometry, inp.crs);
      b = { minX: Infinity, minY: Infinity, maxX: -Infinity, maxY: -Infinity };
      for (const p of rings) for (const [x, y] of p[0]) b = { minX: Math.min(b.minX, x), minY: Math.min(b.minY, y), maxX: Math.max(b.maxX, x), maxY: Math.max(b.maxY, y) };
    } else {
      const xs = inp.wells.map((w) => w.x);
      const ys = inp.wells.map((w) => w.y);
      const [x0, x1, y0, y1] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
      const pad = Math.max(0.1 * Math.max(x1 - x0, y1 - y0), 10);
      b = { minX: x0 - pad, minY: y0 - pad, maxX: x1 + pad, maxY: y1 + pad };
    }
    if (cellSizeM !== undefined && cellsFor(b, cellSizeM) > MAX_SURFACE_CELLS) {
      const least = Math.sqrt(((b.maxX - b.minX) * (b.maxY - b.minY)) / MAX_SURFACE_CELLS);
      const m = `A ${cellSizeM} m cell gives ${cellsFor(b, cellSizeM).toLocaleString('en')} cells, more than 1,000,000: choose a larger cell size (about ${Math.ceil(least * 1.01 * 100) / 100} m or more)`;
      throw badRequest(m, { cellSizeM: m }, 'GRID_TOO_LARGE');
    }
    const g = gridFor(b, cellSizeM);
    return { grid: g, mask: rings ? polygonMask(g, rings) : null };
  }

  const settings = (inp: SurfaceInputs) => ({
    power: inp.options.power ?? 2,
    neighbours: inp.options.neighbours ?? null,
    searchRadiusM: inp.options.searchRadiusM ?? null,
    outlineId: inp.outline?.id ?? null,
  });

  /*
   * Surfaces once computed are kept (a viewer link's frozen surface is asked for by every visitor),
   * under a key of everything they are made of: the settings, the site's system, the outline's
   * geometry itself (its updatedAt has whole seconds) and the site's map version, which SQLite's
   * triggers bump on every write to its wells or fits (decision 008) — so Well K, positions,
   * units and screens are covered whatever code path wrote them.
   */
  const cache = new Map<string, KSurface>();
  let cachedChars = 0;
  function keep(key: string, s: KSurface): void {
    // Two requests that missed at once both compute; the second replaces the first.
    const before = cache.get(key);
    if (before) cachedChars -= before.log10K.length;
    cache.delete(key);
    cache.set(key, s);
    cachedChars += s.log10K.length;
    for (const [k, old] of cache) {
      if (cache.size <= MAX_CACHED_SURFACES && cachedChars <= MAX_CACHED_SURFACE_CHARS) break;
      if (k === key) continue;
      cache.delete(k);
      cachedChars -= old.log10K.length;
    }
  }

  /** The surface for these settings, from the cache while nothing it is made of has changed. Callers must not change it. */
  async function surface(siteId: string, q: SurfaceQuery): Promise<KSurface> {
    const known = await siteAndOutline(siteId, q);
    // Read before the wells and fits: a write committed after this read has bumped the version, so
    // an answer is never kept under a version newer than its data.
    const version = (await ds.getRepository(MapVersion).findOneBy({ siteId }))?.version ?? 0;
    const geometry = known.outline ? createHash('sha256').update(JSON.stringify(known.outline.geometry)).digest('base64') : '';
    const settingsKey = Object.entries(q).filter(([, v]) => v !== undefined).sort(([a], [b]) => (a < b ? -1 : 1));
    const key = JSON.stringify([siteId, version, known.site.epsgCode, geometry, settingsKey]);
    const hit = cache.get(key);
    if (hit) {
      // Most recently used last: the first entries are the ones to drop.
      cache.delete(key);
      cache.set(key, hit);
      return hit;
    }
    const s = compute(await inputs(siteId, q, known), q);
    keep(key, s);
    return s;
  }

  function compute(inp: SurfaceInputs, q: SurfaceQuery): KSurface {
    enoughWells(inp);
    const { grid: g, mask } = grid(inp, q.cellSizeM);
    const values = idwGrid(inp.points, g, inp.options, mask ?? undefined);
    let sum = 0;
    let n = 0;
    let empty = 0;
    for (let i = 0; i < values.length; i++) {
      if (mask && !mask[i]) continue;
      const v = values[i];
      if (Number.isFinite(v)) {
        sum += v;
        n++;
      } else empty++;
    }
    const warnings: string[] = [];
    if (inp.wells.length < FEW_WELLS) {
      warnings.push(`Only ${inp.wells.length} wells with a checked K feed this surface; with fewer than ${FEW_WELLS} it says little between them.`);
    }
    const units = [...new Set(inp.wells.map((w) => w.well.hydroUnit ?? 'no unit'))].sort();
    if (units.length > 1) {
      warnings.push(`Wells of ${units.length} hydrostratigraphic units feed this surface (${units.join(', ')}); IDW does not know layers, so filter by unit to map one.`);
    }
    if (empty > 0) warnings.push(`${empty.toLocaleString('en')} cells have no well within the search radius and are left empty.`);
    if (inp.outline && mask && n === 0 && empty === 0) warnings.push('No cell centre falls inside the outline at this cell size; choose a smaller cell.');
    const maxX = g.minX + g.cols * g.cellSizeM;
    const maxY = g.minY + g.rows * g.cellSizeM;
    const corner = (x: number, y: number) => inp.crs.gridToWgs84(x, y);
    return {
      gridCrs: { proj4: inp.crs.proj4, label: inp.crs.label },
      minX: g.minX,
      minY: g.minY,
      cellSizeM: g.cellSizeM,
      cols: g.cols,
      rows: g.rows,
      log10K: float32Base64(values),
      corners: [corner(g.minX, maxY), corner(maxX, maxY), corner(maxX, g.minY), corner(g.minX, g.minY)],
      wellsUsed: inp.wells.length,
      warnings,
      geometricMeanK: n ? 10 ** (sum / n) : null,
      settings: settings(inp),
      cautions: [...CAUTIONS],
    };
  }

  async function crossValidation(siteId: string, q: SurfaceQuery): Promise<CrossValidation> {
    const inp = await inputs(siteId, q);
    enoughWells(inp);
    const { grid: g, mask } = grid(inp, q.cellSizeM);
    const cv = crossValidate(inp.points, inp.options);
    const names = new Map(inp.wells.map((w) => [w.well.id, w.well.name]));
    const spots = nextTestSpots(inp.points, g, mask ?? new Uint8Array(g.cols * g.rows).fill(1), NEXT_TEST_SPOTS, inp.options);
    return {
      power: cv.power,
      n: cv.n,
      rmseLog10: cv.rmseLog10,
      meanErrorLog10: cv.meanErrorLog10,
      byPower: cv.byPower,
      suggestedPower: cv.suggestedPower,
      wells: cv.wells.map((w) => ({ wellId: w.id, name: names.get(w.id) ?? '', observedLog10K: w.observedLog10K, predictedLog10K: w.predictedLog10K, errorLog10: w.errorLog10 })),
      nextTestSpots: spots.map((s) => {
        const [x, y] = inp.crs.gridToSite(s.x, s.y);
        const [lon, lat] = inp.crs.gridToWgs84(s.x, s.y);
        return { x, y, lon, lat, score: s.score, nearestWellM: s.nearestWellM };
      }),
      cautions: [...CAUTIONS],
    };
  }

  /** IDW at a point given in the site's system (no outline clipping: the outline only bounds surfaces). */
  function valueAt(inp: SurfaceInputs, siteX: number, siteY: number): { gx: number; gy: number; log10K: number | null } {
    let [gx, gy] = [Number.NaN, Number.NaN];
    try {
      [gx, gy] = inp.crs.siteToGrid(siteX, siteY);
    } catch {
      // refused just below
    }
    if (!Number.isFinite(gx) || !Number.isFinite(gy)) throw badRequest('This point cannot be placed in the site’s system', { x: 'Not a point of the site’s system' });
    const v = inp.points.length ? idwAt(inp.points, gx, gy, inp.options) : Number.NaN;
    return { gx, gy, log10K: Number.isFinite(v) ? v : null };
  }

  async function kAt(siteId: string, q: SurfaceQuery & { x: number; y: number }): Promise<KAt> {
    const inp = await inputs(siteId, q);
    enoughWells(inp);
    const { gx, gy, log10K } = valueAt(inp, q.x, q.y);
    const [lon, lat] = inp.crs.gridToWgs84(gx, gy);
    if (!Number.isFinite(lon) || !Number.isFinite(lat)) throw badRequest('This point cannot be placed in the site’s system', { x: 'Not a point of the site’s system' });
    const nearest = inp.wells
      .map((w) => ({ w, d: Math.hypot(w.x - gx, w.y - gy) }))
      .sort((a, b) => a.d - b.d)
      .slice(0, 5)
      .map(({ w, d }) => ({ wellId: w.well.id, name: w.well.name, distanceM: d, kMetersPerSecond: w.kMetersPerSecond, saturatedThicknessM: w.well.saturatedThicknessM }));
    const bs = nearest.map((n) => n.saturatedThicknessM).filter((b): b is number => b !== null && b > 0);
    return {
      x: q.x,
      y: q.y,
      lon,
      lat,
      log10K,
      kMetersPerSecond: log10K === null ? null : 10 ** log10K,
      wellsUsed: inp.wells.length,
      nearest,
      suggestedThicknessM: bs.length ? bs.reduce((a, b) => a + b, 0) / bs.length : null,
    };
  }

  return { inputs, surface, crossValidation, kAt, valueAt, enoughWells };
}

/** Little-endian Float32 as base64 (NaN stays NaN). */
function float32Base64(values: Float32Array): string {
  const buf = Buffer.alloc(values.length * 4);
  if (new Uint8Array(new Uint16Array([1]).buffer)[0] === 1) buf.set(new Uint8Array(values.buffer, values.byteOffset, values.byteLength));
  else for (let i = 0; i < values.length; i++) buf.writeFloatLE(values[i], i * 4);
  return buf.toString('base64');
}
