import { createRequire } from 'node:module';
import proj4 from 'proj4';
import { In, IsNull } from 'typeorm';
import { CAUTIONS } from '@shared/cautions';
import { wellK } from '@shared/hydraulics/well-k';
import type { KSurface } from '@shared/schemas/ksurface';
import type { AppContext } from '../../context';
import { badRequest, notFound } from '../../lib/errors';
import { FitEntity } from '../fits/fit.entity';
import { createKSurfaceService, type SurfaceQuery } from '../ksurface/ksurface.service';
import { gridCrsFor, siteCrs } from '../ksurface/grid-crs';
import { RecordEntity } from '../records/record.entity';
import { Site } from '../sites/site.entity';
import { User } from '../users/user.entity';
import { Well } from '../wells/well.entity';
import { csvDocument } from './csv';
import { exportFileName } from './file-name';
import { writeGeoTiff } from './geotiff';
import { surfaceIsobands } from './isobands';
import { wellsCsv, wellsGeoJson, wellsKml, wellsShapefileZip, type SiteCrsInfo, type WellRow } from './wells-formats';

const require = createRequire(import.meta.url);

export interface ExportFile {
  fileName: string;
  contentType: string;
  body: Buffer | string;
}

/** The site system's WKT as epsg-index holds it (OGC WKT 1, which GDAL, QGIS and ArcGIS read from a .prj). */
function wktFor(code: number): string | null {
  try {
    const e = require(`epsg-index/s/${code}.json`) as { wkt?: string };
    return e.wkt ?? null;
  } catch {
    return null;
  }
}

/** Little-endian Float32 cells of a surface answer. */
export function decodeCells(b64: string): Float32Array {
  const buf = Buffer.from(b64, 'base64');
  const out = new Float32Array(buf.length / 4);
  for (let i = 0; i < out.length; i++) out[i] = buf.readFloatLE(i * 4);
  return out;
}

export function createExportsService(ctx: AppContext) {
  const { ds } = ctx;
  const surfaces = createKSurfaceService(ctx);

  async function siteOrThrow(siteId: string): Promise<Site> {
    const site = await ds.getRepository(Site).findOneBy({ id: siteId });
    if (!site) throw notFound('The site');
    return site;
  }

  function crsInfo(site: Site): SiteCrsInfo & { proj4: string; geographic: boolean } {
    const c = siteCrs(site);
    return { epsgCode: site.epsgCode, name: c.name, unit: c.unit, proj4: c.proj4, geographic: c.geographic };
  }

  /** Every well of the site with Well K: the geometric mean of its Checked, not superseded fits (as wellKFor and the K map). */
  async function wellRows(siteId: string): Promise<WellRow[]> {
    const fits = await ds.getRepository(FitEntity).find({ where: { siteId, status: 'checked', supersededAt: IsNull() }, select: { id: true, wellId: true, kMetersPerSecond: true } });
    const byWell = new Map<string, number[]>();
    for (const f of fits) if (f.kMetersPerSecond > 0) byWell.set(f.wellId, [...(byWell.get(f.wellId) ?? []), f.kMetersPerSecond]);
    const wells = await ds.getRepository(Well).find({ where: { siteId }, order: { name: 'ASC' } });
    return wells.map((w) => {
      const ks = byWell.get(w.id);
      const k = ks ? wellK(ks) : null;
      return {
        id: w.id, name: w.name, status: w.status, hydroUnit: w.hydroUnit, aquiferCondition: w.aquiferCondition,
        siteX: w.siteX, siteY: w.siteY, lon: w.lon, lat: w.lat,
        groundElevationM: w.groundElevationM, screenTopElevationM: w.screenTopElevationM, screenBottomElevationM: w.screenBottomElevationM,
        screenTopDepthM: w.screenTopDepthM, screenBottomDepthM: w.screenBottomDepthM,
        wellKMetersPerSecond: k?.kMetersPerSecond ?? null, log10K: k?.log10Mean ?? null, fitCount: k?.count ?? 0, log10StdDev: k?.log10StdDev ?? null,
      };
    });
  }

  async function wells(siteId: string, format: 'csv' | 'geojson' | 'shapefile' | 'kml'): Promise<ExportFile> {
    const site = await siteOrThrow(siteId);
    const crs = crsInfo(site);
    const rows = await wellRows(siteId);
    if (format === 'csv') return { fileName: exportFileName(site.name, 'wells', 'csv'), contentType: 'text/csv; charset=utf-8', body: wellsCsv(rows, crs) };
    if (format === 'geojson') {
      const body = JSON.stringify(wellsGeoJson(rows, { site: site.name, crs, cautions: CAUTIONS }));
      return { fileName: exportFileName(site.name, 'wells', 'geojson'), contentType: 'application/geo+json; charset=utf-8', body };
    }
    if (format === 'kml') {
      return { fileName: exportFileName(site.name, 'wells', 'kml'), contentType: 'application/vnd.google-earth.kml+xml; charset=utf-8', body: wellsKml(rows, { site: site.name, cautions: CAUTIONS }) };
    }
    const prjWkt = wktFor(site.epsgCode);
    if (!prjWkt) throw badRequest(`No WKT is known for the site's system EPSG:${site.epsgCode}, so a shapefile's .prj cannot be written`, { crs: 'No WKT for this system' }, 'NO_WKT');
    const fileName = exportFileName(site.name, 'wells-shapefile', 'zip');
    const body = await wellsShapefileZip(rows, { site: site.name, baseName: fileName.replace(/-shapefile-(\d{4}-\d\d-\d\d)\.zip$/, '-$1'), crs, prjWkt, cautions: CAUTIONS });
    return { fileName, contentType: 'application/zip', body };
  }

  const settingsLine = (s: KSurface) =>
    `IDW of log10 Well K (m/s), power ${s.settings.power}, ${s.settings.neighbours ?? 'all'} neighbours, search radius ${s.settings.searchRadiusM === null ? 'none' : `${s.settings.searchRadiusM} m`}, ${s.wellsUsed} wells with a Checked fit, cell ${s.cellSizeM} m`;

  /**
   * The surface as a float32 GeoTIFF of log10 K in the site's system. A projected site's grid is
   * laid out in that projection (in metres; a system in feet only scales the pixel size), so its
   * cells are written as they are. A site in degrees has its grid in a local projection: the
   * GeoTIFF is then a lon/lat grid of the same size whose cells take the value of the grid cell
   * under their centre (nearest cell).
   */
  async function surfaceGeoTiff(siteId: string, q: SurfaceQuery): Promise<ExportFile> {
    const site = await siteOrThrow(siteId);
    const crs = crsInfo(site);
    const s = await surfaces.surface(siteId, q);
    const cells = decodeCells(s.log10K);
    const description = [`Kfield K surface of ${site.name}: ${settingsLine(s)}. Nodata -9999 outside the outline or beyond the search radius.`, ...CAUTIONS].join('\n');
    const common = { epsgCode: site.epsgCode, geographic: crs.geographic, citation: `${crs.name}`, description };
    let raster;
    if (!crs.geographic) {
      const g = gridCrsFor(site, null);
      const [x0, y0] = g.gridToSite(s.minX, s.minY + s.rows * s.cellSizeM);
      const [x1] = g.gridToSite(s.minX + s.cellSizeM, s.minY);
      raster = { ...common, values: cells, cols: s.cols, rows: s.rows, originX: x0, originY: y0, pixelX: x1 - x0, pixelY: x1 - x0 };
    } else {
      const t = proj4(s.gridCrs.proj4, crs.proj4);
      const maxX = s.minX + s.cols * s.cellSizeM;
      const maxY = s.minY + s.rows * s.cellSizeM;
      const edge: [number, number][] = [];
      for (let i = 0; i <= 8; i++) {
        const fx = s.minX + ((maxX - s.minX) * i) / 8;
        const fy = s.minY + ((maxY - s.minY) * i) / 8;
        edge.push([fx, s.minY], [fx, maxY], [s.minX, fy], [maxX, fy]);
      }
      const ll = edge.map((p) => t.forward(p) as [number, number]);
      const [w, e] = [Math.min(...ll.map((p) => p[0])), Math.max(...ll.map((p) => p[0]))];
      const [so, n] = [Math.min(...ll.map((p) => p[1])), Math.max(...ll.map((p) => p[1]))];
      const px = (e - w) / s.cols;
      const py = (n - so) / s.rows;
      const values = new Float32Array(s.cols * s.rows).fill(Number.NaN);
      for (let r = 0; r < s.rows; r++)
        for (let c = 0; c < s.cols; c++) {
          const [gx, gy] = t.inverse([w + (c + 0.5) * px, n - (r + 0.5) * py]) as [number, number];
          const gc = Math.floor((gx - s.minX) / s.cellSizeM);
          const gr = Math.floor((maxY - gy) / s.cellSizeM);
          if (gc >= 0 && gc < s.cols && gr >= 0 && gr < s.rows) values[r * s.cols + c] = cells[gr * s.cols + gc];
        }
      raster = { ...common, values, cols: s.cols, rows: s.rows, originX: w, originY: n, pixelX: px, pixelY: py };
    }
    return { fileName: exportFileName(site.name, 'k-surface', 'tif'), contentType: 'image/tiff', body: writeGeoTiff(raster) };
  }

  async function surfaceIsobandsFile(siteId: string, q: SurfaceQuery & { stepLog10: number }): Promise<ExportFile> {
    const site = await siteOrThrow(siteId);
    const { stepLog10, ...surfaceQuery } = q;
    const s = await surfaces.surface(siteId, surfaceQuery);
    const toWgs84 = proj4(s.gridCrs.proj4, 'WGS84');
    const grid = { minX: s.minX, minY: s.minY, cellSizeM: s.cellSizeM, cols: s.cols, rows: s.rows };
    const features = surfaceIsobands(grid, decodeCells(s.log10K), stepLog10, (x, y) => toWgs84.forward([x, y]) as [number, number]);
    const body = JSON.stringify({
      type: 'FeatureCollection',
      name: `${site.name}: K surface isobands every ${stepLog10} log10 K`,
      surface: { ...s.settings, cellSizeM: s.cellSizeM, wellsUsed: s.wellsUsed, stepLog10, description: settingsLine(s) },
      warnings: s.warnings,
      cautions: [...CAUTIONS],
      features,
    });
    return { fileName: exportFileName(site.name, 'k-surface-isobands', 'geojson'), contentType: 'application/geo+json; charset=utf-8', body };
  }

  /** One row per Checked fit that counts (not superseded by a later Checked revision), by well and check date. */
  async function fitsCsv(siteId: string): Promise<ExportFile> {
    const site = await siteOrThrow(siteId);
    const fits = await ds.getRepository(FitEntity).find({ where: { siteId, status: 'checked', supersededAt: IsNull() }, order: { checkedAt: 'ASC' } });
    const ids = (xs: (string | null)[]) => [...new Set(xs.filter((x): x is string => x !== null))];
    const wells = new Map((await ds.getRepository(Well).find({ where: { id: In(ids(fits.map((f) => f.wellId))) }, select: { id: true, name: true } })).map((w) => [w.id, w.name]));
    const records = new Map(
      (await ds.getRepository(RecordEntity).find({ where: { id: In(ids(fits.map((f) => f.recordId))) }, select: { id: true, testType: true, testDate: true, source: true } })).map((r) => [r.id, r]),
    );
    const people = new Map(
      (await ds.getRepository(User).find({ where: { id: In(ids([...fits.map((f) => f.preparedById), ...fits.map((f) => f.checkedById)])) }, select: { id: true, name: true } })).map((u) => [u.id, u.name]),
    );
    fits.sort((a, b) => (wells.get(a.wellId) ?? '').localeCompare(wells.get(b.wellId) ?? '') || (a.checkedAt?.getTime() ?? 0) - (b.checkedAt?.getTime() ?? 0));
    const iso = (d: Date | null) => (d ? d.toISOString() : null);
    const header = [
      'well', 'well_id', 'record_id', 'test_type', 'test_date', 'record_source', 'fit_id', 'revision', 'method', 'line',
      'window_source', 'window_from_s', 'window_to_s', 'window_head_max_h_per_h0', 'window_head_min_h_per_h0', 'h0_m',
      't0_s', 'k_m_per_s', 'log10_k_m_per_s', 'r_squared', 'n_readings', 'flags', 'preparer', 'checker', 'created_at', 'submitted_at', 'checked_at', 'note',
    ];
    const rows = fits.map((f) => {
      const rec = records.get(f.recordId);
      const r = f.result;
      const flags = (f.flags as { code?: string }[]).map((x) => x.code).filter(Boolean).join('; ');
      return [
        wells.get(f.wellId) ?? '', f.wellId, f.recordId, rec?.testType ?? null, rec?.testDate ?? null, rec?.source ?? null, f.id, f.revision, f.method, f.line,
        r.window.source, r.window.fromSeconds, r.window.toSeconds, r.window.headMax, r.window.headMin, r.h0M,
        r.t0Seconds, f.kMetersPerSecond, f.kMetersPerSecond > 0 ? Math.log10(f.kMetersPerSecond) : null, r.rSquared, r.count, flags,
        people.get(f.preparedById) ?? '', f.checkedById ? (people.get(f.checkedById) ?? '') : '', iso(f.createdAt), iso(f.submittedAt), iso(f.checkedAt), f.note,
      ];
    });
    return { fileName: exportFileName(site.name, 'fits', 'csv'), contentType: 'text/csv; charset=utf-8', body: csvDocument(header, rows) };
  }

  return { wells, wellRows, surfaceGeoTiff, surfaceIsobands: surfaceIsobandsFile, fitsCsv };
}
