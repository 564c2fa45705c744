import { foldersToKML } from '@placemarkio/tokml';
import shpwrite from '@mapbox/shp-write';
import type { Feature, Point } from 'geojson';
import JSZip from 'jszip';
import { csvDocument } from './csv';

/** One well as every wells export writes it: SI, coordinates in the site's system and WGS84. */
export interface WellRow {
  id: string;
  name: string;
  status: string;
  hydroUnit: string | null;
  aquiferCondition: string;
  /** In the site's system (its EPSG code), in that system's units. */
  siteX: number;
  siteY: number;
  lon: number;
  lat: number;
  groundElevationM: number;
  screenTopElevationM: number;
  screenBottomElevationM: number;
  screenTopDepthM: number;
  screenBottomDepthM: number;
  /** Well K: the geometric mean of the well's Checked, not superseded fits; null without one. */
  wellKMetersPerSecond: number | null;
  log10K: number | null;
  fitCount: number;
  log10StdDev: number | null;
}

export interface SiteCrsInfo {
  epsgCode: number;
  name: string;
  /** The system's unit as epsg-index names it ("metre", "US survey foot", "degree"). */
  unit: string | null;
}

export function wellsCsv(wells: WellRow[], crs: SiteCrsInfo): string {
  const u = crs.unit ? `_${crs.unit.toLowerCase().replace(/[^a-z0-9]+/g, '_')}` : '';
  const header = [
    'well', 'well_id', `x_epsg_${crs.epsgCode}${u}`, `y_epsg_${crs.epsgCode}${u}`, 'longitude_wgs84_deg', 'latitude_wgs84_deg',
    'well_k_m_per_s', 'log10_well_k_m_per_s', 'checked_fits', 'log10_k_std_dev', 'hydrostratigraphic_unit', 'aquifer_condition', 'status',
    'ground_elevation_m', 'screen_top_elevation_m', 'screen_bottom_elevation_m', 'screen_top_depth_m', 'screen_bottom_depth_m',
  ];
  return csvDocument(
    header,
    wells.map((w) => [
      w.name, w.id, w.siteX, w.siteY, w.lon, w.lat,
      w.wellKMetersPerSecond, w.log10K, w.fitCount, w.log10StdDev, w.hydroUnit, w.aquiferCondition, w.status,
      w.groundElevationM, w.screenTopElevationM, w.screenBottomElevationM, w.screenTopDepthM, w.screenBottomDepthM,
    ]),
  );
}

function properties(w: WellRow) {
  return {
    id: w.id,
    name: w.name,
    wellKMetersPerSecond: w.wellKMetersPerSecond,
    log10K: w.log10K,
    checkedFits: w.fitCount,
    log10StdDev: w.log10StdDev,
    hydroUnit: w.hydroUnit,
    aquiferCondition: w.aquiferCondition,
    status: w.status,
    siteX: w.siteX,
    siteY: w.siteY,
    groundElevationM: w.groundElevationM,
    screenTopElevationM: w.screenTopElevationM,
    screenBottomElevationM: w.screenBottomElevationM,
    screenTopDepthM: w.screenTopDepthM,
    screenBottomDepthM: w.screenBottomDepthM,
  };
}

/** RFC 7946: WGS84 longitude, latitude; no crs member. The cautions and the site's system go in foreign members. */
export function wellsGeoJson(wells: WellRow[], meta: { site: string; crs: SiteCrsInfo; cautions: readonly string[] }) {
  return {
    type: 'FeatureCollection' as const,
    name: `${meta.site}: wells with Well K`,
    siteCrs: `EPSG:${meta.crs.epsgCode} (${meta.crs.name}); siteX/siteY are in it`,
    cautions: [...meta.cautions],
    features: wells.map((w) => ({
      type: 'Feature' as const,
      id: w.id,
      geometry: { type: 'Point' as const, coordinates: [w.lon, w.lat] },
      properties: properties(w),
    })),
  };
}

const wellK = (w: WellRow) =>
  w.wellKMetersPerSecond === null ? 'No Checked fit yet' : `Well K ${w.wellKMetersPerSecond.toPrecision(3)} m/s (geometric mean of ${w.fitCount} Checked fit${w.fitCount === 1 ? '' : 's'})`;

export function wellsKml(wells: WellRow[], meta: { site: string; cautions: readonly string[] }): string {
  return foldersToKML({
    type: 'root',
    children: [
      {
        type: 'folder',
        meta: { name: `${meta.site}: wells with Well K`, description: meta.cautions.join('\n\n') },
        children: wells.map(
          (w): Feature<Point> => ({
            type: 'Feature',
            id: w.id,
            geometry: { type: 'Point', coordinates: [w.lon, w.lat] },
            properties: { ...properties(w), description: wellK(w) },
          }),
        ),
      },
    ],
  } as Parameters<typeof foldersToKML>[0]);
}

/** dBASE field names (at most 10 characters) and what they hold, for the zip's README. */
export const SHAPEFILE_FIELDS: [string, string][] = [
  ['name', 'well name'],
  ['well_id', 'Kfield well id'],
  ['k_m_s', 'Well K, m/s (6 significant digits)'],
  ['log10_k', 'log10 of Well K in m/s'],
  ['n_fits', 'Checked fits in Well K'],
  ['log10_sd', 'standard deviation of log10 K of those fits'],
  ['hydro_unit', 'hydrostratigraphic unit'],
  ['aquifer', 'aquifer condition'],
  ['status', 'well status'],
  ['ground_m', 'ground elevation, m'],
  ['scr_top_m', 'screen top elevation, m'],
  ['scr_bot_m', 'screen bottom elevation, m'],
];

/** The dbf library writes a byte per character: UTF-8 bytes in, declared by the .cpg file. */
const utf8Bytes = (s: string | null) => (s === null ? null : Buffer.from(s, 'utf8').toString('latin1'));
/** N fields are 18 characters with 3 decimals; K keeps 6 significant digits in exponent form. */
const sig = (v: number | null, digits: number) => (v === null ? null : Number(v.toPrecision(digits)));
const fixed = (v: number | null, digits: number) => (v === null ? null : Number(v.toFixed(digits)));

/** A zipped point shapefile in the site's system: .shp .shx .dbf .prj (the system's WKT) .cpg, and a README with the cautions. */
export async function wellsShapefileZip(wells: WellRow[], meta: { site: string; baseName: string; crs: SiteCrsInfo; prjWkt: string; cautions: readonly string[] }): Promise<Buffer> {
  const rows = wells.map((w) => ({
    name: utf8Bytes(w.name),
    well_id: w.id,
    k_m_s: sig(w.wellKMetersPerSecond, 6),
    log10_k: fixed(w.log10K, 3),
    n_fits: w.fitCount,
    log10_sd: fixed(w.log10StdDev, 3),
    hydro_unit: utf8Bytes(w.hydroUnit ?? ''),
    aquifer: w.aquiferCondition,
    status: w.status,
    ground_m: fixed(w.groundElevationM, 3),
    scr_top_m: fixed(w.screenTopElevationM, 3),
    scr_bot_m: fixed(w.screenBottomElevationM, 3),
  }));
  const files = await new Promise<{ shp: DataView; shx: DataView; dbf: DataView }>((resolve, reject) =>
    shpwrite.write(rows, 'POINT', wells.map((w) => [w.siteX, w.siteY]), (err, f) => (err ? reject(err) : resolve(f))),
  );
  const zip = new JSZip();
  const b = meta.baseName;
  const bytes = (v: DataView) => new Uint8Array(v.buffer, v.byteOffset, v.byteLength);
  zip.file(`${b}.shp`, bytes(files.shp));
  zip.file(`${b}.shx`, bytes(files.shx));
  zip.file(`${b}.dbf`, bytes(files.dbf));
  zip.file(`${b}.prj`, meta.prjWkt);
  zip.file(`${b}.cpg`, 'UTF-8');
  zip.file(
    'README.txt',
    [
      `${meta.site}: monitoring wells with Well K, exported by Kfield.`,
      `Points in EPSG:${meta.crs.epsgCode} (${meta.crs.name}); ${b}.prj holds the system's WKT.`,
      'Well K is the geometric mean of the well\'s Checked fits (SI: m/s). Fields:',
      ...SHAPEFILE_FIELDS.map(([f, d]) => `  ${f.padEnd(10)} ${d}`),
      '',
      'Cautions:',
      ...meta.cautions.map((c) => `- ${c}`),
      '',
    ].join('\r\n'),
  );
  return zip.generateAsync({ type: 'nodebuffer', compression: 'DEFLATE' });
}
