import { In } from 'typeorm';
import type { z } from 'zod';
import { CAUTIONS } from '@shared/cautions';
import { captureEnvelope, captureZone, cooperJacob, headGradient, rotateToFlow } from '@shared/hydraulics/capture';
import { kSurfaceQuerySchema, type CaptureSketch, type captureSketchBodySchema } from '@shared/schemas/ksurface';
import type { AppContext } from '../../context';
import { AppError, badRequest, notFound } from '../../lib/errors';
import { User } from '../users/user.entity';
import { Well } from '../wells/well.entity';
import { CaptureSketchEntity } from './capture-sketch.entity';
import { createKSurfaceService } from './ksurface.service';
import { MAX_DISTANCE_FROM_WELLS_M } from './outline-geometry';

type SketchBody = z.output<typeof captureSketchBodySchema>;

/** Pumping rate to m³/s. US gallon = 3.785411784 L exactly (NIST SP 811). */
export function rateToM3PerS(value: number, unit: 'L/s' | 'm3/d' | 'gpm'): number {
  if (unit === 'L/s') return value * 1e-3;
  if (unit === 'm3/d') return value / 86_400;
  return value * 6.30901964e-5;
}

const refuse = (field: string, message: string) => badRequest(message, { [field]: message });

export function createSketchesService(ctx: AppContext) {
  const { ds } = ctx;
  const surfaces = createKSurfaceService(ctx);
  const repo = () => ds.getRepository(CaptureSketchEntity);

  async function names(ids: string[]): Promise<Map<string, string>> {
    const users = ids.length ? await ds.getRepository(User).find({ where: { id: In([...new Set(ids)]) }, select: { id: true, name: true } }) : [];
    return new Map(users.map((u) => [u.id, u.name]));
  }
  const toDto = (s: CaptureSketchEntity, who: Map<string, string>): CaptureSketch => ({
    id: s.id, siteId: s.siteId, name: s.name, x: s.x, y: s.y, lon: s.lon, lat: s.lat, inputs: s.inputs, results: s.results,
    createdBy: who.get(s.createdById) ?? '', createdById: s.createdById, createdAt: s.createdAt.toISOString(), cautions: [...CAUTIONS],
  });

  /** Every number of a sketch, from its inputs; refusals name the field. Reads only (no transaction). */
  async function compute(siteId: string, body: SketchBody) {
    const parsed = kSurfaceQuerySchema.safeParse(body.surface ?? {});
    if (!parsed.success) throw refuse('surface', parsed.error.issues[0]?.message ?? 'Bad surface settings');
    const inp = await surfaces.inputs(siteId, parsed.data);
    const { crs } = inp;
    let [gx, gy, lon, lat] = [Number.NaN, Number.NaN, Number.NaN, Number.NaN];
    try {
      [gx, gy] = crs.siteToGrid(body.x, body.y);
      [lon, lat] = crs.siteToWgs84(body.x, body.y);
    } catch {
      // refused just below
    }
    if (![gx, gy, lon, lat].every(Number.isFinite)) throw refuse('x', 'This point cannot be placed in the site’s system');
    const siteWells = await ds.getRepository(Well).find({ where: { siteId } });
    if (siteWells.length) {
      const far = Math.min(...siteWells.map((w) => Math.hypot(...(([a, b]) => [a - gx, b - gy])(crs.siteToGrid(w.siteX, w.siteY)))));
      if (far > MAX_DISTANCE_FROM_WELLS_M) throw refuse('x', `The trial well is ${(far / 1000).toFixed(1)} km from the nearest well of the site; place it within 20 km`);
    }

    let k = body.kMetersPerSecond;
    if (k === undefined) {
      if (inp.wells.length < 2) throw refuse('kMetersPerSecond', `No K surface here: it needs at least 2 wells with a checked K (${inp.wells.length} match); type K instead`);
      const v = surfaces.valueAt(inp, body.x, body.y).log10K;
      if (v === null) throw refuse('kMetersPerSecond', 'The K surface has no value at this spot (no well within the search radius); type K or widen the radius');
      k = 10 ** v;
    }

    let gradient: number;
    let flowDirectionDeg: number;
    if (body.gradient.mode === 'typed') {
      gradient = body.gradient.magnitude;
      flowDirectionDeg = body.gradient.flowDirectionDeg % 360;
    } else {
      const ids = [...new Set(body.gradient.wellIds)];
      const wells = siteWells.filter((w) => ids.includes(w.id));
      if (wells.length !== ids.length) throw refuse('gradient.wellIds', `${ids.length - wells.length} of the chosen wells are not wells of this site`);
      if (wells.length < 3) throw refuse('gradient.wellIds', 'Choose at least three different wells with a static water level');
      const dry = wells.filter((w) => w.staticWaterDepthM === null).map((w) => w.name);
      if (dry.length) throw refuse('gradient.wellIds', `${dry.join(', ')} ${dry.length === 1 ? 'has' : 'have'} no static water level`);
      const pts = wells.map((w) => {
        const [x, y] = crs.siteToGrid(w.siteX, w.siteY);
        return { x, y, head: w.measuringPointElevationM - w.staticWaterDepthM! };
      });
      // Collinear (or coincident) wells leave the plane undetermined: the centred normal matrix is singular.
      const mx = pts.reduce((a, p) => a + p.x, 0) / pts.length;
      const my = pts.reduce((a, p) => a + p.y, 0) / pts.length;
      let sxx = 0, syy = 0, sxy = 0;
      for (const p of pts) {
        sxx += (p.x - mx) ** 2;
        syy += (p.y - my) ** 2;
        sxy += (p.x - mx) * (p.y - my);
      }
      if (!(sxx * syy - sxy * sxy > 1e-6 * (sxx + syy) ** 2)) {
        throw refuse('gradient.wellIds', `${wells.map((w) => w.name).join(', ')} lie on one line: choose wells that enclose an area`);
      }
      const hg = headGradient(pts);
      if (!(hg.magnitude > 0)) throw refuse('gradient.wellIds', 'The static water levels of the chosen wells are level: no gradient');
      gradient = hg.magnitude;
      flowDirectionDeg = hg.flowDirectionDeg;
    }

    const rateM3PerS = rateToM3PerS(body.rate.value, body.rate.unit);
    const params = { rateM3PerS, thicknessM: body.thicknessM, kMetersPerSecond: k, gradient };
    let zone;
    let local;
    let cj;
    try {
      zone = captureZone(params);
      local = captureEnvelope(params);
      cj = cooperJacob({ rateM3PerS, transmissivityM2PerS: k * body.thicknessM, storativity: body.storativity, radiusM: body.drawdownRadiusM, timeS: body.drawdownTimeS });
    } catch (e) {
      throw new AppError('INVALID_INPUT', `These inputs give no capture zone: ${(e as Error).message}`, 400, { rate: (e as Error).message });
    }
    const toWgs = ([dx, dy]: [number, number]) => crs.gridToWgs84(gx + dx, gy + dy);
    const ring = rotateToFlow(local, flowDirectionDeg).map(toWgs);
    if (ring[0][0] !== ring[ring.length - 1][0] || ring[0][1] !== ring[ring.length - 1][1]) ring.push([ring[0][0], ring[0][1]]);
    const [sLon, sLat] = toWgs(rotateToFlow([[zone.stagnationPointM, 0]], flowDirectionDeg)[0]);
    const note = cj.valid
      ? `u = ${cj.u.toPrecision(2)} < 0.01: the Cooper-Jacob approximation holds at ${body.drawdownRadiusM} m after ${body.drawdownTimeS} s.`
      : `u = ${cj.u.toPrecision(2)} ≥ 0.01: too early or too far from the well for the Cooper-Jacob approximation; the drawdown figure is not reliable here.`;
    const { name: _n, x: _x, y: _y, ...inputs } = body;
    return {
      lon, lat,
      inputs: { ...inputs, kMetersPerSecond: body.kMetersPerSecond },
      results: {
        kMetersPerSecond: k,
        transmissivityM2PerS: k * body.thicknessM,
        rateM3PerS,
        gradient,
        flowDirectionDeg,
        darcyVelocityMPerS: zone.darcyVelocityMPerS,
        stagnationPointM: zone.stagnationPointM,
        captureWidthAtWellM: zone.captureWidthAtWellM,
        captureWidthFarM: zone.captureWidthFarM,
        stagnationPoint: { lon: sLon, lat: sLat },
        envelope: { type: 'Polygon' as const, coordinates: [ring] },
        cooperJacob: { drawdownM: cj.drawdownM, u: cj.u, valid: cj.valid, note },
      },
    };
  }

  async function create(siteId: string, userId: string, body: SketchBody): Promise<CaptureSketch> {
    const c = await compute(siteId, body);
    const saved = await repo().save(repo().create({ siteId, name: body.name, x: body.x, y: body.y, lon: c.lon, lat: c.lat, inputs: c.inputs, results: c.results, createdById: userId }));
    return get(siteId, saved.id);
  }

  async function list(siteId: string): Promise<CaptureSketch[]> {
    const rows = await repo().find({ where: { siteId }, order: { createdAt: 'ASC', name: 'ASC' } });
    const who = await names(rows.map((r) => r.createdById));
    return rows.map((r) => toDto(r, who));
  }

  async function get(siteId: string, sketchId: string): Promise<CaptureSketch> {
    const s = await repo().findOne({ where: { id: sketchId, siteId } });
    if (!s) throw notFound('The capture sketch');
    return toDto(s, await names([s.createdById]));
  }

  async function remove(siteId: string, sketchId: string): Promise<void> {
    const s = await get(siteId, sketchId);
    await repo().delete({ id: s.id, siteId });
  }

  /** Every sketch as GeoJSON: the trial well, its stagnation point and its envelope, each with the numbers and the cautions. */
  async function featureCollection(siteId: string) {
    const cautions = CAUTIONS.join(' ');
    const features = (await list(siteId)).flatMap((s) => {
      const r = s.results;
      const numbers = {
        sketchId: s.id, name: s.name, x: s.x, y: s.y,
        rateValue: s.inputs.rate.value, rateUnit: s.inputs.rate.unit, rateM3PerS: r.rateM3PerS, thicknessM: s.inputs.thicknessM,
        kMetersPerSecond: r.kMetersPerSecond, transmissivityM2PerS: r.transmissivityM2PerS, gradient: r.gradient, flowDirectionDeg: r.flowDirectionDeg,
        darcyVelocityMPerS: r.darcyVelocityMPerS, stagnationPointM: r.stagnationPointM, captureWidthAtWellM: r.captureWidthAtWellM, captureWidthFarM: r.captureWidthFarM,
        drawdownM: r.cooperJacob.drawdownM, drawdownRadiusM: s.inputs.drawdownRadiusM, drawdownTimeS: s.inputs.drawdownTimeS, cooperJacobNote: r.cooperJacob.note,
        createdBy: s.createdBy, createdAt: s.createdAt, cautions,
      };
      return [
        { type: 'Feature', id: `${s.id}-well`, geometry: { type: 'Point', coordinates: [s.lon, s.lat] }, properties: { kind: 'trial extraction well', ...numbers } },
        { type: 'Feature', id: `${s.id}-stagnation`, geometry: { type: 'Point', coordinates: [r.stagnationPoint.lon, r.stagnationPoint.lat] }, properties: { kind: 'stagnation point', ...numbers } },
        { type: 'Feature', id: `${s.id}-envelope`, geometry: r.envelope, properties: { kind: 'capture envelope', ...numbers } },
      ];
    });
    return { type: 'FeatureCollection', features };
  }

  return { compute, create, list, get, remove, featureCollection };
}
