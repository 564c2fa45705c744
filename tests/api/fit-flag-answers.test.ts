import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { flagAction } from '../../shared/hydraulics/flag-answers';
import { RECOMMENDED_HEAD_RANGES } from '../../shared/hydraulics/fitting';
import { Well } from '../../server/features/wells/well.entity';
import { insertSyntheticRecord } from '../support/synthetic-record';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

let ts: TestServer;
let analyst: ApiClient;
let checker: ApiClient;
let wellId = '';

beforeAll(async () => {
  ts = await startTestServer();
  [analyst, checker] = await Promise.all([ts.as(demoEmail('Analyst')), ts.as(demoEmail('Checker'))]);
  wellId = (await ts.ds.getRepository(Well).findOneOrFail({ where: { siteId: ts.demoSiteId }, order: { name: 'ASC' } })).id;
});
afterAll(async () => ts.close());

/**
 * An invented tape record with a double straight line: half the displacement drains in seconds
 * (a filter pack), the rest with a basic time lag of 120 s. H/H0 = 0.5 e^(−t/4) + 0.5 e^(−t/120).
 */
async function doubleLineRecord(): Promise<string> {
  const times = [0, 2, 4, 6, 8, 10, 13, 16, 20, 25, 30, 40, 50, 60, 75, 90, 105, 120, 140, 160, 180, 200, 230, 260, 290, 320, 360, 400];
  const readings = [{ time: -30, depth: 10 }, { time: -15, depth: 10 }, ...times.map((t) => ({ time: t, depth: 10 + 1.2 * (0.5 * Math.exp(-t / 4) + 0.5 * Math.exp(-t / 120)) }))];
  const r = await analyst.post(`/api/wells/${wellId}/records`, { testType: 'bail-down', readings, timeFormat: 's', units: 'm', static: 10, testStart: 0, fieldCrew: 'Invented crew' });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return r.body.id;
}

const codes = (fit: { flags: { code: string }[] }) => fit.flags.map((f) => f.code);

describe('flags that change K must be answered before a fit is submitted', () => {
  it('refuses to submit a double-straight-line fit until the suggested action is applied; then the flag shows as resolved', async () => {
    const recordId = await doubleLineRecord();
    const fit = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', window: { kind: 'head', upper: 1, lower: 0.6 } }).expect(201)).body;
    expect(codes(fit)).toContain('concave-upward');
    const refused = await analyst.post(`/api/fits/${fit.id}/submit`, {});
    expect(refused.status).toBe(400);
    expect(refused.body.error.code).toBe('FLAGS_UNANSWERED');
    expect(Object.keys(refused.body.error.fields)).toEqual(expect.arrayContaining(['reasons.concave-upward', 'reasons.window-outside-recommended']));
    expect((await analyst.get(`/api/fits/${fit.id}`).expect(200)).body.status).toBe('draft');

    // One click: a free line over the later segment, in the recommended range (which answers the window flag too).
    const action = flagAction({ code: 'concave-upward' }, 'hvorslev')!;
    expect(action.patch).toEqual({ line: 'free', window: { kind: 'head', ...RECOMMENDED_HEAD_RANGES.hvorslev } });
    const applied = (await analyst.patch(`/api/fits/${fit.id}`, { ...action.patch, resolving: 'concave-upward' }).expect(200)).body;
    expect(applied.line).toBe('free');
    // The record still has its double straight line, so the flag stays, answered by the fit.
    expect(codes(applied)).toContain('concave-upward');
    expect(codes(applied)).not.toContain('window-outside-recommended');
    expect(applied.resolvedFlags).toEqual([expect.objectContaining({ code: 'concave-upward', action: action.label, by: expect.objectContaining({ name: expect.any(String) }) })]);
    const submitted = (await analyst.post(`/api/fits/${fit.id}/submit`, {}).expect(200)).body;
    expect(submitted.status).toBe('awaiting-check');
    const audit = (await checker.get(`/api/fits/${fit.id}/audit`).expect(200)).body.events;
    expect(audit.find((e: { kind: string }) => e.kind === 'parameters-changed').details.resolved).toBe('concave-upward');
  });

  it('takes a reason instead, shows it to the checker and keeps it in the audit trail', async () => {
    const { recordId } = await insertSyntheticRecord(ts.ds, wellId, { kMetersPerSecond: 3e-5 });
    const fit = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', window: { kind: 'head', upper: 0.6, lower: 0.1 } }).expect(201)).body;
    expect(codes(fit)).toContain('window-outside-recommended');
    const blank = await analyst.post(`/api/fits/${fit.id}/submit`, { reasons: { 'window-outside-recommended': '   ' } });
    expect(blank.status).toBe(400);
    expect(blank.body.error.fields['reasons.window-outside-recommended']).toMatch(/suggested action|why/);
    const reason = 'The recommended range holds only the noisy tail of this record; the wider window follows the straight part.';
    await analyst.post(`/api/fits/${fit.id}/submit`, { reasons: { 'window-outside-recommended': reason } }).expect(200);
    const seen = (await checker.get(`/api/fits/${fit.id}`).expect(200)).body;
    expect(seen.status).toBe('awaiting-check');
    expect(seen.flagReasons).toEqual({ 'window-outside-recommended': reason });
    const audit = (await checker.get(`/api/fits/${fit.id}/audit`).expect(200)).body.events;
    expect(audit.find((e: { kind: string }) => e.kind === 'submitted').details.reasons).toEqual({ 'window-outside-recommended': reason });
  });

  it('records a flag the action made disappear as resolved, with the action and who applied it', async () => {
    const { recordId } = await insertSyntheticRecord(ts.ds, wellId, { kMetersPerSecond: 3e-5 });
    const fit = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'bouwer-rice', window: { kind: 'head', upper: 0.6, lower: 0.1 } })).body;
    if (!codes(fit).includes('window-outside-recommended')) throw new Error(`expected the window flag: ${JSON.stringify(codes(fit))}`);
    const action = flagAction({ code: 'window-outside-recommended' }, 'bouwer-rice')!;
    const applied = (await analyst.patch(`/api/fits/${fit.id}`, { ...action.patch, resolving: 'window-outside-recommended' }).expect(200)).body;
    expect(codes(applied)).not.toContain('window-outside-recommended');
    expect(applied.resolvedFlags).toEqual([expect.objectContaining({ code: 'window-outside-recommended', action: action.label })]);
    expect(applied.resolvedFlags[0].message).toMatch(/outside/);
    // A change that does not answer the flag records nothing.
    const { recordId: r2 } = await insertSyntheticRecord(ts.ds, wellId, { kMetersPerSecond: 3e-5 });
    const other = (await analyst.post(`/api/records/${r2}/fits`, { method: 'hvorslev', window: { kind: 'head', upper: 0.6, lower: 0.1 } })).body;
    const notAnswered = (await analyst.patch(`/api/fits/${other.id}`, { note: 'just a note', resolving: 'window-outside-recommended' }).expect(200)).body;
    expect(notAnswered.resolvedFlags).toEqual([]);
  });

  it('submits a fit whose default window raises no flag that changes K without any reason', async () => {
    const { recordId } = await insertSyntheticRecord(ts.ds, wellId, { kMetersPerSecond: 2e-5 });
    const fit = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' }).expect(201)).body;
    expect((await analyst.post(`/api/fits/${fit.id}/submit`).expect(200)).body.flagReasons).toEqual({});
  });
});
