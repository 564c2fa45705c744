import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { K_CHANGING_CODES } from '../../shared/hydraulics/flag-answers';
import { FitEntity } from '../../server/features/fits/fit.entity';
import { FitEventEntity } from '../../server/features/fits/fit-event.entity';
import { Well } from '../../server/features/wells/well.entity';
import { insertSyntheticRecord } from '../support/synthetic-record';
import { demoEmail, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

let ts: TestServer;
let analyst: ApiClient, checker: ApiClient, lead: ApiClient, viewer: ApiClient;
let wellId: string;

beforeAll(async () => {
  ts = await startTestServer();
  [analyst, checker, lead, viewer] = await Promise.all(['Analyst', 'Checker', 'Lead', 'Viewer'].map((r) => ts.as(demoEmail(r as 'Lead'))));
  wellId = (await ts.ds.getRepository(Well).findOneOrFail({ where: { siteId: ts.demoSiteId }, order: { name: 'ASC' } })).id;
});
afterAll(async () => ts.close());

const newRecord = (k = 2e-5, extra: { oscillate?: boolean } = {}) => insertSyntheticRecord(ts.ds, wellId, { kMetersPerSecond: k, ...extra });
/** A reason for each flag that changes K (the lifecycle tests choose their windows on purpose). */
const reasonsFor = (fit: { flags: { code: string }[] }) =>
  ({ reasons: Object.fromEntries(fit.flags.filter((f) => K_CHANGING_CODES.has(f.code)).map((f) => [f.code, 'The window is chosen on purpose for this test.'])) });
const fitsCount = () => ts.ds.getRepository(FitEntity).count();

async function draft(k = 2e-5, client = analyst) {
  const { recordId } = await newRecord(k);
  const r = await client.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' }).expect(201);
  return r.body;
}

describe('fitting through the API', () => {
  it('returns the known K of a synthetic record within 2 % with default settings', async () => {
    // Hvorslev (1951) model record built for K = 2.0e-5 m/s; the default window is the recommended head range.
    const { recordId, t0Seconds } = await newRecord(2e-5);
    const r = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' }).expect(201);
    expect(r.body.status).toBe('draft');
    expect(r.body.result.kMetersPerSecond / 2e-5).toBeCloseTo(1, 1);
    expect(Math.abs(r.body.result.kMetersPerSecond / 2e-5 - 1)).toBeLessThan(0.02);
    expect(Math.abs(r.body.result.t0Seconds / t0Seconds - 1)).toBeLessThan(0.02);
    expect(r.body.result.window.source).toBe('recommended');
    expect(r.body.result.kSimplifiedMetersPerSecond).toBeGreaterThan(0);
    expect(r.body.geometry.screenLengthM).toBeGreaterThan(0);
    expect(r.body.preparedBy.name).toBe('Tomas Ferreira');
  });

  it('fits Bouwer-Rice with a free line over a typed window and stores the geometry used', async () => {
    const { recordId } = await newRecord(5e-5);
    const r = await analyst
      .post(`/api/records/${recordId}/fits`, {
        method: 'bouwer-rice',
        line: 'free',
        window: { kind: 'head', upper: 0.6, lower: 0.1 },
        geometry: { staticToScreenBottomM: 6, saturatedThicknessM: 20, anisotropyRatio: 1 },
      })
      .expect(201);
    expect(r.body.method).toBe('bouwer-rice');
    expect(r.body.line).toBe('free');
    expect(r.body.geometry.saturatedThicknessM).toBe(20);
    expect(r.body.result.window.source).toBe('entered');
    expect(r.body.result.window.headMax).toBeLessThanOrEqual(0.6);
  });

  it.each([
    [{ method: 'hvorslev', window: { kind: 'head', upper: 0.5, lower: 0 } }, 'window.lower', /above 0/],
    [{ method: 'hvorslev', window: { kind: 'time', fromSeconds: 10, toSeconds: 10.1 } }, 'window', /3|fewer|readings/],
    [{ method: 'hvorslev', geometry: { screenRadiusM: -1 } }, 'geometry.screenRadiusM', /greater than 0/],
    [{ method: 'hvorslev', geometry: { screenRadiusM: 0.5, boreholeRadiusM: 0.1 } }, 'geometry.screenRadiusM', /larger than the borehole/],
    [{ method: 'theis' }, 'method', /Hvorslev or Bouwer-Rice/],
    [{ method: 'bouwer-rice', geometry: { screenLengthM: 500, screenRadiusM: 0.01, boreholeRadiusM: 0.01 } }, 'geometry', /1500|range|Le/],
  ])('refuses bad input %# with 400 naming the field, and stores nothing', async (body, field, message) => {
    const { recordId } = await newRecord();
    const before = await fitsCount();
    const r = await analyst.post(`/api/records/${recordId}/fits`, body);
    expect(r.status).toBe(400);
    const key = Object.keys(r.body.error.fields ?? {}).find((k) => k.startsWith(field));
    expect(key, JSON.stringify(r.body)).toBeTruthy();
    expect(`${r.body.error.fields[key!]} ${r.body.error.message}`).toMatch(message);
    expect(await fitsCount()).toBe(before);
  });

  it('refuses to fit an oscillating record unless the override is given', async () => {
    const { recordId } = await newRecord(1e-3, { oscillate: true });
    const before = await fitsCount();
    const r = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' });
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('OSCILLATING');
    expect(await fitsCount()).toBe(before);
    const forced = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev', window: { kind: 'head', upper: 1, lower: 0.2 }, options: { allowOscillation: true } });
    expect(forced.status).toBe(201);
    expect(forced.body.flags.map((f: { code: string }) => f.code)).toContain('oscillation');
  });

  it('lets neither a Checker nor a Viewer prepare a fit', async () => {
    const { recordId } = await newRecord();
    expect((await checker.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' })).status).toBe(403);
    expect((await viewer.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' })).status).toBe(403);
  });

  it('serves the reduced record for the in-browser preview, decimated beyond maxPoints', async () => {
    const { recordId } = await newRecord(1e-6);
    const full = (await viewer.get(`/api/records/${recordId}/reduced`).expect(200)).body;
    expect(full.decimated).toBe(false);
    expect(full.elapsedSeconds).toHaveLength(full.readings);
    expect(full.normalizedHead[full.testStartIndex]).toBeCloseTo(1, 9);
    const small = (await viewer.get(`/api/records/${recordId}/reduced?maxPoints=100`).expect(200)).body;
    expect(small.decimated).toBe(true);
    expect(small.elapsedSeconds.length).toBeLessThanOrEqual(110);
    expect((await viewer.get(`/api/records/${recordId}/reduced?maxPoints=5`)).status).toBe(400);
  });
});

describe('the check lifecycle', () => {
  it('goes Draft → Awaiting check → Sent back → revised → Awaiting check → Checked, e-mailing each side', async () => {
    const fit = await draft(3e-5);
    const sub = await analyst.post(`/api/fits/${fit.id}/submit`).expect(200);
    expect(sub.body.status).toBe('awaiting-check');
    const toChecker = (await ts.outbox(demoEmail('Checker')))[0];
    expect(toChecker.subject).toMatch(/Fit awaiting check/);
    expect(toChecker.text).toContain(`/fits/${fit.id}`);

    const queue = (await checker.get('/api/checks').expect(200)).body.items;
    expect(queue.map((i: { fitId: string }) => i.fitId)).toContain(fit.id);

    const noComment = await checker.post(`/api/fits/${fit.id}/check`, { decision: 'sent-back' });
    expect(noComment.status).toBe(400);
    expect(noComment.body.error.fields.comment).toMatch(/what to change/);
    const back = await checker.post(`/api/fits/${fit.id}/check`, { decision: 'sent-back', comment: 'Use the later segment.' }).expect(200);
    expect(back.body.status).toBe('sent-back');
    const toAnalyst = (await ts.outbox(demoEmail('Analyst')))[0];
    expect(toAnalyst.subject).toMatch(/sent back/);
    expect(toAnalyst.text).toContain('Use the later segment.');

    const revised = await analyst.patch(`/api/fits/${fit.id}`, { line: 'free', window: { kind: 'head', upper: 0.5, lower: 0.1 } }).expect(200);
    expect(revised.body.id).toBe(fit.id);
    expect(revised.body.line).toBe('free');
    await analyst.post(`/api/fits/${fit.id}/submit`, reasonsFor(revised.body)).expect(200);
    const done = await checker.post(`/api/fits/${fit.id}/check`, { decision: 'checked' }).expect(200);
    expect(done.body.status).toBe('checked');
    expect(done.body.checkedBy.name).toBe('Ines Okafor');
    expect((await ts.outbox(demoEmail('Analyst')))[0].subject).toMatch(/Fit checked/);

    const audit = (await viewer.get(`/api/fits/${fit.id}/audit`).expect(200)).body.events;
    expect(audit.map((e: { kind: string }) => e.kind)).toEqual(['created', 'submitted', 'sent-back', 'parameters-changed', 'submitted', 'checked']);
    const change = audit.find((e: { kind: string }) => e.kind === 'parameters-changed');
    expect(change.actor.name).toBe('Tomas Ferreira');
    expect(change.details.changes.line).toEqual({ from: 'anchored', to: 'free' });
    expect(await ts.ds.getRepository(FitEventEntity).countBy({ fitId: fit.id })).toBe(6);
  });

  it('never lets the preparer check their own fit, even as Lead', async () => {
    const fit = await draft(2e-5, lead);
    await lead.post(`/api/fits/${fit.id}/submit`).expect(200);
    const r = await lead.post(`/api/fits/${fit.id}/check`, { decision: 'checked' });
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('SELF_CHECK');
    expect((await ts.ds.getRepository(FitEntity).findOneByOrFail({ id: fit.id })).status).toBe('awaiting-check');
    await checker.post(`/api/fits/${fit.id}/check`, { decision: 'checked' }).expect(200);
  });

  it('refuses transitions the lifecycle does not allow, changing nothing', async () => {
    const fit = await draft();
    const early = await checker.post(`/api/fits/${fit.id}/check`, { decision: 'checked' });
    expect(early.status).toBe(400);
    expect(early.body.error.code).toBe('LIFECYCLE');
    await analyst.post(`/api/fits/${fit.id}/submit`).expect(200);
    expect((await analyst.post(`/api/fits/${fit.id}/submit`)).status).toBe(400);
    const edit = await analyst.patch(`/api/fits/${fit.id}`, { line: 'free' });
    expect(edit.status).toBe(400);
    expect((await ts.ds.getRepository(FitEntity).findOneByOrFail({ id: fit.id })).line).toBe('anchored');
    const otherAnalystEdit = await lead.post(`/api/fits/${fit.id}/submit`);
    expect(otherAnalystEdit.status).toBe(400);
    expect((await checker.post(`/api/fits/${fit.id}/check`, { decision: 'maybe' })).status).toBe(400);
  });

  it('lets only the preparer change or submit a Draft', async () => {
    const fit = await draft();
    const r = await lead.patch(`/api/fits/${fit.id}`, { line: 'free' });
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('NOT_PREPARER');
    expect((await lead.post(`/api/fits/${fit.id}/submit`)).body.error.code).toBe('NOT_PREPARER');
  });

  it('keeps a Checked fit unchanged: a change starts a new revision and the old one stays readable', async () => {
    const fit = await draft(4e-5);
    await analyst.post(`/api/fits/${fit.id}/submit`).expect(200);
    const checked = (await checker.post(`/api/fits/${fit.id}/check`, { decision: 'checked' }).expect(200)).body;
    const rev = await analyst.patch(`/api/fits/${fit.id}`, { window: { kind: 'head', upper: 0.3, lower: 0.1 } });
    expect(rev.status).toBe(201);
    expect(rev.body.id).not.toBe(fit.id);
    expect(rev.body).toMatchObject({ chainId: fit.id, revision: 2, status: 'draft' });
    const old = (await viewer.get(`/api/fits/${fit.id}`).expect(200)).body;
    expect(old.status).toBe('checked');
    expect(old.result).toEqual(checked.result);
    expect(old.windowInput).toBeNull();
    // A second revision while one is open is refused.
    expect((await analyst.patch(`/api/fits/${fit.id}`, { line: 'free' })).status).toBe(400);
    const revs = (await viewer.get(`/api/fits/${rev.body.id}/revisions`).expect(200)).body.fits;
    expect(revs.map((f: { revision: number }) => f.revision)).toEqual([1, 2]);

    await analyst.post(`/api/fits/${rev.body.id}/submit`, reasonsFor(rev.body)).expect(200);
    await checker.post(`/api/fits/${rev.body.id}/check`, { decision: 'checked' }).expect(200);
    const oldAfter = (await viewer.get(`/api/fits/${fit.id}`).expect(200)).body;
    expect(oldAfter.status).toBe('checked');
    expect(oldAfter.supersededAt).not.toBeNull();
  });
});

describe('Well K', () => {
  it('is the geometric mean of the Checked fits only, with count and spread', async () => {
    const well = await ts.ds.getRepository(Well).findOneOrFail({ where: { siteId: ts.demoSiteId }, order: { name: 'DESC' } });
    const before = (await viewer.get(`/api/wells/${well.id}/k`).expect(200)).body;
    const ks: number[] = before.fits.map((f: { kMetersPerSecond: number }) => f.kMetersPerSecond);
    for (const k of [1e-5, 1e-4]) {
      const { recordId } = await insertSyntheticRecord(ts.ds, well.id, { kMetersPerSecond: k });
      const f = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' }).expect(201)).body;
      await analyst.post(`/api/fits/${f.id}/submit`, reasonsFor(f)).expect(200);
      await checker.post(`/api/fits/${f.id}/check`, { decision: 'checked' }).expect(200);
      ks.push(f.result.kMetersPerSecond);
    }
    // A Draft and an Awaiting-check fit do not count.
    const { recordId } = await insertSyntheticRecord(ts.ds, well.id, { kMetersPerSecond: 1e-2 });
    const pending = (await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' }).expect(201)).body;
    await analyst.post(`/api/fits/${pending.id}/submit`, reasonsFor(pending)).expect(200);

    const wk = (await viewer.get(`/api/wells/${well.id}/k`).expect(200)).body;
    const logs = ks.map(Math.log10);
    const mean = logs.reduce((a, b) => a + b, 0) / logs.length;
    // Geometric mean (Freeze 1975: K is log-normal) and the sample standard deviation of log10 K.
    expect(wk.count).toBe(ks.length);
    expect(wk.kMetersPerSecond).toBeCloseTo(10 ** mean, 12);
    const sd = Math.sqrt(logs.reduce((a, b) => a + (b - mean) ** 2, 0) / (logs.length - 1));
    expect(wk.log10StdDev).toBeCloseTo(sd, 10);
  });

  it('is null for a well with no Checked fit', async () => {
    const wells = await ts.ds.getRepository(Well).find({ where: { siteId: ts.demoSiteId } });
    const fitted = new Set((await ts.ds.getRepository(FitEntity).find({ where: { status: 'checked' } })).map((f) => f.wellId));
    const bare = wells.find((w) => !fitted.has(w.id));
    if (!bare) throw new Error('the demo should have at least one well without a Checked fit');
    const wk = (await viewer.get(`/api/wells/${bare.id}/k`).expect(200)).body;
    expect(wk).toMatchObject({ kMetersPerSecond: null, count: 0, log10StdDev: null });
  });
});
