import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Well } from '../../server/features/wells/well.entity';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

let ts: TestServer;
let analyst: ApiClient;
let wellId: string;
beforeAll(async () => {
  ts = await startTestServer();
  analyst = await ts.as(demoEmail('Analyst'));
  wellId = (await ts.ds.getRepository(Well).findOneByOrFail({ siteId: ts.demoSiteId, name: 'MW-15' })).id;
});
afterAll(async () => ts.close());

function upload(settings: object, bytes: Buffer, name: string) {
  return analyst.agent
    .post(`/api/wells/${wellId}/records`)
    .set('x-csrf-token', analyst.csrf)
    .field('settings', JSON.stringify(settings))
    .attach('file', bytes, { filename: name, contentType: 'text/csv' });
}

const G = 9.80665; // standard gravity (NIST SP 811)
/** An invented vented record in kPa, 1 s apart: 3 m of water at rest, then a 0.5 m slug out recovering with T0 = 6 s. */
const ventedKpa = Buffer.from(
  ['Invented example', 'Elapsed (s),Pressure (kPa)', ...Array.from({ length: 30 }, (_, i) => `${i},${(((i < 4 ? 3 : 3 - 0.5 * Math.exp(-(i - 4) / 6)) * 1000 * G) / 1000).toFixed(5)}`)].join('\n') + '\n',
);
const VENTED_KPA = {
  testType: 'slug-out',
  reference: 'vented',
  layout: { delimiter: 'comma', headerLine: 2, unitsLine: null, firstDataLine: 3, lastDataLine: null, decimalComma: false },
  mapping: { time: { columns: [0], format: 's' }, valueColumn: 1 },
  valueUnit: 'kPa',
  waterDensityKgM3: 1000,
};
const CHICAGO = {
  testType: 'slug-in',
  reference: 'vented',
  layout: { delimiter: 'comma', headerLine: 1, firstDataLine: 2, lastDataLine: 31 },
  mapping: { time: { columns: [0, 1], format: 'timestamp', timestampLayout: 'iso', timeZone: 'America/Chicago' }, valueColumn: 2 },
  valueUnit: 'ft',
};
const chicagoFile = () => fs.readFileSync(path.resolve(__dirname, '../fixtures/loggers/date-time-columns.csv'));

describe('the static level of a pressure record', () => {
  it('is entered in the record’s pressure unit and converted with its water density: 29.41995 kPa at 1000 kg/m³ is 3 m of water', async () => {
    const inKpa = await upload({ ...VENTED_KPA, staticLevel: { value: 29.41995, unit: 'kPa' } }, ventedKpa, 'kpa.csv');
    expect(inKpa.status, JSON.stringify(inKpa.body)).toBe(201);
    // h = P / (ρ g) = 29419.95 / (1000 × 9.80665) = 3.000000 m (derived)
    expect(inKpa.body.staticLevelM).toBeCloseTo(29419.95 / (1000 * G), 9);
    expect(inKpa.body.staticSource).toBe('entered');
    const inMetres = await upload({ ...VENTED_KPA, staticLevel: { value: 29419.95 / (1000 * G), unit: 'm' } }, ventedKpa, 'kpa.csv');
    expect(inMetres.body.h0M).toBeCloseTo(inKpa.body.h0M, 9);
  });

  it('uses the record’s density: 1 psi of water at 998.2071 kg/m³ (20 °C) is 0.70433 m', async () => {
    const r = await upload({ ...VENTED_KPA, waterDensityKgM3: 998.2071, staticLevel: { value: 4.267, unit: 'psi' } }, ventedKpa, 'kpa.csv');
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    // docs/methods.md §1: 1 psi of water = 0.70433 m at 20 °C (derived)
    expect(r.body.staticLevelM / 4.267).toBeCloseTo(0.70433, 5);
  });

  it('is refused in a pressure unit for a depth record, and in a unit that is neither, naming the field', async () => {
    const depth = await upload({ ...VENTED_KPA, reference: 'depth', valueUnit: 'm', staticLevel: { value: 3, unit: 'kPa' } }, ventedKpa, 'kpa.csv');
    expect(depth.status).toBe(400);
    expect(depth.body.error.fields['settings.staticLevel.unit']).toMatch(/a length/);
    const odd = await upload({ ...VENTED_KPA, staticLevel: { value: 3, unit: 'furlong' } }, ventedKpa, 'kpa.csv');
    expect(odd.status).toBe(400);
    expect(odd.body.error.fields['settings.staticLevel.unit']).toMatch(/length .* or a pressure/);
  });
});

describe('the test start as the crew wrote it', () => {
  it('is a time of day in the record’s time zone for a timestamped record', async () => {
    // The fixture's step is at 2024-07-01 09:00:15 in Chicago (CDT, UTC−5) = 14:00:15Z.
    for (const text of ['9:00:15', '09:00:15 AM', '2024-07-01 09:00:15']) {
      const r = await upload({ ...CHICAGO, testStartText: text }, chicagoFile(), 'dt.csv');
      expect(r.status, `${text}: ${JSON.stringify(r.body)}`).toBe(201);
      expect(r.body.startedAt).toBe('2024-07-01T14:00:15.000Z');
      expect(r.body.testStartSeconds).toBe(15);
      expect(r.body.testStartSource).toBe('entered');
    }
  });

  it('is refused outside the record or not a time, naming the field', async () => {
    const before = await upload({ ...CHICAGO, testStartText: '8:59' }, chicagoFile(), 'dt.csv');
    expect(before.status).toBe(400);
    expect(before.body.error.fields['settings.testStartText']).toMatch(/outside the record/);
    const junk = await upload({ ...CHICAGO, testStartText: 'after lunch' }, chicagoFile(), 'dt.csv');
    expect(junk.status).toBe(400);
    expect(junk.body.error.fields['settings.testStartText']).toMatch(/not a time of day/);
    const both = await upload({ ...CHICAGO, testStartText: '9:00:15', testStartSeconds: 15 }, chicagoFile(), 'dt.csv');
    expect(both.status).toBe(400);
    expect(both.body.error.fields['settings.testStartText']).toMatch(/once/);
  });

  it('is elapsed-time text for an elapsed-time logger record', async () => {
    for (const text of ['0:04', '4 s', '4']) {
      const r = await upload({ ...VENTED_KPA, testStartText: text }, ventedKpa, 'kpa.csv');
      expect(r.status, `${text}: ${JSON.stringify(r.body)}`).toBe(201);
      expect(r.body.testStartSeconds).toBe(4);
      expect(r.body.startedAt).toBeNull();
    }
  });

  it('is elapsed-time text for tape readings in any time format, refused with the field named when it is not one', async () => {
    const readings = [['0', 14.87], ['60', 14.87], ['120', 14.87], ['180', 14.9], ['240', 14.5], ['300', 14.3], ['360', 14.15], ['420', 14.07], ['480', 14.02]].map(([time, depth]) => ({ time, depth }));
    const body = { testType: 'bail-down', readings, timeFormat: 's', units: 'ft' };
    for (const testStart of ['3:00', '180 s', '3 min', 180]) {
      const r = await analyst.post(`/api/wells/${wellId}/records`, { ...body, testStart });
      expect(r.status, `${testStart}: ${JSON.stringify(r.body)}`).toBe(201);
      expect(r.body.testStartSeconds).toBe(180);
      expect(r.body.testStartSource).toBe('entered');
    }
    const bad = await analyst.post(`/api/wells/${wellId}/records`, { ...body, testStart: 'three' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.testStart).toMatch(/not an elapsed time/);
  });
});
