import { In } from 'typeorm';
import type { z } from 'zod';
import type { SiteRole } from '@shared/schemas/common';
import type { siteBodySchema, sitePatchSchema, Site as SiteDto } from '@shared/schemas/sites';
import type { AppContext } from '../../context';
import { badRequest, forbidden, notFound } from '../../lib/errors';
import { basemapExists, siteBasemapStyleUrl } from '../basemaps/basemaps.service';
import { reexpressSiteWells } from '../wells/wells.service';
import { lookupCrs } from './crs';
import { Membership } from './membership.entity';
import { Site } from './site.entity';

function crsOrThrow(code: number) {
  const crs = lookupCrs(code);
  if (!crs) throw badRequest(`Unknown EPSG code ${code}`, { epsgCode: `Unknown EPSG code ${code}: not a coordinate reference system that proj4 can use` });
  return crs;
}

/** Admins create sites; with SITE_CREATORS=leads so does anyone who leads at least one site. */
export async function canCreateSites({ ds, config }: AppContext, user: Express.User): Promise<boolean> {
  if (user.isAdmin) return true;
  if (config.SITE_CREATORS !== 'leads') return false;
  return ds.getRepository(Membership).exists({ where: { userId: user.id, role: 'Lead' } });
}

export function createSitesService(ctx: AppContext) {
  const { ds } = ctx;
  const sites = ds.getRepository(Site);
  const memberships = ds.getRepository(Membership);

  async function toDto(site: Site, myRole: SiteRole | null): Promise<SiteDto> {
    const memberCount = await memberships.count({ where: { siteId: site.id } });
    return {
      id: site.id,
      name: site.name,
      description: site.description,
      epsgCode: site.epsgCode,
      crsName: site.crsName,
      displayUnits: site.displayUnits,
      hydroUnits: site.hydroUnits,
      myRole,
      memberCount,
      basemapId: site.basemapId ?? null,
      basemapStyleUrl: await siteBasemapStyleUrl(ds.manager, site.basemapId ?? null),
      createdAt: site.createdAt.toISOString(),
    };
  }

  async function list(user: Express.User): Promise<SiteDto[]> {
    const mine = await memberships.find({ where: { userId: user.id } });
    const roleBySite = new Map(mine.map((m) => [m.siteId, m.role]));
    const rows = user.isAdmin
      ? await sites.find({ order: { name: 'ASC' } })
      : await sites.find({ where: { id: In([...roleBySite.keys()]) }, order: { name: 'ASC' } });
    return Promise.all(rows.map((s) => toDto(s, roleBySite.get(s.id) ?? null)));
  }

  async function get(siteId: string, role: SiteRole | null): Promise<SiteDto> {
    const site = await sites.findOne({ where: { id: siteId } });
    if (!site) throw notFound('The site');
    return toDto(site, role);
  }

  async function create(user: Express.User, body: z.output<typeof siteBodySchema>): Promise<SiteDto> {
    if (!(await canCreateSites(ctx, user))) {
      const who = ctx.config.SITE_CREATORS === 'leads' ? 'an instance admin or the Lead of a site' : 'an instance admin';
      throw forbidden(`Only ${who} can create a site`, 'SITE_CREATOR_REQUIRED');
    }
    const crs = crsOrThrow(body.epsgCode);
    const id = await ds.transaction(async (m) => {
      const site = await m.getRepository(Site).save(
        m.getRepository(Site).create({ ...body, crsName: crs.name, isDemo: false }),
      );
      await m.getRepository(Membership).insert({ siteId: site.id, userId: user.id, role: 'Lead' });
      return site.id;
    });
    return get(id, 'Lead');
  }

  async function update(siteId: string, role: SiteRole | null, patch: z.output<typeof sitePatchSchema>): Promise<SiteDto> {
    const site = await sites.findOne({ where: { id: siteId } });
    if (!site) throw notFound('The site');
    if (patch.epsgCode !== undefined) site.crsName = crsOrThrow(patch.epsgCode).name;
    const reexpress = patch.epsgCode !== undefined && patch.epsgCode !== site.epsgCode;
    if (patch.basemapId && !(await basemapExists(ds.manager, patch.basemapId))) {
      throw badRequest(`There is no basemap ${patch.basemapId}`, { basemapId: 'Choose one of the basemaps on this instance' });
    }
    Object.assign(site, patch);
    await ds.transaction(async (m) => {
      // The wells' site coordinates follow the site's system.
      if (reexpress) await reexpressSiteWells(m, siteId, site.epsgCode);
      await m.getRepository(Site).save(site);
    });
    return get(siteId, role);
  }

  return { list, get, create, update };
}
