import { In } from 'typeorm';
import type { Outline, OutlineGeometry, outlineBodySchema, outlinePatchSchema } from '@shared/schemas/ksurface';
import type { z } from 'zod';
import type { AppContext } from '../../context';
import { notFound } from '../../lib/errors';
import { Site } from '../sites/site.entity';
import { User } from '../users/user.entity';
import { Well } from '../wells/well.entity';
import { gridCrsFor, siteCrs } from './grid-crs';
import { checkOutline, type OutlineArea } from './outline-geometry';
import { OutlineEntity } from './outline.entity';

type OutlineBody = z.output<typeof outlineBodySchema>;
type OutlinePatch = z.output<typeof outlinePatchSchema>;

/** What an outline of this site is checked against: its grid system and the box around its wells. */
export async function outlineArea(ctx: AppContext, site: Site, firstLonLat: [number, number] | null): Promise<OutlineArea> {
  const wells = await ctx.ds.getRepository(Well).find({ where: { siteId: site.id }, select: { id: true, lon: true, lat: true, siteX: true, siteY: true } });
  const centre = wells.length
    ? { lon: wells.reduce((a, w) => a + w.lon, 0) / wells.length, lat: wells.reduce((a, w) => a + w.lat, 0) / wells.length }
    : firstLonLat ? { lon: firstLonLat[0], lat: firstLonLat[1] } : null;
  const crs = gridCrsFor(site, centre);
  let wellsBox: OutlineArea['wellsBox'] = null;
  if (wells.length) {
    wellsBox = { minX: Infinity, minY: Infinity, maxX: -Infinity, maxY: -Infinity };
    for (const w of wells) {
      const [x, y] = crs.siteToGrid(w.siteX, w.siteY);
      wellsBox = { minX: Math.min(wellsBox.minX, x), minY: Math.min(wellsBox.minY, y), maxX: Math.max(wellsBox.maxX, x), maxY: Math.max(wellsBox.maxY, y) };
    }
  }
  const sc = siteCrs(site);
  return { crs, wellsBox, areaOfUse: sc.bbox, areaOfUseLabel: `EPSG:${site.epsgCode} (${sc.name})` };
}

/** The first position of whatever was sent, in lon/lat when it says so, to centre a local projection on. */
function firstPosition(geometry: unknown, crs: 'wgs84' | 'site'): [number, number] | null {
  if (crs !== 'wgs84') return null;
  let g = geometry as { type?: string; coordinates?: unknown; geometry?: unknown; features?: { geometry?: unknown }[] } | null;
  if (g?.type === 'FeatureCollection') g = (g.features?.[0]?.geometry ?? null) as typeof g;
  if (g?.type === 'Feature') g = (g.geometry ?? null) as typeof g;
  let c: unknown = g?.coordinates;
  while (Array.isArray(c) && Array.isArray(c[0])) c = c[0];
  return Array.isArray(c) && typeof c[0] === 'number' && typeof c[1] === 'number' ? [c[0], c[1]] : null;
}

export function createOutlinesService(ctx: AppContext) {
  const { ds } = ctx;
  const repo = () => ds.getRepository(OutlineEntity);

  async function names(ids: string[]): Promise<Map<string, string>> {
    const users = ids.length ? await ds.getRepository(User).find({ where: { id: In([...new Set(ids)]) }, select: { id: true, name: true } }) : [];
    return new Map(users.map((u) => [u.id, u.name]));
  }
  const toDto = (o: OutlineEntity, who: Map<string, string>): Outline => ({
    id: o.id,
    siteId: o.siteId,
    name: o.name,
    geometry: o.geometry,
    areaM2: o.areaM2,
    createdBy: who.get(o.createdById) ?? '',
    createdById: o.createdById,
    createdAt: o.createdAt.toISOString(),
    updatedAt: o.updatedAt.toISOString(),
  });

  async function check(siteId: string, geometry: unknown, crs: 'wgs84' | 'site') {
    const site = await ds.getRepository(Site).findOneByOrFail({ id: siteId });
    return checkOutline(geometry, crs, await outlineArea(ctx, site, firstPosition(geometry, crs)));
  }

  async function list(siteId: string): Promise<Outline[]> {
    const rows = await repo().find({ where: { siteId }, order: { createdAt: 'ASC', name: 'ASC' } });
    const who = await names(rows.map((r) => r.createdById));
    return rows.map((r) => toDto(r, who));
  }

  async function entity(siteId: string, outlineId: string): Promise<OutlineEntity> {
    const o = await repo().findOne({ where: { id: outlineId, siteId } });
    if (!o) throw notFound('The outline');
    return o;
  }

  async function get(siteId: string, outlineId: string): Promise<Outline> {
    const o = await entity(siteId, outlineId);
    return toDto(o, await names([o.createdById]));
  }

  async function create(siteId: string, userId: string, body: OutlineBody): Promise<Outline> {
    const { geometry, areaM2 } = await check(siteId, body.geometry, body.crs);
    const saved = await repo().save(repo().create({ siteId, name: body.name, geometry, areaM2, createdById: userId }));
    return get(siteId, saved.id);
  }

  async function update(siteId: string, outlineId: string, patch: OutlinePatch): Promise<Outline> {
    const o = await entity(siteId, outlineId);
    const changes: Partial<Pick<OutlineEntity, 'name' | 'geometry' | 'areaM2'>> = {};
    if (patch.name !== undefined) changes.name = patch.name;
    if (patch.geometry !== undefined) Object.assign(changes, await check(siteId, patch.geometry, patch.crs ?? 'wgs84'));
    if (Object.keys(changes).length) await repo().update({ id: o.id, siteId }, changes);
    return get(siteId, outlineId);
  }

  async function remove(siteId: string, outlineId: string): Promise<void> {
    const o = await entity(siteId, outlineId);
    await repo().delete({ id: o.id, siteId });
  }

  /** The outline as a GeoJSON Feature (WGS84), for download. */
  async function feature(siteId: string, outlineId: string) {
    const o = await get(siteId, outlineId);
    const geometry: OutlineGeometry = o.geometry;
    return {
      outline: o,
      body: { type: 'Feature', id: o.id, geometry, properties: { name: o.name, areaM2: o.areaM2, createdBy: o.createdBy, createdAt: o.createdAt, updatedAt: o.updatedAt } },
    };
  }

  return { list, get, entity, create, update, remove, feature, check };
}
