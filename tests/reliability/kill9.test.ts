import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, describe, expect, it } from 'vitest';
import { LOGGER_SETTINGS, loggerCsv, multipart, signedIn, startServerProcess, tempDir, type HttpSession, type ServerProcess } from './support';

const ROUNDS = 10;
const ROWS = 1_000_000;
const FIT_LOOPS = 3;
const TAPE_LOOPS = 1;
// Small typed records beside the big upload: a record write that can be answered before the kill.
const TAPE_BODY = {
  testType: 'slug-in',
  readings: [0, 1, 2, 3, 4, 5].map((t) => ({ time: t, depth: 2 + 0.3 * Math.exp(-t) })),
  timeFormat: 's',
  units: 'm',
  static: 2,
  slugVolume: { value: 1, unit: 'L' },
  notes: 'Invented kill -9 test record',
};
const KILL_FROM_MS = 300;
const KILL_TO_MS = 3000;
const SUBMITTED = new Set(['awaiting-check', 'checked', 'sent-back']);

interface RoundAcks {
  recordIds: string[];
  fitIds: string[];
  submittedFitIds: string[];
  unanswered: number;
}

/** Fit a demo record and submit the fit, over and over, until the server dies; keep every id answered 2xx. */
async function fitLoop(analyst: HttpSession, recordIds: string[], acks: RoundAcks, stopped: () => boolean) {
  let i = Math.floor(Math.random() * recordIds.length);
  while (!stopped()) {
    const recordId = recordIds[i++ % recordIds.length];
    try {
      const created = await analyst.post(`/api/records/${recordId}/fits`, { method: 'hvorslev' });
      if (created.status < 200 || created.status >= 300) continue;
      const fitId = created.json<{ id: string }>().id;
      acks.fitIds.push(fitId);
      const submitted = await analyst.post(`/api/fits/${fitId}/submit`);
      if (submitted.status >= 200 && submitted.status < 300) acks.submittedFitIds.push(fitId);
    } catch {
      acks.unanswered++;
      if (stopped()) return;
    }
  }
}

async function tapeLoop(analyst: HttpSession, wellId: string, acks: RoundAcks, stopped: () => boolean) {
  while (!stopped()) {
    try {
      const a = await analyst.post(`/api/wells/${wellId}/records`, TAPE_BODY);
      if (a.status >= 200 && a.status < 300) acks.recordIds.push(a.json<{ id: string }>().id);
    } catch {
      acks.unanswered++;
    }
  }
}

function checkDatabase(dbPath: string, acks: RoundAcks) {
  const db = new Database(dbPath, { readonly: true, fileMustExist: true });
  try {
    const integrity = (db.pragma('integrity_check') as { integrity_check: string }[]).map((r) => r.integrity_check).join('; ');
    const fitStatus = db.prepare<[string], { status: string }>('SELECT status FROM fits WHERE id = ?');
    const recordFiles = db.prepare<[string], { n: number }>('SELECT COUNT(*) AS n FROM record_files WHERE recordId = ?');
    const recordRow = db.prepare<[string], { id: string }>('SELECT id FROM records WHERE id = ?');
    return {
      integrity,
      lostFits: acks.fitIds.filter((id) => !fitStatus.get(id)),
      lostSubmits: acks.submittedFitIds.filter((id) => !SUBMITTED.has(fitStatus.get(id)?.status ?? '')),
      lostRecords: acks.recordIds.filter((id) => !recordRow.get(id) || recordFiles.get(id)!.n === 0),
    };
  } finally {
    db.close();
  }
}

let server: ServerProcess | undefined;
const dir = tempDir('kfield-kill9-');
afterAll(async () => {
  await server?.stop();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe('kill -9 during a million-row upload with fits being created and submitted', () => {
  it(`loses no write answered 2xx and keeps the database intact across ${ROUNDS} kills`, async () => {
    const dbPath = path.join(dir, 'kfield.sqlite');
    const csv = loggerCsv(ROWS);
    const upload = multipart([
      { name: 'settings', value: JSON.stringify(LOGGER_SETTINGS) },
      { name: 'file', value: csv, filename: 'kill9-1m.csv', contentType: 'text/csv' },
    ]);
    server = await startServerProcess({ dbPath, env: { RECORD_MAX_UPLOAD_MB: '200' } });

    // Demo records to fit, and a demo well to upload to, as the first (seeded) start left them.
    const first = await signedIn(server.baseUrl, 'Analyst');
    const { sites } = await first.getJson<{ sites: { id: string }[] }>('/api/sites');
    const { wells } = await first.getJson<{ wells: { id: string; name: string }[] }>(`/api/sites/${sites[0].id}/wells`);
    const uploadWellId = wells.find((w) => w.name === 'MW-15')?.id ?? wells[0].id;
    const demoRecordIds: string[] = [];
    for (const w of wells) {
      const { records } = await first.getJson<{ records: { id: string }[] }>(`/api/wells/${w.id}/records`);
      demoRecordIds.push(...records.map((r) => r.id));
    }
    expect(demoRecordIds.length).toBeGreaterThan(0);

    const problems: string[] = [];
    const totals = { fits: 0, submits: 0, records: 0, lost: 0 };
    for (let round = 1; round <= ROUNDS; round++) {
      const analyst = await signedIn(server.baseUrl, 'Analyst');
      const acks: RoundAcks = { recordIds: [], fitIds: [], submittedFitIds: [], unanswered: 0 };
      let killed = false;
      const started = performance.now();
      let uploadAnswer = 'no answer';
      const uploading = analyst
        .request('POST', `/api/wells/${uploadWellId}/records`, { body: upload.body, headers: { 'content-type': upload.contentType } })
        .then(
          (a) => {
            uploadAnswer = String(a.status);
            if (a.status >= 200 && a.status < 300) acks.recordIds.push(a.json<{ id: string }>().id);
            else problems.push(`round ${round}: the upload answered ${a.status}: ${a.text().slice(0, 200)}`);
          },
          () => undefined,
        );
      const loops = [
        ...Array.from({ length: FIT_LOOPS }, () => fitLoop(analyst, demoRecordIds, acks, () => killed)),
        ...Array.from({ length: TAPE_LOOPS }, () => tapeLoop(analyst, uploadWellId, acks, () => killed)),
      ];

      const killAtMs = KILL_FROM_MS + Math.random() * (KILL_TO_MS - KILL_FROM_MS);
      await new Promise((r) => setTimeout(r, killAtMs - (performance.now() - started)));
      await server.kill9();
      killed = true;
      await Promise.all([uploading, ...loops]);

      server = await startServerProcess({ dbPath, env: { RECORD_MAX_UPLOAD_MB: '200' } });
      const check = checkDatabase(dbPath, acks);
      const lost = check.lostFits.length + check.lostSubmits.length + check.lostRecords.length;
      totals.fits += acks.fitIds.length;
      totals.submits += acks.submittedFitIds.length;
      totals.records += acks.recordIds.length;
      totals.lost += lost;
      console.log(
        `round ${String(round).padStart(2)}: killed at ${killAtMs.toFixed(0).padStart(4)} ms; upload ${uploadAnswer}; answered 2xx: ` +
          `${acks.fitIds.length} fits, ${acks.submittedFitIds.length} submits, ${acks.recordIds.length} records; ${acks.unanswered} requests cut off; ` +
          `after restart: integrity ${check.integrity}; lost ${check.lostFits.length} fits, ${check.lostSubmits.length} submits, ${check.lostRecords.length} records`,
      );
      if (check.integrity !== 'ok') problems.push(`round ${round}: integrity_check says ${check.integrity}`);
      if (check.lostFits.length) problems.push(`round ${round}: fits answered 201 but missing after the restart: ${check.lostFits.join(', ')}`);
      if (check.lostSubmits.length) problems.push(`round ${round}: submits answered 200 but the fit is not awaiting check after the restart: ${check.lostSubmits.join(', ')}`);
      if (check.lostRecords.length) problems.push(`round ${round}: records answered 201 but missing after the restart: ${check.lostRecords.join(', ')}`);
    }
    console.log(`kill -9 × ${ROUNDS}: answered 2xx ${totals.fits} fits, ${totals.submits} submits, ${totals.records} records; lost ${totals.lost}`);
    // A kind of write never answered 2xx would prove nothing about that kind.
    expect(totals.fits, 'no fit was answered 2xx in any round').toBeGreaterThan(0);
    expect(totals.submits, 'no submit was answered 2xx in any round').toBeGreaterThan(0);
    expect(totals.records, 'no record was answered 2xx in any round').toBeGreaterThan(0);
    expect(problems).toEqual([]);
  });
});
