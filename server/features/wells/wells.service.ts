import type { EntityManager } from 'typeorm';
import { Not } from 'typeorm';
import type { z } from 'zod';
import {
  defaultIntakeRadius,
  derivedStaticToScreenBottomM,
  matchHydroUnit,
  wellConstructionToSi,
  wellInputSchema,
  wellToInput,
  type WellInputParsed,
  type wellPatchSchema,
  type Well as WellDto,
} from '@shared/schemas/wells';
import type { AppContext } from '../../context';
import { badRequest, conflict, notFound } from '../../lib/errors';
import { fieldErrors } from '../../lib/validate';
import { Site } from '../sites/site.entity';
import { resolveCoordinates } from './projection';
import { Well } from './well.entity';

export type WellRow = Omit<Well, 'id' | 'site' | 'createdAt' | 'updatedAt'>;
export type BuildResult = { ok: true; row: WellRow } | { ok: false; fields: Record<string, string> };

/** Names compare without regard to case or surrounding space: "MW-1" and "mw-1 " are one well. */
export const nameKey = (name: string) => name.trim().toLowerCase();

export const byWellName = (a: { name: string }, b: { name: string }) => a.name.localeCompare(b.name, 'en', { numeric: true, sensitivity: 'base' });

export function toWellDto(w: Well): WellDto {
  const derived =
    w.staticWaterDepthM !== null && w.staticToScreenBottomM !== null &&
    Math.abs(w.staticToScreenBottomM - derivedStaticToScreenBottomM(w.measuringPointElevationM, w.staticWaterDepthM, w.screenBottomElevationM)) < 1e-6;
  return {
    id: w.id,
    siteId: w.siteId,
    name: w.name,
    inputEpsg: w.inputEpsg,
    inputX: w.inputX,
    inputY: w.inputY,
    lon: w.lon,
    lat: w.lat,
    siteX: w.siteX,
    siteY: w.siteY,
    groundElevationM: w.groundElevationM,
    measuringPointElevationM: w.measuringPointElevationM,
    screenTopDepthM: w.screenTopDepthM,
    screenBottomDepthM: w.screenBottomDepthM,
    screenTopElevationM: w.screenTopElevationM,
    screenBottomElevationM: w.screenBottomElevationM,
    screenLengthM: w.screenBottomDepthM - w.screenTopDepthM,
    casingRadiusM: w.casingRadiusM,
    screenRadiusM: w.screenRadiusM,
    boreholeRadiusM: w.boreholeRadiusM,
    intakeRadius: w.intakeRadius,
    filterPackPorosity: w.filterPackPorosity,
    hydroUnit: w.hydroUnit,
    aquiferCondition: w.aquiferCondition,
    saturatedThicknessM: w.saturatedThicknessM,
    staticWaterDepthM: w.staticWaterDepthM,
    staticToScreenBottomM: w.staticToScreenBottomM,
    staticToScreenBottomDerived: derived,
    status: w.status,
    notes: w.notes,
    isDemo: w.isDemo,
    createdAt: w.createdAt.toISOString(),
    updatedAt: w.updatedAt.toISOString(),
  };
}

/**
 * A checked well input (schema already applied) → the row to store, after the checks that need
 * the site: its list of hydrostratigraphic units and its coordinate system.
 */
export function buildWellRow(site: Pick<Site, 'id' | 'epsgCode' | 'hydroUnits'>, input: WellInputParsed, isDemo = false): BuildResult {
  const fields: Record<string, string> = {};
  const unit = matchHydroUnit(site.hydroUnits, input.hydroUnit);
  if (!unit.ok) fields.hydroUnit = unit.message;
  const coords = resolveCoordinates(input.coordinates, site.epsgCode);
  if (!coords.ok) fields[coords.field] = coords.message;
  if (!unit.ok || !coords.ok) return { ok: false, fields };
  const c = wellConstructionToSi(input);
  return {
    ok: true,
    row: {
      siteId: site.id,
      name: input.name,
      ...coords.value,
      ...c,
      intakeRadius: input.intakeRadius ?? defaultIntakeRadius(c.screenRadiusM, c.boreholeRadiusM),
      hydroUnit: unit.unit,
      aquiferCondition: input.aquiferCondition,
      status: input.status,
      notes: input.notes,
      isDemo,
    },
  };
}

async function recordsTableHasWellColumn(m: EntityManager): Promise<boolean> {
  const t = await m.query(`SELECT name FROM sqlite_master WHERE type = 'table' AND name = ?`, ['records']);
  if (!t.length) return false;
  const cols: { name: string }[] = await m.query(`PRAGMA table_info("records")`);
  return cols.some((c) => c.name === 'wellId');
}

/** The number of records kept for a well (0 while records are not part of the schema). */
export async function countWellRecords(m: EntityManager, wellId: string): Promise<number> {
  if (!(await recordsTableHasWellColumn(m))) return 0;
  const rows: { n: number }[] = await m.query(`SELECT COUNT(*) AS n FROM "records" WHERE "wellId" = ?`, [wellId]);
  return Number(rows[0]?.n ?? 0);
}

/**
 * Re-express a site's wells in a new coordinate system (the site's EPSG code changed), from their
 * WGS 84 position. Refuses the change when a well falls outside the new system's area of use.
 */
export async function reexpressSiteWells(m: EntityManager, siteId: string, epsgCode: number): Promise<void> {
  const repo = m.getRepository(Well);
  const wells = await repo.find({ where: { siteId } });
  const outside: string[] = [];
  for (const w of wells) {
    const r = resolveCoordinates(w.inputEpsg === epsgCode ? { kind: 'epsg', epsg: w.inputEpsg, x: w.inputX, y: w.inputY } : { kind: 'latlon', lat: w.lat, lon: w.lon }, epsgCode);
    if (!r.ok) outside.push(w.name);
    else await repo.update({ id: w.id }, { siteX: r.value.siteX, siteY: r.value.siteY });
  }
  if (outside.length) {
    const list = outside.sort().slice(0, 5).join(', ') + (outside.length > 5 ? ` and ${outside.length - 5} more` : '');
    throw badRequest(`The site's wells do not all fit EPSG:${epsgCode}`, {
      epsgCode: `Well${outside.length > 1 ? 's' : ''} ${list} lie${outside.length > 1 ? '' : 's'} outside the area of use of EPSG:${epsgCode}`,
    });
  }
}

const isUniqueViolation = (e: unknown) => /UNIQUE constraint failed: wells\./.test(String((e as Error)?.message ?? ''));

export function createWellsService({ ds }: AppContext) {
  const wells = ds.getRepository(Well);
  const sites = ds.getRepository(Site);

  async function siteOrThrow(siteId: string) {
    const site = await sites.findOne({ where: { id: siteId } });
    if (!site) throw notFound('The site');
    return site;
  }

  async function wellOrThrow(wellId: string) {
    const w = await wells.findOne({ where: { id: wellId } });
    if (!w) throw notFound('The well');
    return w;
  }

  async function assertNameFree(siteId: string, name: string, exceptId?: string) {
    const others = await wells.find({ where: { siteId, ...(exceptId ? { id: Not(exceptId) } : {}) }, select: { id: true, name: true } });
    const hit = others.find((o) => nameKey(o.name) === nameKey(name));
    if (hit) throw conflict('DUPLICATE_NAME', `A well named ${hit.name} already exists on this site`, { name: `A well named ${hit.name} already exists on this site` });
  }

  async function save(row: Partial<Well>): Promise<Well> {
    try {
      return await wells.save(row);
    } catch (e) {
      if (isUniqueViolation(e)) throw conflict('DUPLICATE_NAME', `A well named ${row.name} already exists on this site`, { name: `A well named ${row.name} already exists on this site` });
      throw e;
    }
  }

  async function list(siteId: string): Promise<WellDto[]> {
    return (await wells.find({ where: { siteId } })).sort(byWellName).map(toWellDto);
  }

  async function get(wellId: string): Promise<WellDto> {
    return toWellDto(await wellOrThrow(wellId));
  }

  async function create(siteId: string, input: WellInputParsed): Promise<WellDto> {
    const site = await siteOrThrow(siteId);
    const built = buildWellRow(site, input);
    if (!built.ok) throw badRequest(`The well is invalid — ${Object.entries(built.fields).map(([k, v]) => `${k}: ${v}`)[0]}`, built.fields);
    await assertNameFree(siteId, input.name);
    return toWellDto(await save(wells.create(built.row)));
  }

  async function update(wellId: string, patch: z.output<typeof wellPatchSchema>): Promise<WellDto> {
    const existing = await wellOrThrow(wellId);
    const site = await siteOrThrow(existing.siteId);
    // The stored well as input in metres (screen in the patch's reference), overlaid with the change.
    const base = wellToInput(toWellDto(existing), undefined, patch.screenReference ?? 'depth');
    const defined = Object.fromEntries(Object.entries(patch).filter(([, v]) => v !== undefined));
    const parsed = wellInputSchema.safeParse({ ...base, ...defined });
    if (!parsed.success) {
      const fields = fieldErrors(parsed.error);
      const [k, v] = Object.entries(fields)[0];
      throw badRequest(`The change is invalid — ${k}: ${v}`, fields);
    }
    const built = buildWellRow(site, parsed.data, existing.isDemo);
    if (!built.ok) throw badRequest(`The change is invalid — ${Object.entries(built.fields).map(([k, v]) => `${k}: ${v}`)[0]}`, built.fields);
    if (nameKey(parsed.data.name) !== nameKey(existing.name)) await assertNameFree(existing.siteId, parsed.data.name, existing.id);
    const saved = await save({ ...existing, ...built.row, id: existing.id });
    return toWellDto(await wellOrThrow(saved.id));
  }

  async function remove(wellId: string): Promise<void> {
    const w = await wellOrThrow(wellId);
    await ds.transaction(async (m) => {
      const n = await countWellRecords(m, wellId);
      if (n > 0) {
        throw conflict('WELL_HAS_RECORDS', `Well ${w.name} has ${n} record${n === 1 ? '' : 's'}; delete ${n === 1 ? 'it' : 'them'} first, or set the well's status to decommissioned`);
      }
      await m.getRepository(Well).delete({ id: wellId });
    });
  }

  return { list, get, create, update, remove, siteOrThrow };
}
