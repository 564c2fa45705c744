import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RecordEntity } from '../../server/features/records/record.entity';
import { Well } from '../../server/features/wells/well.entity';
import { insertSyntheticRecord } from '../support/synthetic-record';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

// The high-K model as a fit (docs/methods.md section 6a): records made from the Springer-Gelhar
// model itself (`modelHead`, C_D from a chosen K through the Hvorslev shape factor), fitted through
// POST /api/records/:id/fits with model "high-k".

let ts: TestServer;
let analyst: ApiClient, checker: ApiClient;
let wellId: string;

beforeAll(async () => {
  ts = await startTestServer();
  [analyst, checker] = await Promise.all([ts.as(demoEmail('Analyst')), ts.as(demoEmail('Checker'))]);
  wellId = (await ts.ds.getRepository(Well).findOneOrFail({ where: { siteId: ts.demoSiteId }, order: { name: 'ASC' } })).id;
});
afterAll(async () => ts.close());

const K = 5e-3; // m/s: with L_e = 3 m, C_D ≈ 0.6 in the first demo well (underdamped)
const LE = 3;
const highKRecord = () => insertSyntheticRecord(ts.ds, wellId, { kMetersPerSecond: K, highK: { effectiveLengthM: LE } });

describe('the high-K model through the API', () => {
  it('recovers the known K of an oscillating record within 2 %, with C_D, the regime and L_e fitted', async () => {
    const { recordId, dampingParameter } = await highKRecord();
    expect(dampingParameter).toBeLessThan(2);
    const r = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', model: 'high-k' });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body.model).toBe('high-k');
    expect(Math.abs(r.body.result.kMetersPerSecond / K - 1)).toBeLessThan(0.02);
    expect(r.body.kMetersPerSecond ?? r.body.result.kMetersPerSecond).toBeGreaterThan(0);
    const h = r.body.result.highK;
    expect(h.regime).toBe('underdamped');
    expect(Math.abs(h.dampingParameter / dampingParameter! - 1)).toBeLessThan(0.02);
    expect(h.effectiveLengthFitted).toBe(true);
    expect(Math.abs(h.effectiveLengthM / LE - 1)).toBeLessThan(0.02);
    expect(h.effectiveLengthEstimateM).toBeGreaterThan(0);
    expect(h.dampedPeriodSeconds).toBeGreaterThan(0);
    expect(h.residualRms).toBeLessThan(1e-3);
    // The straight-line fields say the same in the overdamped terms: T0 = C_D √(L_e/g), slope −1/T0.
    expect(r.body.result.t0Seconds).toBeCloseTo(h.dampingParameter * h.timeScaleSeconds, 9);
    expect(r.body.result.slopePerSecond).toBeCloseTo(-1 / r.body.result.t0Seconds, 9);
    expect(r.body.result.window.source).toBe('all-readings');
    expect(r.body.result.rSquared).toBeGreaterThan(0.999);
    expect(r.body.result.kReference).toMatch(/high-K Hvorslev/);
    // The oscillation stays a note; no straight-line flag applies.
    const codes = r.body.flags.map((f: { code: string }) => f.code);
    expect(codes).toContain('oscillation');
    for (const lineOnly of ['window-outside-recommended', 'concave-upward', 'low-r-squared', 'too-few-readings']) expect(codes).not.toContain(lineOnly);
    // Nothing to answer: it goes to its Checker as it is.
    await analyst.post(`/api/fits/${r.body.id}/submit`, {}).expect(200);
    const checked = await checker.post(`/api/fits/${r.body.id}/check`, { decision: 'checked' }).expect(200);
    expect(checked.body.model).toBe('high-k');
    const wk = await analyst.get(`/api/wells/${wellId}/k`).expect(200);
    expect(wk.body.fits.some((f: { fitId: string }) => f.fitId === r.body.id)).toBe(true);
  });

  it('holds L_e at the entered value when asked: the true L_e gives K within 2 %, a wrong one another K', async () => {
    const { recordId } = await highKRecord();
    const held = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', model: 'high-k', options: { highK: { effectiveLengthM: LE, fitEffectiveLength: false } } });
    expect(held.status, JSON.stringify(held.body)).toBe(201);
    expect(held.body.result.highK.effectiveLengthFitted).toBe(false);
    expect(held.body.result.highK.effectiveLengthM).toBe(LE);
    expect(held.body.options.highK).toEqual({ effectiveLengthM: LE, fitEffectiveLength: false });
    expect(Math.abs(held.body.result.kMetersPerSecond / K - 1)).toBeLessThan(0.02);
    const wrong = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', model: 'high-k', options: { highK: { effectiveLengthM: 2 * LE, fitEffectiveLength: false } } }).expect(201);
    expect(wrong.body.result.highK.effectiveLengthM).toBe(2 * LE);
    expect(Math.abs(wrong.body.result.kMetersPerSecond / K - 1)).toBeGreaterThan(0.05);
    expect(wrong.body.result.highK.residualRms).toBeGreaterThan(held.body.result.highK.residualRms);
  });

  it('refuses a line fit of an oscillating record, pointing to the high-K model', async () => {
    const { recordId } = await highKRecord();
    const r = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' });
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('OSCILLATING');
    expect(r.body.error.message).toMatch(/fit it with the high-K model instead/);
    expect(r.body.error.fields.model).toMatch(/high-K model/);
  });

  it('refuses a bad L_e with 400 naming the field', async () => {
    const { recordId } = await highKRecord();
    const r = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', model: 'high-k', options: { highK: { effectiveLengthM: -1, fitEffectiveLength: false } } });
    expect(r.status).toBe(400);
    expect(Object.keys(r.body.error.fields)).toContain('options.highK.effectiveLengthM');
    expect(r.body.error.fields['options.highK.effectiveLengthM']).toMatch(/Effective length L_e must be greater than 0/);
    const model = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', model: 'theis' });
    expect(model.status).toBe(400);
    expect(model.body.error.fields.model).toMatch(/Model must be/);
  });

  it('records a change of model and of L_e in the audit trail', async () => {
    const { recordId } = await highKRecord();
    const line = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', options: { allowOscillation: true } }).expect(201);
    expect(line.body.model).toBe('line');
    const toHighK = await analyst.patch(`/api/fits/${line.body.id}`, { model: 'high-k' }).expect(200);
    expect(toHighK.body.model).toBe('high-k');
    expect(Math.abs(toHighK.body.result.kMetersPerSecond / K - 1)).toBeLessThan(0.02);
    await analyst.patch(`/api/fits/${line.body.id}`, { options: { allowOscillation: true, highK: { effectiveLengthM: 2.5, fitEffectiveLength: false } } }).expect(200);
    const audit = await analyst.get(`/api/fits/${line.body.id}/audit`).expect(200);
    const changes = audit.body.events.filter((e: { kind: string }) => e.kind === 'parameters-changed').map((e: { details: { changes: Record<string, unknown> } }) => e.details.changes);
    expect(changes[0].model).toEqual({ from: 'line', to: 'high-k' });
    expect(changes[1]['highK.effectiveLengthM']).toEqual({ from: null, to: 2.5 });
    expect(changes[1]['highK.fitEffectiveLength']).toEqual({ from: null, to: false });
  });

  it('checks the measured H0 against the slug volume as for a straight line', async () => {
    const { recordId } = await highKRecord();
    const record = await ts.ds.getRepository(RecordEntity).findOneByOrFail({ id: recordId });
    const well = await ts.ds.getRepository(Well).findOneByOrFail({ id: wellId });
    // A slug that would raise the level 3× the H0 the record shows (expected H0 = V / (π rc²), Butler, McElwee & Liu 1996).
    const slugVolumeM3 = 3 * Math.abs(record.h0M) * Math.PI * well.casingRadiusM ** 2;
    await ts.ds.getRepository(RecordEntity).update({ id: recordId }, { slugVolumeM3 });
    const fit = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', model: 'high-k' }).expect(201)).body;
    const h0 = fit.flags.find((f: { code: string }) => f.code === 'h0-mismatch');
    expect(h0, JSON.stringify(fit.flags.map((f: { code: string }) => f.code))).toBeDefined();
    expect(h0.values.ratio).toBeCloseTo(1 / 3, 2);
  });
});
