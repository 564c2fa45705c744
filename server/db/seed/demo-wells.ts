import proj4 from 'proj4';
import type { EntityManager } from 'typeorm';
import type { AquiferCondition, WellFields, WellStatus } from '@shared/schemas/wells';
import { wellInputSchema } from '@shared/schemas/wells';
import type { Site } from '../../features/sites/site.entity';
import { lookupCrs } from '../../features/sites/crs';
import { Well } from '../../features/wells/well.entity';
import { buildWellRow } from '../../features/wells/wells.service';

/*
 * The demo site's monitoring wells. Everything here is invented: no real site, well or data.
 * A fictional former fuel depot on EPSG:32632 around easting 512000, northing 5290000: a
 * sand-and-gravel aquifer about 12 m thick over silt, a buried higher-K gravel channel crossing
 * the site from south-west to north-east, 2-inch and 4-inch wells with 3–6 m screens, and four
 * deeper wells screened in the silt. Lengths in metres, depths below ground, static water
 * depth below the measuring point.
 */
type DemoWellRow = [
  name: string, easting: number, northing: number, groundElevationM: number, measuringPointElevationM: number,
  screenTopDepthM: number, screenBottomDepthM: number, casingRadiusM: number, boreholeRadiusM: number,
  hydroUnit: string, aquiferCondition: AquiferCondition, saturatedThicknessM: number, staticWaterDepthM: number,
  status: WellStatus, notes: string,
];

export const DEMO_WELL_ROWS: readonly DemoWellRow[] = [
  ['MW-01', 511619.65, 5289749.43, 142.1, 142.88, 1.7, 4.75, 0.0508, 0.127, 'Sand and gravel', 'unconfined', 9.79, 3.48, 'active', ''],
  ['MW-02', 511738.46, 5289700.69, 141.8, 142.61, 3.29, 6.34, 0.0254, 0.1016, 'Sand and gravel', 'unconfined', 9.74, 3.31, 'decommissioned', 'Decommissioned and grouted; kept for the record.'],
  ['MW-03', 511877.54, 5289721.83, 141.57, 142.42, 1.29, 5.86, 0.0254, 0.1016, 'Sand and gravel', 'unconfined', 9.7, 3.19, 'active', ''],
  ['MW-04', 512017.05, 5289692.65, 141.27, 141.19, 2.81, 7.38, 0.0254, 0.1016, 'Sand and gravel', 'unconfined', 9.61, 2.04, 'active', 'Flush-mount vault in the former tanker yard.'],
  ['MW-05', 512167.09, 5289742.99, 141.11, 142.04, 0.79, 3.84, 0.0254, 0.1016, 'Sand and gravel', 'unconfined', 9.58, 2.91, 'active', ''],
  ['MW-06', 512317.64, 5289782.81, 140.95, 141.9, 2.36, 5.41, 0.0254, 0.1016, 'Sand and gravel', 'unconfined', 9.57, 2.79, 'inactive', 'Casing bent by a delivery truck; not tested since.'],
  ['MW-07', 511598.6, 5289942.13, 142.23, 143.18, 4.79, 10.89, 0.0254, 0.1016, 'Buried channel gravel', 'unconfined', 9.39, 3.6, 'active', ''],
  ['MW-08', 511729.82, 5289891.08, 142.01, 142.94, 4.51, 9.08, 0.0508, 0.127, 'Buried channel gravel', 'unconfined', 9.41, 3.41, 'active', 'Coarse gravel from 4.5 m; screened in the buried channel.'],
  ['MW-09', 511851.06, 5289959.83, 142.01, 141.93, 1.08, 5.65, 0.0254, 0.1016, 'Sand and gravel', 'unconfined', 9.53, 2.4, 'active', 'Flush-mount vault beside the pump island.'],
  ['MW-10', 511972.12, 5289908.62, 141.82, 142.68, 4.43, 9, 0.0254, 0.1016, 'Buried channel gravel', 'unconfined', 9.63, 3.22, 'active', ''],
  ['MW-11', 512112.81, 5289977.65, 141.8, 141.72, 1.06, 4.11, 0.0254, 0.1016, 'Sand and gravel', 'unconfined', 9.81, 2.3, 'active', 'Flush-mount vault in the access road.'],
  ['MW-12', 512252.99, 5290107.09, 141.85, 142.63, 4.86, 9.43, 0.0508, 0.127, 'Buried channel gravel', 'unconfined', 10.02, 3.24, 'active', ''],
  ['MW-13', 512392.65, 5290077.05, 141.63, 142.39, 4.96, 11.06, 0.0254, 0.1016, 'Buried channel gravel', 'unconfined', 10.14, 3.11, 'active', 'Screened in the buried channel near the river bank.'],
  ['MW-14', 511671.84, 5290117.53, 142.7, 143.45, 3.79, 6.84, 0.0254, 0.1016, 'Sand and gravel', 'unconfined', 10.01, 3.82, 'active', ''],
  ['MW-15', 511810.71, 5290168.44, 142.55, 143.31, 1.98, 6.55, 0.0508, 0.127, 'Sand and gravel', 'unconfined', 10.08, 3.77, 'active', ''],
  ['MW-16', 511939.45, 5290109.64, 142.22, 142.14, 3.6, 8.17, 0.0254, 0.1016, 'Sand and gravel', 'unconfined', 10.06, 2.72, 'active', 'Flush-mount vault in the car park.'],
  ['MW-17', 512078.29, 5290150.89, 142.03, 142.85, 5.65, 11.75, 0.0254, 0.1016, 'Buried channel gravel', 'unconfined', 10.05, 3.5, 'active', ''],
  ['MW-18', 512217.43, 5290201.99, 141.85, 142.71, 3.29, 6.34, 0.0254, 0.1016, 'Sand and gravel', 'unconfined', 10.02, 3.41, 'active', ''],
  ['MW-19', 512347.02, 5290252.74, 141.7, 142.6, 1.31, 4.36, 0.0254, 0.1016, 'Sand and gravel', 'unconfined', 9.97, 3.33, 'active', 'Located by hand-held GPS (latitude/longitude).'],
  ['MW-20', 511987.14, 5290303, 142.25, 143.18, 3.34, 7.91, 0.0508, 0.127, 'Sand and gravel', 'unconfined', 9.79, 3.68, 'active', 'Located by hand-held GPS (latitude/longitude).'],
  ['MW-03D', 511881.54, 5289720.33, 141.57, 142.44, 14.29, 17.34, 0.0254, 0.1016, 'Silt', 'confined', 7.5, 3.54, 'active', 'Screened in the silt below the sand and gravel.'],
  ['MW-09D', 511855.06, 5289958.33, 142.01, 141.95, 13.8, 16.85, 0.0254, 0.1016, 'Silt', 'confined', 7.5, 2.75, 'active', 'Screened in the silt below the sand and gravel.'],
  ['MW-14D', 511675.84, 5290116.03, 142.7, 143.47, 15.09, 18.14, 0.0254, 0.1016, 'Silt', 'confined', 7.5, 4.17, 'active', 'Screened in the silt below the sand and gravel.'],
  ['MW-19D', 512351.02, 5290251.24, 141.7, 142.62, 14.61, 17.66, 0.0254, 0.1016, 'Silt', 'confined', 7.5, 3.68, 'active', 'Screened in the silt below the sand and gravel.'],
];

/** Wells whose position was entered as latitude/longitude (a hand-held GPS), to show both kinds of input. */
const ENTERED_AS_LATLON = new Set(['MW-19', 'MW-20']);

export const DEMO_ORIGIN = { easting: 512000, northing: 5290000 };

/** The sinuous centreline of the invented buried channel, northing offset from the origin (m) at an easting offset u. */
const channelCentre = (u: number) => 0.45 * u + 90 * Math.sin((2 * Math.PI * u) / 520);
const channelSlope = (u: number) => 0.45 + 90 * ((2 * Math.PI) / 520) * Math.cos((2 * Math.PI * u) / 520);
const CHANNEL_HALF_WIDTH_M = 55;

/** 0 outside the invented channel, 1 along its middle: a flat-topped profile, exp(−(d/55 m)⁴), across it. */
export function demoChannelWeight(siteX: number, siteY: number): number {
  const u = siteX - DEMO_ORIGIN.easting;
  const v = siteY - DEMO_ORIGIN.northing;
  const across = Math.abs(v - channelCentre(u)) / Math.sqrt(1 + channelSlope(u) ** 2);
  return Math.exp(-((across / CHANNEL_HALF_WIDTH_M) ** 4));
}

/**
 * The invented "true" hydraulic conductivity (m/s) at a point of the demo site, for generating
 * demo records: sand and gravel about 1e-5 to 5e-5 m/s, rising to 5e-4 to 1e-3 m/s along the
 * buried channel; the silt about 1e-7 m/s. Blended in log10 K across the channel's edge.
 */
export function demoTrueK(siteX: number, siteY: number, hydroUnit: string | null): number {
  const u = siteX - DEMO_ORIGIN.easting;
  const v = siteY - DEMO_ORIGIN.northing;
  if (hydroUnit?.toLowerCase() === 'silt') return 10 ** (-7 + 0.15 * Math.sin(u / 170) * Math.cos(v / 130));
  const sand = -4.65 + 0.35 * Math.sin(u / 230 + 0.7) * Math.cos(v / 190 - 0.4);
  const channel = -3.15 + 0.15 * Math.sin(u / 140);
  const w = demoChannelWeight(siteX, siteY);
  return 10 ** (sand + w * (channel - sand));
}

const metres = (value: number) => ({ value, unit: 'm' as const });

/** The demo wells as form input in metres, as a user would enter them. */
export function demoWellInputs(siteEpsg: number): WellFields[] {
  const crs = lookupCrs(siteEpsg);
  return DEMO_WELL_ROWS.map(([name, x, y, ground, mp, top, bottom, rc, rb, hydroUnit, aquiferCondition, sat, swd, status, notes]) => {
    let coordinates: WellFields['coordinates'] = { kind: 'epsg', epsg: siteEpsg, x, y };
    if (ENTERED_AS_LATLON.has(name) && crs) {
      const [lon, lat] = proj4(crs.proj4, 'WGS84', [x, y]);
      coordinates = { kind: 'latlon', lat: Number(lat.toFixed(7)), lon: Number(lon.toFixed(7)) };
    }
    return {
      name,
      coordinates,
      groundElevation: metres(ground),
      measuringPointElevation: metres(mp),
      screenReference: 'depth',
      screenTop: metres(top),
      screenBottom: metres(bottom),
      casingRadius: metres(rc),
      screenRadius: metres(rc),
      boreholeRadius: metres(rb),
      filterPackPorosity: 0.3,
      hydroUnit,
      aquiferCondition,
      saturatedThickness: metres(sat),
      staticWaterDepth: metres(swd),
      staticToScreenBottom: null,
      status,
      notes: `Invented demo well. ${notes}`.trim(),
    };
  });
}

/** Add the demo wells to the demo site, through the same checks as any well. */
export async function seedDemoWells(m: EntityManager, site: Site): Promise<number> {
  const repo = m.getRepository(Well);
  for (const input of demoWellInputs(site.epsgCode)) {
    const built = buildWellRow(site, wellInputSchema.parse(input), true);
    if (!built.ok) throw new Error(`demo well ${input.name}: ${JSON.stringify(built.fields)}`);
    await repo.insert(built.row);
  }
  return DEMO_WELL_ROWS.length;
}
