import fs from 'node:fs';
import path from 'node:path';
import proj4 from 'proj4';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_WELL_ROWS } from '../../server/db/seed/demo-wells';
import { Membership } from '../../server/features/sites/membership.entity';
import { User } from '../../server/features/users/user.entity';
import { Well } from '../../server/features/wells/well.entity';
import type { ApiClient } from '../support/test-server';
import { demoEmail, startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
let analyst: ApiClient;
let admin: ApiClient;
let analystId = '';
beforeAll(async () => {
  ts = await startTestServer();
  analyst = await ts.as(demoEmail('Analyst'));
  admin = await ts.as(demoEmail('Admin'));
  analystId = (await ts.ds.getRepository(User).findOneByOrFail({ email: demoEmail('Analyst') })).id;
});
afterAll(async () => ts.close());

const FIXTURE = fs.readFileSync(path.resolve(__dirname, '../fixtures/demo-wells.csv'), 'utf8');
const m = (value: number) => ({ value, unit: 'm' });

/** A valid well in metres, in EPSG:32632, near the demo site; fields replaced by `over`. */
const wellBody = (over: Record<string, unknown> = {}) => ({
  name: 'TW-1',
  coordinates: { kind: 'epsg', epsg: 32632, x: 512100, y: 5290050 },
  groundElevation: m(100),
  measuringPointElevation: m(100.8),
  screenReference: 'depth',
  screenTop: m(3),
  screenBottom: m(6),
  casingRadius: m(0.0254),
  screenRadius: m(0.0254),
  boreholeRadius: m(0.1016),
  filterPackPorosity: 0.3,
  hydroUnit: 'Sand',
  aquiferCondition: 'unconfined',
  saturatedThickness: m(10),
  staticWaterDepth: m(2.8),
  status: 'active',
  notes: '',
  ...over,
});

let siteCount = 0;
/** A fresh site led by the demo Analyst (only Admins create sites by default: the Admin creates it, the Analyst is made its Lead). */
async function newSite(over: Record<string, unknown> = {}): Promise<string> {
  siteCount++;
  const r = await admin.post('/api/sites', { name: `Wells test ${siteCount}`, epsgCode: 32632, displayUnits: 'SI', hydroUnits: ['Sand', 'Silt', 'Sand and gravel', 'Buried channel gravel'], ...over });
  expect(r.status).toBe(201);
  await ts.ds.getRepository(Membership).insert({ siteId: r.body.id, userId: analystId, role: 'Lead' });
  return r.body.id;
}

const wellCount = (siteId: string) => ts.ds.getRepository(Well).count({ where: { siteId } });

const latLonSettings = {
  mapping: {
    name: 'Well', lat: 'Latitude', lon: 'Longitude', groundElevation: 'Ground elevation (ft)', measuringPointElevation: 'TOC elevation (ft)',
    screenTop: 'Screen top (ft bgs)', screenBottom: 'Screen bottom (ft bgs)', casingRadius: 'Casing radius (in)', screenRadius: 'Screen radius (in)',
    boreholeRadius: 'Borehole radius (in)', filterPackPorosity: 'Porosity', hydroUnit: 'Unit', aquiferCondition: 'Condition',
    saturatedThickness: 'Saturated thickness (ft)', staticWaterDepth: 'DTW (ft below TOC)', status: 'Status', notes: 'Notes',
  },
  units: { elevation: 'ft', depth: 'ft', radius: 'in' },
  screenReference: 'depth',
  coordinates: { kind: 'latlon' },
};

const simpleHeader = 'name,x,y,ground,toc,top,bottom,rc,rs,rb';
const simpleSettings = {
  mapping: { name: 'name', x: 'x', y: 'y', groundElevation: 'ground', measuringPointElevation: 'toc', screenTop: 'top', screenBottom: 'bottom', casingRadius: 'rc', screenRadius: 'rs', boreholeRadius: 'rb' },
  units: { elevation: 'm', depth: 'm', radius: 'm' },
  screenReference: 'depth',
  coordinates: { kind: 'epsg', epsg: 32632 },
};
const simpleRow = (name: string, over: Partial<Record<'x' | 'y' | 'top' | 'bottom', string>> = {}) =>
  [name, over.x ?? '512000', over.y ?? '5290000', '100', '100.5', over.top ?? '2', over.bottom ?? '5', '0.0254', '0.0254', '0.1016'].join(',');

describe('wells: list and read', () => {
  it("lists the demo site's 24 invented wells by name, in SI, to any member", async () => {
    const viewer = await ts.as(demoEmail('Viewer'));
    const r = await viewer.get(`/api/sites/${ts.demoSiteId}/wells`).expect(200);
    expect(r.body.wells).toHaveLength(24);
    expect(r.body.wells.slice(0, 3).map((w: { name: string }) => w.name)).toEqual(['MW-01', 'MW-02', 'MW-03']);
    const mw08 = r.body.wells.find((w: { name: string }) => w.name === 'MW-08');
    expect(mw08).toMatchObject({ hydroUnit: 'Buried channel gravel', casingRadiusM: 0.0508, screenTopDepthM: 4.51, isDemo: true });
    expect(mw08.notes).toMatch(/^Invented demo well/);
  });

  it('reads one well, and answers 404 for a well that does not exist or belongs to a site I am not in', async () => {
    const list = (await analyst.get(`/api/sites/${ts.demoSiteId}/wells`)).body.wells;
    const r = await analyst.get(`/api/wells/${list[0].id}`).expect(200);
    expect(r.body.name).toBe(list[0].name);
    expect((await analyst.get('/api/wells/6f1c1c1e-0000-4000-8000-000000000000')).status).toBe(404);
    const siteId = await newSite();
    const own = (await analyst.post(`/api/sites/${siteId}/wells`, wellBody()).expect(201)).body;
    const checker = await ts.as(demoEmail('Checker'));
    const hidden = await checker.get(`/api/wells/${own.id}`);
    expect(hidden.status).toBe(404);
    expect(hidden.body.error.message).toBe('The site was not found');
  });
});

describe('wells: create', () => {
  it('stores feet and inches as metres with the exact factors (1 ft = 0.3048 m, 1 in = 0.0254 m; NIST SP 811)', async () => {
    const siteId = await newSite({ displayUnits: 'US' });
    const ft = (value: number) => ({ value, unit: 'ft' });
    const inch = (value: number) => ({ value, unit: 'in' });
    const r = await analyst.post(`/api/sites/${siteId}/wells`, wellBody({
      groundElevation: ft(500), measuringPointElevation: ft(502.5), screenTop: ft(10), screenBottom: ft(20),
      casingRadius: inch(1), screenRadius: inch(1), boreholeRadius: inch(4), saturatedThickness: ft(30), staticWaterDepth: ft(1),
    }));
    expect(r.status).toBe(201);
    expect(r.body.groundElevationM).toBe(152.4);
    expect(r.body.staticWaterDepthM).toBe(0.3048);
    expect(r.body.screenTopDepthM).toBe(3.048);
    expect(r.body.screenBottomDepthM).toBeCloseTo(6.096, 12);
    expect(r.body.screenTopElevationM).toBeCloseTo(152.4 - 3.048, 12);
    expect(r.body.casingRadiusM).toBe(0.0254);
    expect(r.body.boreholeRadiusM).toBe(0.1016);
  });

  it('accepts the screen as elevations and stores both depths and elevations', async () => {
    const siteId = await newSite();
    const r = await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ screenReference: 'elevation', screenTop: m(97), screenBottom: m(92.5) })).expect(201);
    expect(r.body).toMatchObject({ screenTopDepthM: 3, screenBottomDepthM: 7.5, screenTopElevationM: 97, screenBottomElevationM: 92.5, screenLengthM: 4.5 });
  });

  it('derives the static level to screen bottom (Lw) from the static water depth, or keeps a given one', async () => {
    const siteId = await newSite();
    // Measuring point 100.8 m, static 2.8 m below it → water at 98 m; screen bottom 6 m below ground at 100 m → 94 m; Lw = 4 m.
    const derived = (await analyst.post(`/api/sites/${siteId}/wells`, wellBody()).expect(201)).body;
    expect(derived.staticToScreenBottomM).toBeCloseTo(4, 12);
    expect(derived.staticToScreenBottomDerived).toBe(true);
    const given = (await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ name: 'TW-2', staticToScreenBottom: m(3.5) })).expect(201)).body;
    expect(given.staticToScreenBottomM).toBe(3.5);
    expect(given.staticToScreenBottomDerived).toBe(false);
  });

  it('puts latitude/longitude into the site system: 45°N on the central meridian of UTM zone 32N', async () => {
    const siteId = await newSite();
    const r = await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ coordinates: { kind: 'latlon', lat: 45, lon: 9 } })).expect(201);
    expect(r.body).toMatchObject({ inputEpsg: 4326, inputX: 9, inputY: 45, lon: 9, lat: 45 });
    // On the central meridian the UTM easting is the false easting, 500 000 m, by definition.
    expect(r.body.siteX).toBeCloseTo(500000, 2);
    // Northing = 0.9996 × meridian arc from the equator to 45° on WGS 84 (4 984 944.38 m) = 4 982 950.40 m (from memory).
    expect(Math.abs(r.body.siteY - 4982950.4)).toBeLessThan(0.05);
  });

  it('keeps coordinates entered in another EPSG system as entered, with WGS 84 and site coordinates from proj4', async () => {
    const siteId = await newSite();
    const r = await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ coordinates: { kind: 'epsg', epsg: 25832, x: 512100, y: 5290050 } })).expect(201);
    expect(r.body).toMatchObject({ inputEpsg: 25832, inputX: 512100, inputY: 5290050 });
    // ETRS89 and WGS 84 share the UTM zone 32N grid to well under a metre in proj4 (towgs84 zero).
    expect(Math.abs(r.body.siteX - 512100)).toBeLessThan(0.01);
    expect(Math.abs(r.body.siteY - 5290050)).toBeLessThan(0.01);
    // Round trip: proj4 from the stored WGS 84 position back to the entered system.
    const [x, y] = proj4('+proj=utm +zone=32 +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=m +no_defs', [r.body.lon, r.body.lat]);
    expect(Math.abs(x - 512100)).toBeLessThan(1e-4);
    expect(Math.abs(y - 5290050)).toBeLessThan(1e-4);
  });

  it('refuses coordinates outside the chosen system’s area of use, and swapped easting/northing, saving nothing', async () => {
    const siteId = await newSite();
    const nyc = await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ coordinates: { kind: 'latlon', lat: 40.7, lon: -74.0 } }));
    expect(nyc.status).toBe(400);
    expect(nyc.body.error.fields.coordinates).toMatch(/outside the area of use of the site's system EPSG:32632/);
    const swapped = await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ coordinates: { kind: 'epsg', epsg: 32632, x: 5290050, y: 512100 } }));
    expect(swapped.status).toBe(400);
    expect(swapped.body.error.fields.coordinates).toMatch(/outside the area of use of EPSG:32632.*swapped/);
    const unknown = await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ coordinates: { kind: 'epsg', epsg: 99999, x: 1, y: 1 } }));
    expect(unknown.body.error.fields['coordinates.epsg']).toMatch(/Unknown EPSG code 99999/);
    const geocentric = await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ coordinates: { kind: 'epsg', epsg: 4978, x: 1, y: 1 } }));
    expect(geocentric.body.error.fields['coordinates.epsg']).toMatch(/geocentric/);
    expect(await wellCount(siteId)).toBe(0);
  });

  it.each([
    [{ name: '  ' }, 'name', /Name is required/],
    [{ name: 'x'.repeat(81) }, 'name', /at most 80/],
    [{ screenTop: m(6), screenBottom: m(3) }, 'screenBottom', /below the screen top/],
    [{ screenReference: 'elevation', screenTop: m(95), screenBottom: m(97) }, 'screenBottom', /below the screen top \(a lower elevation\)/],
    [{ screenReference: 'elevation', screenTop: m(101), screenBottom: m(95) }, 'screenTop', /at or below the ground surface/],
    [{ screenTop: m(-1) }, 'screenTop', /cannot be negative/],
    [{ casingRadius: m(0) }, 'casingRadius', /Casing radius must be greater than zero/],
    [{ screenRadius: m(-0.02) }, 'screenRadius', /Screen radius must be greater than zero/],
    [{ boreholeRadius: m(0.02) }, 'boreholeRadius', /at least the screen radius/],
    [{ casingRadius: { value: 2, unit: 'm' } }, 'casingRadius', /at most 1 m .*diameter/],
    [{ filterPackPorosity: 1 }, 'filterPackPorosity', /between 0 and 1/],
    [{ filterPackPorosity: 0 }, 'filterPackPorosity', /between 0 and 1/],
    [{ measuringPointElevation: m(105) }, 'measuringPointElevation', /within 1 m below to 3 m above the ground surface; it is 5 m above/],
    [{ measuringPointElevation: m(98) }, 'measuringPointElevation', /2 m below/],
    [{ groundElevation: { value: 100, unit: 'yd' } }, 'groundElevation.unit', /m, cm, mm, ft or in/],
    [{ groundElevation: { value: 'abc', unit: 'm' } }, 'groundElevation.value', /Ground elevation must be a number/],
    [{ groundElevation: { unit: 'm' } }, 'groundElevation.value', /Ground elevation is required/],
    [{ hydroUnit: 'Limestone' }, 'hydroUnit', /"Limestone" is not one of this site's: Sand, Silt/],
    [{ aquiferCondition: 'artesian' }, 'aquiferCondition', /confined, unconfined or leaky/],
    [{ status: 'lost' }, 'status', /active, inactive or decommissioned/],
    [{ staticWaterDepth: m(8) }, 'staticWaterDepth', /above the screen bottom/],
    [{ staticWaterDepth: m(-1) }, 'staticWaterDepth', /cannot be negative/],
    [{ staticToScreenBottom: m(0) }, 'staticToScreenBottom', /greater than zero/],
    [{ saturatedThickness: m(3) }, 'saturatedThickness', /at least the static level to screen bottom distance \(4 m\)/],
    [{ coordinates: { kind: 'latlon', lat: 95, lon: 9 } }, 'coordinates.lat', /between −90 and 90/],
    [{ coordinates: { kind: 'utm', x: 1, y: 2 } }, 'coordinates.kind', /EPSG system or as latitude\/longitude/],
  ])('refuses bad input %# naming the field (%s)', async (over, field, message) => {
    const siteId = await newSite();
    const r = await analyst.post(`/api/sites/${siteId}/wells`, wellBody(over));
    expect(r.status).toBe(400);
    expect(r.body.error.fields?.[field], JSON.stringify(r.body.error)).toMatch(message);
    expect(await wellCount(siteId)).toBe(0);
  });

  it('refuses a second well of the same name on a site, whatever its case (409)', async () => {
    const siteId = await newSite();
    await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ name: 'MW-1' })).expect(201);
    const r = await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ name: 'mw-1' }));
    expect(r.status).toBe(409);
    expect(r.body.error.fields.name).toMatch(/A well named MW-1 already exists/);
    const other = await newSite();
    await analyst.post(`/api/sites/${other}/wells`, wellBody({ name: 'MW-1' })).expect(201);
  });

  it('lets only a Lead or Analyst add a well', async () => {
    for (const role of ['Viewer', 'Checker'] as const) {
      const c = await ts.as(demoEmail(role));
      expect((await c.post(`/api/sites/${ts.demoSiteId}/wells`, wellBody({ name: `By ${role}` }))).status).toBe(403);
    }
    const lead = await ts.as(demoEmail('Lead'));
    await lead.post(`/api/sites/${ts.demoSiteId}/wells`, wellBody({ name: 'By Lead', hydroUnit: 'Silt' })).expect(201);
  });
});

describe('wells: change and delete', () => {
  it('changes some fields and checks the changed well as a whole', async () => {
    const siteId = await newSite();
    const w = (await analyst.post(`/api/sites/${siteId}/wells`, wellBody()).expect(201)).body;
    const r = await analyst.patch(`/api/wells/${w.id}`, { status: 'inactive', notes: 'Cap missing', screenBottom: { value: 700, unit: 'cm' } }).expect(200);
    expect(r.body).toMatchObject({ status: 'inactive', notes: 'Cap missing', screenBottomDepthM: 7, screenTopDepthM: 3, groundElevationM: 100 });
    // Lw followed the new screen bottom: 98 − 93 = 5 m.
    expect(r.body.staticToScreenBottomM).toBeCloseTo(5, 12);
    const bad = await analyst.patch(`/api/wells/${w.id}`, { screenTop: m(8) });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.screenBottom).toMatch(/below the screen top/);
    const byElevation = await analyst.patch(`/api/wells/${w.id}`, { screenReference: 'elevation', screenTop: m(98) }).expect(200);
    expect(byElevation.body).toMatchObject({ screenTopDepthM: 2, screenBottomDepthM: 7 });
    const moved = await analyst.patch(`/api/wells/${w.id}`, { coordinates: { kind: 'latlon', lat: 40.7, lon: -74 } });
    expect(moved.body.error.fields.coordinates).toMatch(/outside the area of use/);
    expect((await analyst.get(`/api/wells/${w.id}`)).body).toMatchObject({ status: 'inactive', screenTopDepthM: 2, siteX: 512100 });
  });

  it('refuses a rename onto another well’s name, and lets only a Lead or Analyst change a well', async () => {
    const siteId = await newSite();
    await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ name: 'A' })).expect(201);
    const b = (await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ name: 'B' })).expect(201)).body;
    const r = await analyst.patch(`/api/wells/${b.id}`, { name: 'a' });
    expect(r.status).toBe(409);
    expect(r.body.error.fields.name).toMatch(/already exists/);
    await analyst.patch(`/api/wells/${b.id}`, { name: 'b' }).expect(200);
    const demo = (await analyst.get(`/api/sites/${ts.demoSiteId}/wells`)).body.wells[0];
    for (const role of ['Viewer', 'Checker'] as const) {
      const c = await ts.as(demoEmail(role));
      expect((await c.patch(`/api/wells/${demo.id}`, { notes: 'changed' })).status).toBe(403);
      expect((await c.delete(`/api/wells/${demo.id}`)).status).toBe(403);
    }
  });

  it('deletes a well without records, and refuses one with records (409)', async () => {
    const siteId = await newSite();
    const a = (await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ name: 'A' })).expect(201)).body;
    await analyst.delete(`/api/wells/${a.id}`).expect(204);
    expect((await analyst.get(`/api/wells/${a.id}`)).status).toBe(404);
    const b = (await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ name: 'B' })).expect(201)).body;
    // Invented tape readings: depth to water below the measuring point, in metres.
    const readings = [[0, 4.2], [5, 3.6], [10, 3.2], [20, 2.95], [40, 2.85], [80, 2.81]].map(([time, depth]) => ({ time, depth }));
    await analyst.post(`/api/wells/${b.id}/records`, { testType: 'slug-out', readings, timeFormat: 's', units: 'm', static: 2.8 }).expect(201);
    const r = await analyst.delete(`/api/wells/${b.id}`);
    expect(r.status).toBe(409);
    expect(r.body.error.message).toMatch(/Well B has 1 record; delete it first/);
    expect((await analyst.get(`/api/wells/${b.id}`)).status).toBe(200);
  });

  it("re-expresses the wells when the site changes its system, and refuses a system they fall outside", async () => {
    const siteId = await newSite();
    const w = (await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ coordinates: { kind: 'latlon', lat: 47.76, lon: 9.16 } })).expect(201)).body;
    await analyst.patch(`/api/sites/${siteId}`, { epsgCode: 3035 }).expect(200); // ETRS89-extended / LAEA Europe
    const moved = (await analyst.get(`/api/wells/${w.id}`)).body;
    expect(Math.abs(moved.siteX - w.siteX)).toBeGreaterThan(1000);
    expect(moved.lat).toBe(47.76);
    const refused = await analyst.patch(`/api/sites/${siteId}`, { epsgCode: 27700 });
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields.epsgCode).toMatch(/TW-1 lies outside the area of use of EPSG:27700/);
    expect((await analyst.get(`/api/sites/${siteId}`)).body.epsgCode).toBe(3035);
    expect((await analyst.get(`/api/wells/${w.id}`)).body.siteX).toBe(moved.siteX);
  });
});

describe('wells: CSV import', () => {
  const importUrl = (siteId: string, dryRun = false) => `/api/sites/${siteId}/wells/import${dryRun ? '?dryRun=true' : ''}`;

  it('dry-runs the demo wells file (US units, latitude/longitude) with no problems and saves nothing', async () => {
    const siteId = await newSite({ displayUnits: 'US' });
    const r = await analyst.post(importUrl(siteId, true), { ...latLonSettings, csv: FIXTURE });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ dryRun: true, delimiter: ',', rowCount: 24, validCount: 24, problems: [], importedCount: 0 });
    expect(r.body.header[0]).toBe('Well');
    expect(await wellCount(siteId)).toBe(0);
  });

  it('imports the demo wells file into the same wells as the demo seed (feet → metres, lat/lon → UTM)', async () => {
    const siteId = await newSite({ displayUnits: 'US' });
    const r = await analyst.post(importUrl(siteId), { ...latLonSettings, csv: FIXTURE });
    expect(r.status, JSON.stringify(r.body.error)).toBe(201);
    expect(r.body.importedCount).toBe(24);
    const byName = new Map((r.body.wells as { name: string }[]).map((w) => [w.name, w as unknown as Record<string, number>]));
    for (const [name, x, y, ground, mp, top, bottom, rc, rb] of DEMO_WELL_ROWS) {
      const w = byName.get(name)!;
      // Latitude/longitude written with 8 decimals (about 1 mm) and feet with 4 (0.03 mm).
      expect(Math.abs(w.siteX - x), name).toBeLessThan(0.01);
      expect(Math.abs(w.siteY - y), name).toBeLessThan(0.01);
      for (const [got, want] of [[w.groundElevationM, ground], [w.measuringPointElevationM, mp], [w.screenTopDepthM, top], [w.screenBottomDepthM, bottom]]) {
        expect(Math.abs(got - want), name).toBeLessThan(1e-4);
      }
      expect(w.casingRadiusM).toBeCloseTo(rc, 12);
      expect(w.boreholeRadiusM).toBeCloseTo(rb, 12);
    }
    expect(await wellCount(siteId)).toBe(24);
  });

  it('reports names already used by existing wells and by earlier lines as row problems', async () => {
    const siteId = await newSite();
    await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ name: 'MW-2' })).expect(201);
    const csv = [simpleHeader, simpleRow('MW-1'), simpleRow('mw-2'), simpleRow('MW-3'), simpleRow('MW-1 ')].join('\n');
    const r = await analyst.post(importUrl(siteId, true), { ...simpleSettings, csv }).expect(200);
    expect(r.body.problems).toEqual([
      { line: 3, field: 'name', message: 'Line 3: the name mw-2 is already used by an existing well (MW-2)' },
      { line: 5, field: 'name', message: 'Line 5: the name MW-1 is already used by line 2' },
    ]);
    expect(r.body.validCount).toBe(2);
  });

  it('lists every row’s problems by line number in a dry run: malformed lines, non-numbers, construction, area of use', async () => {
    const siteId = await newSite();
    const csv = [
      simpleHeader,
      simpleRow('OK-1'),
      'BAD-2,512000,5290000,100',
      simpleRow('BAD-3', { top: 'abc' }),
      simpleRow('BAD-4', { top: '5', bottom: '2' }),
      '',
      simpleRow('BAD-6', { x: '5290000', y: '512000' }),
      simpleRow('OK-7'),
    ].join('\r\n');
    const r = await analyst.post(importUrl(siteId, true), { ...simpleSettings, csv }).expect(200);
    expect(r.body.problems.map((p: { line: number; field: string | null }) => [p.line, p.field])).toEqual([
      [3, null], [4, 'screenTop'], [5, 'screenBottom'], [7, 'coordinates'],
    ]);
    expect(r.body.problems[0].message).toBe('Line 3 has 4 values; the header has 10');
    expect(r.body.problems[1].message).toBe('Line 4: Screen top: "abc" is not a number');
    expect(r.body.problems[2].message).toMatch(/^Line 5: Screen bottom must be below the screen top/);
    expect(r.body.problems[3].message).toMatch(/^Line 7: .*swapped/);
    expect(r.body).toMatchObject({ rowCount: 6, validCount: 2 });
  });

  it('imports nothing when any row has a problem (all or nothing), naming each problem by line and field', async () => {
    const siteId = await newSite();
    const csv = [simpleHeader, simpleRow('A'), simpleRow('B'), simpleRow('C', { top: '5', bottom: '2' })].join('\n');
    const r = await analyst.post(importUrl(siteId), { ...simpleSettings, csv });
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('IMPORT_PROBLEMS');
    expect(r.body.error.message).toMatch(/1 problem in the file; nothing was imported/);
    expect(r.body.error.fields['lines.4.screenBottom']).toMatch(/below the screen top/);
    expect(await wellCount(siteId)).toBe(0);
  });

  it('rolls the whole import back when the database fails part-way (one transaction)', async () => {
    const siteId = await newSite();
    const csv = [simpleHeader, simpleRow('A'), simpleRow('B'), simpleRow('FAIL-HERE'), simpleRow('D')].join('\n');
    // A trigger that fails the third insert, after two rows have been written.
    await ts.ds.query(`CREATE TEMP TRIGGER fail_import BEFORE INSERT ON wells WHEN NEW.name = 'FAIL-HERE' BEGIN SELECT RAISE(ABORT, 'injected failure'); END`);
    try {
      const r = await analyst.post(importUrl(siteId), { ...simpleSettings, csv });
      expect(r.status).toBe(500);
    } finally {
      await ts.ds.query('DROP TRIGGER fail_import');
    }
    expect(await wellCount(siteId)).toBe(0);
    await analyst.post(importUrl(siteId), { ...simpleSettings, csv }).expect(201);
    expect(await wellCount(siteId)).toBe(4);
  });

  it('detects a semicolon delimiter and reads decimal commas', async () => {
    const siteId = await newSite();
    const csv = ['name;x;y;ground;toc;top;bottom;rc;rs;rb', 'S-1;512000,5;5290000;100,25;101;2,5;5,5;0,0254;0,0254;0,1016'].join('\n');
    const r = await analyst.post(importUrl(siteId), { ...simpleSettings, csv }).expect(201);
    expect(r.body.delimiter).toBe(';');
    expect(r.body.wells[0]).toMatchObject({ siteX: 512000.5, groundElevationM: 100.25, screenTopDepthM: 2.5, screenBottomDepthM: 5.5 });
  });

  it('takes the file as multipart form data with the settings as JSON', async () => {
    const siteId = await newSite({ displayUnits: 'US' });
    const r = await analyst.agent
      .post(importUrl(siteId, true))
      .set('x-csrf-token', analyst.csrf)
      .field('settings', JSON.stringify(latLonSettings))
      .attach('file', Buffer.from(FIXTURE, 'utf8'), { filename: 'demo-wells.csv', contentType: 'text/csv' });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.validCount).toBe(24);
  });

  it.each([
    ['an empty file', { csv: '' }, 'csv', /The file is empty/],
    ['a header without rows', { csv: simpleHeader }, 'csv', /header but no wells/],
    ['an unclosed quote', { csv: `${simpleHeader}\n"open,1,2` }, 'csv', /Line 2: a quoted value is not closed/],
    ['a file with NUL bytes', { csv: `${simpleHeader}\n\u0000\u0001` }, 'csv', /not text/],
    ['a mapping to a missing column', { mapping: { ...simpleSettings.mapping, groundElevation: 'Elev' } }, 'mapping.groundElevation', /Column "Elev" is not in the file's header/],
    ['a required field left unmapped', { mapping: { ...simpleSettings.mapping, name: undefined } }, 'mapping.name', /Choose the column that holds name/],
    ['an unknown field in the mapping', { mapping: { ...simpleSettings.mapping, colour: 'x' } }, 'mapping', /Unknown well field: colour/],
    ['an unknown unit', { units: { ...simpleSettings.units, depth: 'yd' } }, 'units.depth', /m, cm, mm, ft or in/],
    ['an unknown EPSG code', { coordinates: { kind: 'epsg', epsg: 99999 } }, 'coordinates.epsg', /Unknown EPSG code 99999/],
    ['an unknown delimiter', { delimiter: ':' }, 'delimiter', /comma, semicolon, tab or vertical bar/],
  ])('refuses %s with a clear message naming the field', async (_what, over, field, message) => {
    const siteId = await newSite();
    const body = { ...simpleSettings, csv: [simpleHeader, simpleRow('A')].join('\n'), ...over };
    const r = await analyst.post(importUrl(siteId, true), body);
    expect(r.status).toBe(400);
    expect(r.body.error.fields?.[field], JSON.stringify(r.body.error)).toMatch(message);
    expect(await wellCount(siteId)).toBe(0);
  });

  it('refuses a binary upload, malformed settings and a file over the limit', async () => {
    const siteId = await newSite();
    const post = () => analyst.agent.post(importUrl(siteId, true)).set('x-csrf-token', analyst.csrf);
    const binary = await post().field('settings', JSON.stringify(simpleSettings)).attach('file', Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x00, 0x00]), 'wells.xlsx');
    expect(binary.status).toBe(400);
    expect(binary.body.error.fields.file).toMatch(/not text/);
    const settings = await post().field('settings', '{mapping:').attach('file', Buffer.from('a,b\n1,2\n'), 'w.csv');
    expect(settings.status).toBe(400);
    expect(settings.body.error.fields.settings).toMatch(/not valid JSON/i);
    const none = await post().field('settings', JSON.stringify(simpleSettings));
    expect(none.status).toBe(400);
    expect(none.body.error.fields.file).toMatch(/Choose a CSV file/);
    const big = await post().field('settings', JSON.stringify(simpleSettings)).attach('file', Buffer.alloc(2 * 1024 * 1024 + 10, 'a'), 'big.csv');
    expect(big.status).toBe(413);
    expect(big.body.error.message).toMatch(/larger than the limit of 2097152 bytes/);
  });

  it('lets only a Lead or Analyst import', async () => {
    const viewer = await ts.as(demoEmail('Viewer'));
    const r = await viewer.post(importUrl(ts.demoSiteId, true), { ...simpleSettings, csv: [simpleHeader, simpleRow('A')].join('\n') });
    expect(r.status).toBe(403);
  });
});

describe('wells: CSV export', () => {
  it("exports in the site's display units with the unit in every header, and imports back to the same wells", async () => {
    const viewer = await ts.as(demoEmail('Viewer'));
    const r = await viewer.get(`/api/sites/${ts.demoSiteId}/wells.csv`).expect(200);
    expect(r.headers['content-type']).toMatch(/^text\/csv/);
    expect(r.headers['content-disposition']).toMatch(/attachment; filename=".*-wells\.csv"/);
    const [header, first] = r.text.split('\r\n');
    expect(header).toContain('easting (EPSG:32632)');
    expect(header).toContain('ground elevation (m)');
    expect(header).toContain('casing radius (m)');
    expect(r.text).toContain('\r\nMW-01,');
    expect(first.split(',')).toHaveLength(header.split(',').length);

    const siteId = await newSite();
    const { guessMapping } = await import('@shared/schemas/well-import');
    const mapping = guessMapping(header.split(','), 'epsg');
    expect(Object.keys(mapping)).toHaveLength(19); // every field but latitude and longitude
    const imported = await analyst.post(`/api/sites/${siteId}/wells/import`, {
      csv: r.text, mapping, units: { elevation: 'm', depth: 'm', radius: 'm' }, screenReference: 'depth', coordinates: { kind: 'epsg', epsg: 32632 },
    });
    expect(imported.status, JSON.stringify(imported.body.error)).toBe(201);
    const demo = (await viewer.get(`/api/sites/${ts.demoSiteId}/wells`)).body.wells;
    const back = imported.body.wells;
    expect(back.map((w: { name: string }) => w.name)).toEqual(demo.map((w: { name: string }) => w.name));
    for (let i = 0; i < demo.length; i++) {
      for (const k of ['siteX', 'siteY', 'groundElevationM', 'screenBottomElevationM', 'casingRadiusM', 'staticWaterDepthM', 'staticToScreenBottomM']) {
        expect(Math.abs(back[i][k] - demo[i][k]), `${demo[i].name} ${k}`).toBeLessThan(1e-3);
      }
      expect(back[i]).toMatchObject({ status: demo[i].status, hydroUnit: demo[i].hydroUnit, notes: demo[i].notes });
    }
  });

  it('writes feet and inches for a US site, and guards text cells against spreadsheet formulas', async () => {
    const siteId = await newSite({ displayUnits: 'US' });
    await analyst.post(`/api/sites/${siteId}/wells`, wellBody({ name: '=SUM(A1)', casingRadius: { value: 1, unit: 'in' }, groundElevation: { value: 500, unit: 'ft' }, measuringPointElevation: { value: 502, unit: 'ft' }, notes: 'say "hi", then go' })).expect(201);
    const r = await analyst.get(`/api/sites/${siteId}/wells.csv`).expect(200);
    const [header, row] = r.text.split('\r\n');
    expect(header).toContain('ground elevation (ft)');
    expect(header).toContain('casing radius (in)');
    const cells = row.split(',');
    expect(cells[0]).toBe("'=SUM(A1)");
    expect(cells[5]).toBe('500');
    expect(cells[11]).toBe('1');
    expect(row).toContain('"say ""hi"", then go"');
  });
});

describe('wells: OpenAPI', () => {
  it('documents every wells route with its summary and schemas', async () => {
    const doc = (await ts.client().get('/api/openapi.json').expect(200)).body;
    for (const [p, method] of [
      ['/api/sites/{siteId}/wells', 'get'], ['/api/sites/{siteId}/wells', 'post'], ['/api/sites/{siteId}/wells.csv', 'get'],
      ['/api/sites/{siteId}/wells/import', 'post'], ['/api/wells/{wellId}', 'get'], ['/api/wells/{wellId}', 'patch'], ['/api/wells/{wellId}', 'delete'],
    ]) {
      const op = doc.paths[p]?.[method];
      expect(op, `${method} ${p}`).toBeDefined();
      expect(op.summary.length).toBeGreaterThan(10);
    }
    expect(doc.paths['/api/sites/{siteId}/wells'].post.requestBody.content['application/json'].schema.properties.coordinates).toBeDefined();
    expect(doc.paths['/api/sites/{siteId}/wells/import'].post.parameters.map((p: { name: string }) => p.name)).toContain('dryRun');
  });
});
