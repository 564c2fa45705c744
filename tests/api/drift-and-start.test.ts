import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Well } from '../../server/features/wells/well.entity';
import type { ApiClient } from '../support/test-server';
import { demoEmail, startTestServer, type TestServer } from '../support/test-server';

// Records uploaded as a crew brings them back, with nothing entered but the well: a drifting
// record is a drift, not an oscillation; a record whose test start cannot be found says so.

let ts: TestServer;
let analyst: ApiClient;
let wellId: string;

beforeAll(async () => {
  ts = await startTestServer();
  analyst = await ts.as(demoEmail('Analyst'));
  wellId = (await ts.ds.getRepository(Well).findOneByOrFail({ siteId: ts.demoSiteId, name: 'MW-15' })).id;
});
afterAll(async () => ts.close());

const VENTED = {
  testType: 'slug-out',
  reference: 'vented',
  layout: { delimiter: 'comma', headerLine: 2, unitsLine: null, firstDataLine: 3, lastDataLine: null, decimalComma: false },
  mapping: { time: { columns: [0], format: 's' }, valueColumn: 1 },
  valueUnit: 'm',
};

/** An elapsed-time vented logger file: head (m) at 1 s readings, from `head(t)`. */
const file = (n: number, head: (t: number) => number) =>
  Buffer.from(['Invented example', 'Elapsed (s),Level (m)', ...Array.from({ length: n }, (_, t) => `${t},${head(t).toFixed(5)}`)].join('\n') + '\n');

function upload(bytes: Buffer) {
  return analyst.agent
    .post(`/api/wells/${wellId}/records`)
    .set('x-csrf-token', analyst.csrf)
    .field('settings', JSON.stringify(VENTED))
    .attach('file', bytes, { filename: 'invented.csv', contentType: 'text/csv' });
}

function preview(bytes: Buffer) {
  return analyst.agent
    .post('/api/records/preview')
    .set('x-csrf-token', analyst.csrf)
    .field('settings', JSON.stringify({ reference: 'vented', valueUnit: 'm' }))
    .attach('file', bytes, { filename: 'invented.csv', contentType: 'text/csv' });
}

// static head 3.0 m, a slug-out of 0.5 m at t = 20 s recovering with T0 = 15 s
const recovery = (t: number) => (t < 20 ? 0 : 0.5 * Math.exp(-(t - 20) / 15));

describe('a drifting record and an oscillating one, through the API', () => {
  it('fits a record whose level keeps falling after recovery with the drift note, not an oscillation', async () => {
    // an uncompensated drift: the level falls 1 cm a minute from the start on
    const r = await upload(file(400, (t) => 3 - recovery(t) - (0.01 * Math.max(0, t - 20)) / 60));
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    const fit = await analyst.post(`/api/records/${r.body.id}/fits`, { method: 'hvorslev' });
    expect(fit.status, JSON.stringify(fit.body)).toBe(201);
    const codes = fit.body.flags.map((f: { code: string }) => f.code);
    expect(codes).toContain('drift-after-recovery');
    expect(codes).not.toContain('oscillation');
    const drift = fit.body.flags.find((f: { code: string }) => f.code === 'drift-after-recovery');
    expect(drift.message).toMatch(/^The level keeps moving after recovery: compensate with a barometric record or fit the early part/);
  });

  it('refuses to fit a record that crosses static and turns back without the override', async () => {
    const r = await upload(file(400, (t) => 3 - (t < 20 ? 0 : 0.5 * Math.exp(-(t - 20) / 30) * Math.cos((2 * Math.PI * (t - 20)) / 25))));
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    const fit = await analyst.post(`/api/records/${r.body.id}/fits`, { method: 'hvorslev' });
    expect(fit.status).toBe(400);
    expect(fit.body.error.code).toBe('OSCILLATING');
  });
});

describe('a test start that cannot be found', () => {
  // a logger glitch long after the recovery, larger than the slug
  const glitched = () => file(600, (t) => (t === 450 ? 2.1 : 3 - recovery(t)));

  it('is refused on upload with its code and the start named as the field to enter', async () => {
    const r = await upload(glitched());
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('TEST_START_NOT_FOUND');
    expect(r.body.error.fields['settings.testStartSeconds']).toMatch(/^Could not find the test start — enter it/);
  });

  it('is answered in the preview with the candidate times to mark on the curve', async () => {
    const r = await preview(glitched());
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.suggestion).toBeNull();
    expect(r.body.suggestionCode).toBe('TEST_START_NOT_FOUND');
    expect(r.body.testStartCandidates).toContain(20);
    expect(r.body.testStartCandidates.some((x: number) => x === 450 || x === 451)).toBe(true);
    // The curve the candidates are drawn on: the record as read (600 readings, 400 points kept by LTTB, the glitch among them).
    expect(r.body.curve).toMatchObject({ unit: 'm', readings: 600 });
    expect(r.body.curve.secondsAfterFirst).toHaveLength(400);
    expect(r.body.curve.value).toHaveLength(400);
    expect(r.body.curve.value[r.body.curve.secondsAfterFirst.indexOf(450)]).toBeCloseTo(2.1, 6);
  });

  it('asks for the static level of a logger started after the test start', async () => {
    const late = Buffer.from(['Invented example', 'Elapsed (s),Level (m)', ...Array.from({ length: 200 }, (_, t) => `${t},${(3 - 0.5 * Math.exp(-t / 15)).toFixed(5)}`)].join('\n') + '\n');
    const r = await upload(late);
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('NO_PRE_TEST_READINGS');
    expect(r.body.error.fields['settings.staticLevel']).toBe('No readings before the test start and no static level entered: enter the static level');
  });
});
