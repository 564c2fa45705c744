import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hvorslevK } from '../../shared/hydraulics/hvorslev';
import { insertSyntheticRecord } from '../support/synthetic-record';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

let ts: TestServer;
let analyst: ApiClient, lead: ApiClient;
beforeAll(async () => {
  ts = await startTestServer();
  [analyst, lead] = await Promise.all([ts.as(demoEmail('Analyst')), ts.as(demoEmail('Lead'))]);
});
afterAll(async () => ts.close());

const m = (value: number) => ({ value, unit: 'm' });
let n = 0;
/** A well on the demo site: 2 in casing and screen in an 8 in borehole (a filter pack) unless `over` says otherwise. */
async function newWell(over: Record<string, unknown> = {}) {
  n++;
  const r = await lead.post(`/api/sites/${ts.demoSiteId}/wells`, {
    name: `IR-${n}`,
    coordinates: { kind: 'epsg', epsg: 32632, x: 512100 + n, y: 5290050 },
    groundElevation: m(100),
    measuringPointElevation: m(100.8),
    screenReference: 'depth',
    screenTop: m(3),
    screenBottom: m(6),
    casingRadius: m(0.0254),
    screenRadius: m(0.0254),
    boreholeRadius: m(0.1016),
    filterPackPorosity: null,
    hydroUnit: 'Sand and gravel',
    aquiferCondition: 'unconfined',
    saturatedThickness: m(10),
    staticWaterDepth: m(2.8),
    ...over,
  });
  expect(r.status).toBe(201);
  return r.body;
}

describe('the intake radius is set on the well', () => {
  it('defaults a new well with a filter pack to the borehole radius, and one without to the screen', async () => {
    expect((await newWell()).intakeRadius).toBe('borehole');
    expect((await newWell({ boreholeRadius: m(0.0254) })).intakeRadius).toBe('screen');
    expect((await newWell({ intakeRadius: 'screen' })).intakeRadius).toBe('screen');
  });

  it('is changed on the well and kept by changes that do not name it', async () => {
    const w = await newWell();
    const r = await lead.patch(`/api/wells/${w.id}`, { intakeRadius: 'screen' }).expect(200);
    expect(r.body.intakeRadius).toBe('screen');
    const r2 = await lead.patch(`/api/wells/${w.id}`, { notes: 'pack of fine sand' }).expect(200);
    expect(r2.body.intakeRadius).toBe('screen');
    const bad = await lead.patch(`/api/wells/${w.id}`, { intakeRadius: 'pack' }).expect(400);
    expect(bad.body.error.fields.intakeRadius).toMatch(/screen or the borehole/);
  });
});

describe('the wells CSV', () => {
  it('imports an intake radius column, defaults empty cells from the radii, refuses other words, and exports it', async () => {
    const header = 'name,x,y,ground,toc,top,bottom,rc,rs,rb,intake';
    const rows = ['CSV-1,512300,5290100,100,100.8,3,6,0.0254,0.0254,0.1016,screen', 'CSV-2,512310,5290100,100,100.8,3,6,0.0254,0.0254,0.1016,', 'CSV-3,512320,5290100,100,100.8,3,6,0.0254,0.0254,0.1016,pack'];
    const settings = {
      mapping: { name: 'name', x: 'x', y: 'y', groundElevation: 'ground', measuringPointElevation: 'toc', screenTop: 'top', screenBottom: 'bottom', casingRadius: 'rc', screenRadius: 'rs', boreholeRadius: 'rb', intakeRadius: 'intake' },
      units: { elevation: 'm', depth: 'm', radius: 'm' },
      screenReference: 'depth',
      coordinates: { kind: 'epsg', epsg: 32632 },
    };
    const r = await lead.post(`/api/sites/${ts.demoSiteId}/wells/import?dryRun=true`, { ...settings, csv: [header, ...rows].join('\n') }).expect(200);
    expect(r.body.problems).toEqual([expect.objectContaining({ line: 4, field: 'intakeRadius', message: expect.stringMatching(/"pack" is not one of screen, borehole/) })]);
    const ok = await lead.post(`/api/sites/${ts.demoSiteId}/wells/import`, { ...settings, csv: [header, ...rows.slice(0, 2)].join('\n') }).expect(201);
    expect(ok.body.wells.map((w: { intakeRadius: string }) => w.intakeRadius)).toEqual(['screen', 'borehole']);
    const csv = await lead.get(`/api/sites/${ts.demoSiteId}/wells.csv`).expect(200);
    const lines = csv.text.split('\r\n');
    const col = lines[0].split(',').indexOf('intake radius');
    expect(col).toBeGreaterThan(0);
    expect(lines.find((l) => l.startsWith('CSV-1,'))!.split(',')[col]).toBe('screen');
  });
});

describe('a fit takes the intake from its well', () => {
  it('uses the well’s borehole radius as Hvorslev’s R, with no intake flag', async () => {
    const w = await newWell();
    const { recordId } = await insertSyntheticRecord(ts.ds, w.id, { kMetersPerSecond: 2e-5 });
    const r = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', geometry: { anisotropyRatio: 1 } }).expect(201);
    expect(r.body.geometry.intake).toBe('borehole');
    // The record was made with the well's geometry (borehole intake) for K = 2e-5 m/s: recovered within 2 %.
    expect(Math.abs(r.body.result.kMetersPerSecond / 2e-5 - 1)).toBeLessThan(0.02);
    expect(r.body.flags.map((f: { code: string }) => f.code)).not.toContain('intake-screen-in-filter-pack');
    const audit = await analyst.get(`/api/fits/${r.body.id}/audit`).expect(200);
    expect(audit.body.events[0].details.intake).toBeUndefined();
  });

  it('records an override of the well’s intake in the audit trail and flags the screen radius with the K of both radii', async () => {
    const w = await newWell();
    const { recordId } = await insertSyntheticRecord(ts.ds, w.id, { kMetersPerSecond: 2e-5 });
    const onWell = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' }).expect(201)).body;
    const r = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', geometry: { intake: 'screen' } }).expect(201);
    expect(r.body.geometry.intake).toBe('screen');
    // Same T0, smaller R: K with the screen radius from Hvorslev's formula, larger than with the borehole.
    const kScreen = hvorslevK({ ...r.body.geometry, intake: 'screen' }, r.body.result.t0Seconds).kMetersPerSecond;
    expect(r.body.result.kMetersPerSecond).toBeCloseTo(kScreen, 12);
    const flag = r.body.flags.find((f: { code: string }) => f.code === 'intake-screen-in-filter-pack');
    expect(flag).toMatchObject({ severity: 'warning', values: { screenRadiusM: 0.0254, boreholeRadiusM: 0.1016, method: 'hvorslev' } });
    expect(flag.values.kScreenMetersPerSecond).toBeCloseTo(r.body.result.kMetersPerSecond, 12);
    expect(flag.values.kBoreholeMetersPerSecond / onWell.result.kMetersPerSecond).toBeCloseTo(1, 9);
    expect(flag.message).toMatch(/0\.0254 m/);
    expect(flag.message).toMatch(/0\.1016 m/);
    expect(flag.message).toContain(r.body.result.kMetersPerSecond.toExponential(2));
    expect(flag.message).toContain(onWell.result.kMetersPerSecond.toExponential(2));
    const audit = await analyst.get(`/api/fits/${r.body.id}/audit`).expect(200);
    expect(audit.body.events[0]).toMatchObject({ kind: 'created', details: { intake: 'screen', wellIntake: 'borehole' } });
  });

  it('keeps the fit’s intake when another geometry field changes, and audits a change of intake', async () => {
    const w = await newWell();
    const { recordId } = await insertSyntheticRecord(ts.ds, w.id, { kMetersPerSecond: 2e-5 });
    const f = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', geometry: { intake: 'screen', anisotropyRatio: 4 } }).expect(201)).body;
    const p1 = await analyst.patch(`/api/fits/${f.id}`, { geometry: { screenLengthM: 2.5 } }).expect(200);
    expect(p1.body.geometry).toMatchObject({ intake: 'screen', anisotropyRatio: 4, screenLengthM: 2.5 });
    const p2 = await analyst.patch(`/api/fits/${f.id}`, { geometry: { intake: 'borehole' } }).expect(200);
    expect(p2.body.geometry).toMatchObject({ intake: 'borehole', anisotropyRatio: 4 });
    expect(p2.body.flags.map((x: { code: string }) => x.code)).not.toContain('intake-screen-in-filter-pack');
    const audit = await analyst.get(`/api/fits/${f.id}/audit`).expect(200);
    const last = audit.body.events.at(-1);
    expect(last.details.changes['geometry.intake']).toEqual({ from: 'screen', to: 'borehole' });
  });

  it('uses the intake as Bouwer-Rice’s rw: the screen radius on a well set to the screen, flagged with both K', async () => {
    const w = await newWell({ intakeRadius: 'screen' });
    const { recordId } = await insertSyntheticRecord(ts.ds, w.id, { kMetersPerSecond: 2e-5 });
    const onScreen = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'bouwer-rice' }).expect(201)).body;
    const onBorehole = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'bouwer-rice', geometry: { intake: 'borehole' } }).expect(201)).body;
    expect(onScreen.geometry.intake).toBe('screen');
    expect(onScreen.result.kMetersPerSecond).not.toBeCloseTo(onBorehole.result.kMetersPerSecond, 8);
    const flag = onScreen.flags.find((x: { code: string }) => x.code === 'intake-screen-in-filter-pack');
    expect(flag.values.kBoreholeMetersPerSecond / onBorehole.result.kMetersPerSecond).toBeCloseTo(1, 9);
    const audit = await analyst.get(`/api/fits/${onBorehole.id}/audit`).expect(200);
    expect(audit.body.events[0].details).toMatchObject({ intake: 'borehole', wellIntake: 'screen' });
  });

  it('starts the workspace from the well’s intake (the reduced record’s default geometry)', async () => {
    const w = await newWell();
    const { recordId } = await insertSyntheticRecord(ts.ds, w.id, { kMetersPerSecond: 2e-5 });
    const r = await analyst.get(`/api/records/${recordId}/reduced`).expect(200);
    expect(r.body.defaultGeometry.intake).toBe('borehole');
  });
});
