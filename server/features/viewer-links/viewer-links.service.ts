import { CAUTIONS } from '@shared/cautions';
import type { z } from 'zod';
import {
  VIEW_CONSTRUCTION_FIELDS,
  viewerSurfaceSettingsSchema,
  type ViewerLayers,
  type ViewerLink,
  type ViewerLinkCreated,
  type viewerLinkBodySchema,
  type viewerLinkEmailBodySchema,
  type ViewInfo,
  type ViewWells,
} from '@shared/schemas/viewer-links';
import { hashToken, newToken, safeEqual } from '../../auth/tokens';
import type { AppContext } from '../../context';
import { AppError, badRequest, conflict, notFound } from '../../lib/errors';
import { siteBasemapStyleUrl } from '../basemaps/basemaps.service';
import { admitMailRequest, type MailRequester } from '../mail/mail-limits';
import { CaptureSketchEntity } from '../ksurface/capture-sketch.entity';
import { createKSurfaceService } from '../ksurface/ksurface.service';
import { OutlineEntity } from '../ksurface/outline.entity';
import { createMapService } from '../map/map.service';
import { Site } from '../sites/site.entity';
import { User } from '../users/user.entity';
import { ViewerLinkEntity } from './viewer-link.entity';

type CreateBody = z.output<typeof viewerLinkBodySchema>;
type EmailBody = z.output<typeof viewerLinkEmailBodySchema>;

/** 32 random bytes in base64url: 43 characters. */
const TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

/**
 * The one answer to a token that does not open a view: unknown, malformed, expired, revoked, or a
 * layer the link does not show. Same status, same body, so nothing tells which.
 */
export const viewNotFound = () => new AppError('NOT_FOUND', 'This viewer link does not exist or no longer works', 404);

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** The token of a URL as shown at creation (…/view/<token>), or the token itself. */
function tokenOf(body: EmailBody): string {
  if (body.token) return body.token.trim();
  const m = /\/view\/([A-Za-z0-9_-]+)\/?(?:[?#].*)?$/.exec(body.url ?? '');
  return m?.[1] ?? '';
}

export function createViewerLinksService(ctx: AppContext) {
  const { ds, config, outbox } = ctx;
  const repo = () => ds.getRepository(ViewerLinkEntity);
  const map = createMapService(ctx);
  const surfaces = createKSurfaceService(ctx);
  const urlFor = (token: string) => new URL(`/view/${token}`, config.PUBLIC_URL).toString();

  async function names(ids: string[]): Promise<Map<string, string>> {
    const uniq = [...new Set(ids)];
    const users = uniq.length ? await ds.getRepository(User).find({ where: uniq.map((id) => ({ id })), select: { id: true, name: true } }) : [];
    return new Map(users.map((u) => [u.id, u.name]));
  }
  const toDto = (l: ViewerLinkEntity, who: Map<string, string>): ViewerLink => ({
    id: l.id,
    siteId: l.siteId,
    label: l.label,
    layers: l.layers,
    showNames: l.showNames,
    showConstruction: l.showConstruction,
    createdBy: who.get(l.createdById) ?? '',
    createdAt: l.createdAt.toISOString(),
    expiresAt: l.expiresAt.toISOString(),
    revokedAt: l.revokedAt ? l.revokedAt.toISOString() : null,
    lastViewedAt: l.lastViewedAt ? l.lastViewedAt.toISOString() : null,
    viewCount: l.viewCount,
  });

  async function create(siteId: string, userId: string, body: CreateBody): Promise<ViewerLinkCreated> {
    const token = newToken(32);
    const { surfaceSettings, ...on } = body.layers;
    // Frozen: parsed now with the K surface's own schema (defaults filled), stored as they are.
    const layers: ViewerLayers = { ...on, surfaceSettings: on.surface ? viewerSurfaceSettingsSchema.parse(surfaceSettings ?? {}) : null };
    if (layers.surfaceSettings?.outlineId) {
      const ok = await ds.getRepository(OutlineEntity).exists({ where: { id: layers.surfaceSettings.outlineId, siteId } });
      if (!ok) throw badRequest('No such outline on this site', { 'layers.surfaceSettings.outlineId': 'No such outline on this site' });
    }
    const saved = await repo().save(
      repo().create({
        siteId, tokenHash: hashToken(token), label: body.label, layers, showNames: body.showNames, showConstruction: body.showConstruction,
        createdById: userId, expiresAt: new Date(Date.now() + body.expiresInDays * 86_400_000), revokedAt: null, lastViewedAt: null, viewCount: 0,
      }),
    );
    return { ...toDto(saved, await names([userId])), url: urlFor(token) };
  }

  async function list(siteId: string): Promise<ViewerLink[]> {
    const rows = await repo().find({ where: { siteId }, order: { createdAt: 'DESC' } });
    const who = await names(rows.map((r) => r.createdById));
    return rows.map((r) => toDto(r, who));
  }

  /** Revoking is at once: the next view request resolves the link afresh and finds it revoked. Repeating it is harmless. */
  async function revoke(linkId: string): Promise<void> {
    await repo().createQueryBuilder().update().set({ revokedAt: () => "datetime('now')" }).where('id = :id AND revokedAt IS NULL', { id: linkId }).execute();
  }

  /**
   * Mail the link to each address, one message each, through the outbox. The server keeps only the
   * token's hash, so the Lead's client sends the URL (or token) it was shown; its hash must match.
   */
  async function email(linkId: string, sender: Express.User, body: EmailBody, who: MailRequester = {}): Promise<{ queued: number; held: string[] }> {
    const link = await repo().findOneBy({ id: linkId });
    if (!link) throw notFound('The viewer link');
    const token = tokenOf(body);
    if (!token || !safeEqual(hashToken(token), link.tokenHash)) {
      throw badRequest('This is not the URL of this viewer link; send the URL shown when the link was made', { url: 'Not this link’s URL' }, 'VIEWER_LINK_MISMATCH');
    }
    if (link.revokedAt || link.expiresAt.getTime() <= Date.now()) throw conflict('VIEWER_LINK_ENDED', 'This viewer link was revoked or has expired; make a new one');
    const site = await ds.getRepository(Site).findOneByOrFail({ id: link.siteId });
    const url = urlFor(token);
    const expires = link.expiresAt.toISOString().slice(0, 10);
    const subject = `A read-only K map of ${site.name} on Kfield`;
    const paras = [
      `${sender.name} shares a read-only map of hydraulic conductivity (K) at the site "${site.name}" with you.`,
      `No account is needed. The link works until ${expires} unless it is revoked earlier; please do not forward it.`,
    ];
    const text = [...paras, '', `Open the map: ${url}`, '', 'Kfield — hydraulic conductivity for monitoring-well networks.'].join('\n');
    const html = `<!doctype html><html><body style="font-family:sans-serif;color:#0f172a"><h2 style="color:#135c56">${esc(subject)}</h2>${paras.map((p) => `<p>${esc(p)}</p>`).join('')}<p><a href="${esc(url)}">Open the map</a></p></body></html>`;
    const to = [...new Set(body.to.map((a) => a.trim().toLowerCase()))];
    // The mail limits (decision 011), per address: the same link to the same address within minutes,
    // or an address mailed too often today, is held back and said so; too many from one account or
    // client address is refused (429) before anything is queued.
    return ds.transaction(async (m) => {
      const held: string[] = [];
      for (const address of to) {
        const admitted = await admitMailRequest(m, 'viewer-link', `${link.id}|${address}`, { ...who, requestedById: sender.id });
        if (admitted.mayMail) await outbox.queue(m, { kind: 'viewer-link', to: address, subject, text, html });
        else held.push(address);
        await admitted.record(admitted.mayMail);
      }
      return { queued: to.length - held.length, held };
    });
  }

  /** The one place a token becomes a link: anything that does not open a view throws viewNotFound(). */
  async function resolve(token: string): Promise<ViewerLinkEntity> {
    if (!TOKEN_PATTERN.test(token)) throw viewNotFound();
    const link = await repo().findOneBy({ tokenHash: hashToken(token) });
    if (!link || link.revokedAt || link.expiresAt.getTime() <= Date.now()) throw viewNotFound();
    return link;
  }

  /** Whether a token opens a view now (the page's HTML status); counts nothing. */
  async function opens(token: string): Promise<boolean> {
    try {
      await resolve(token);
      return true;
    } catch (e) {
      if (e instanceof AppError && e.status === 404) return false;
      throw e;
    }
  }

  async function info(token: string): Promise<ViewInfo> {
    const link = await resolve(token);
    const site = await ds.getRepository(Site).findOneByOrFail({ id: link.siteId });
    // A short write: the view is counted.
    await repo().createQueryBuilder().update().set({ lastViewedAt: () => "datetime('now')", viewCount: () => '"viewCount" + 1' }).where('id = :id', { id: link.id }).execute();
    const { wells, surface, outlines, sketches } = link.layers;
    return {
      siteName: site.name, epsgCode: site.epsgCode, crsName: site.crsName, displayUnits: site.displayUnits,
      basemapStyleUrl: await siteBasemapStyleUrl(ds.manager, site.basemapId ?? null),
      layers: { wells, surface, outlines, sketches }, showNames: link.showNames, showConstruction: link.showConstruction,
      cautions: [...CAUTIONS], expiresAt: link.expiresAt.toISOString(),
    };
  }

  /** Stripped wells layers, keyed by the K map's ETag and what the link shows. */
  const wellsCache = new Map<string, Buffer>();
  async function wells(token: string): Promise<Buffer> {
    const link = await resolve(token);
    if (!link.layers.wells) throw viewNotFound();
    const layer = await map.wellsLayer(link.siteId);
    const key = `${layer.etag}|${link.showNames}|${link.showConstruction}`;
    const hit = wellsCache.get(key);
    if (hit) return hit;
    const fc = JSON.parse(layer.body.toString('utf8')) as ViewWells;
    for (const f of fc.features) {
      const p = f.properties as Record<string, unknown>;
      if (!link.showNames) delete p.name;
      if (!link.showConstruction) for (const k of VIEW_CONSTRUCTION_FIELDS) delete p[k];
    }
    const body = Buffer.from(JSON.stringify(fc), 'utf8');
    wellsCache.set(key, body);
    if (wellsCache.size > 64) wellsCache.delete(wellsCache.keys().next().value!);
    return body;
  }

  async function surface(token: string) {
    const link = await resolve(token);
    if (!link.layers.surface || !link.layers.surfaceSettings) throw viewNotFound();
    return surfaces.surface(link.siteId, viewerSurfaceSettingsSchema.parse(link.layers.surfaceSettings));
  }

  async function outlines(token: string) {
    const link = await resolve(token);
    if (!link.layers.outlines) throw viewNotFound();
    const rows = await ds.getRepository(OutlineEntity).find({ where: { siteId: link.siteId }, order: { createdAt: 'ASC', name: 'ASC' } });
    return { outlines: rows.map((o) => ({ id: o.id, name: o.name, geometry: o.geometry, areaM2: o.areaM2 })) };
  }

  async function sketches(token: string) {
    const link = await resolve(token);
    if (!link.layers.sketches) throw viewNotFound();
    const rows = await ds.getRepository(CaptureSketchEntity).find({ where: { siteId: link.siteId }, order: { createdAt: 'ASC' } });
    // No inputs (free-text notes) and no creator: the sketch's place and the server's numbers only.
    return { sketches: rows.map((s) => ({ id: s.id, name: s.name, lon: s.lon, lat: s.lat, x: s.x, y: s.y, results: s.results, createdAt: s.createdAt.toISOString(), cautions: [...CAUTIONS] })) };
  }

  return { create, list, revoke, email, resolve, opens, info, wells, surface, outlines, sketches };
}
