import path from 'node:path';
import type { AddressInfo } from 'node:net';
import Database from 'better-sqlite3';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { afterAll, describe, expect, it } from 'vitest';
import { demoEmail, HttpSession, signedIn, startServerProcess, tempDir, type ServerProcess } from './support';

const LOAD_MS = 8_000;
const FAULT_DELAY_MS = 1_200;
const ok = (status: number) => status >= 200 && status < 300;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const m = (value: number) => ({ value, unit: 'm' });
/** An invented well beside the demo site's, as the well form sends it. */
const wellBody = (name: string, i: number) => ({
  name, coordinates: { kind: 'epsg', epsg: 32632, x: 512100 + i, y: 5290050 }, groundElevation: m(100), measuringPointElevation: m(100.8),
  screenReference: 'depth', screenTop: m(3), screenBottom: m(6), casingRadius: m(0.0254), screenRadius: m(0.0254), boreholeRadius: m(0.1016),
  filterPackPorosity: 0.3, hydroUnit: 'Sand and gravel', aquiferCondition: 'unconfined', saturatedThickness: m(10), staticWaterDepth: m(2.8), status: 'active', notes: '',
});

/**
 * A local SMTP relay that misbehaves on 1 message in 3 while `faulty` is set: it holds the message
 * for a while and then refuses it (451), or holds it and then accepts it. Healthy, it accepts all.
 * Every accepted message is kept with its Message-ID, so repeats can be counted.
 */
async function startFaultyRelay() {
  let n = 0;
  const state = { faulty: true, accepted: [] as { messageId: string; to: string[] }[], refused: 0, delayed: 0 };
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    onData(stream, _session, callback) {
      const i = n++;
      simpleParser(stream)
        .then(async (parsed) => {
          if (state.faulty && i % 3 === 0) {
            state.delayed++;
            await sleep(FAULT_DELAY_MS);
            if ((i / 3) % 2 === 0) {
              state.refused++;
              const e = new Error('Relay busy, try again later') as Error & { responseCode: number };
              e.responseCode = 451;
              return callback(e);
            }
          }
          const to = (Array.isArray(parsed.to) ? parsed.to : parsed.to ? [parsed.to] : []).flatMap((a) => a.value.map((v) => v.address ?? ''));
          state.accepted.push({ messageId: parsed.messageId ?? '', to });
          callback();
        })
        .catch((e: Error) => callback(e));
    },
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  return { state, port: (server.server.address() as AddressInfo).port, close: () => new Promise<void>((r) => server.close(() => r())) };
}

let server: ServerProcess | undefined;
let relay: Awaited<ReturnType<typeof startFaultyRelay>> | undefined;
afterAll(async () => {
  await server?.stop();
  await relay?.close();
});

describe('a mail relay that refuses or delays 1 message in 3', () => {
  it('loses no write answered 2xx, and delivers every queued message once after it recovers', async () => {
    relay = await startFaultyRelay();
    const dbPath = path.join(tempDir('kfield-mail-faults-'), 'kfield.sqlite');
    server = await startServerProcess({
      dbPath,
      env: { FAKE_SMTP: 'false', SMTP_HOST: '127.0.0.1', SMTP_PORT: String(relay.port), MAIL_RETRY_BASE_SECONDS: '0.5', MAIL_MAX_ATTEMPTS: '50' },
    });
    const analyst = await signedIn(server.baseUrl, 'Analyst');
    const checker = await signedIn(server.baseUrl, 'Checker');
    const lead = await signedIn(server.baseUrl, 'Lead');
    const { sites } = await analyst.getJson<{ sites: { id: string; name: string }[] }>('/api/sites');
    const siteId = sites[0].id;
    const { wells } = await analyst.getJson<{ wells: { id: string }[] }>(`/api/sites/${siteId}/wells`);
    const recordIds: string[] = [];
    for (const w of wells) recordIds.push(...(await analyst.getJson<{ records: { id: string }[] }>(`/api/wells/${w.id}/records`)).records.map((r) => r.id));

    const acks = { fits: [] as string[], submitted: [] as string[], checked: [] as string[], invitations: [] as string[], wells: [] as string[] };
    const until = performance.now() + LOAD_MS;
    const running = () => performance.now() < until;

    // Analysts fit and submit (mail to the Checker); the Checker checks (mail to the Analyst); the
    // Lead invites (mail to the invitee) and adds wells (no mail); strangers ask for resets.
    const fitAndSubmit = async (k: number) => {
      for (let i = k; running(); i += 3) {
        const created = await analyst.post(`/api/records/${recordIds[i % recordIds.length]}/fits`, { method: 'hvorslev' });
        if (!ok(created.status)) continue;
        const id = created.json<{ id: string }>().id;
        acks.fits.push(id);
        if (ok((await analyst.post(`/api/fits/${id}/submit`)).status)) acks.submitted.push(id);
      }
    };
    const check = async () => {
      while (running()) {
        const id = acks.submitted.find((f) => !acks.checked.includes(f));
        if (!id) {
          await sleep(50);
          continue;
        }
        const r = await checker.post(`/api/fits/${id}/check`, { decision: 'checked', comment: 'Window and geometry agree with the record.' });
        if (ok(r.status)) acks.checked.push(id);
        else acks.checked.push(`not:${id}`);
      }
    };
    const invite = async () => {
      for (let i = 0; running(); i++) {
        const r = await lead.post(`/api/sites/${siteId}/invitations`, { email: `fault.${i}@demo.kfield.example`, role: 'Viewer' });
        if (ok(r.status)) acks.invitations.push(r.json<{ id: string }>().id);
      }
    };
    const addWells = async () => {
      for (let i = 0; running(); i++) {
        const r = await lead.post(`/api/sites/${siteId}/wells`, wellBody(`MF-${i}`, i));
        if (ok(r.status)) acks.wells.push(r.json<{ id: string }>().id);
        else if (i === 0) throw new Error(`the well body is refused: ${r.text()}`);
      }
    };
    const resets = async () => {
      const stranger = await new HttpSession(server!.baseUrl).refreshCsrf();
      while (running()) {
        await stranger.post('/api/auth/password/forgot', { email: demoEmail('Viewer') });
        await stranger.post('/api/auth/password/forgot', { email: 'nobody.here@demo.kfield.example' });
        await sleep(200);
      }
    };
    await Promise.all([fitAndSubmit(0), fitAndSubmit(1), check(), invite(), addWells(), resets()]);
    console.log(`mail faults: ${acks.fits.length} fits, ${acks.submitted.length} submitted, ${acks.checked.filter((c) => !c.startsWith('not:')).length} checked, ${acks.invitations.length} invitations, ${acks.wells.length} wells answered 2xx; relay delayed ${relay.state.delayed}, refused ${relay.state.refused}`);
    expect(acks.submitted.length).toBeGreaterThan(5);
    expect(relay.state.delayed).toBeGreaterThan(0);

    relay.state.faulty = false;
    const db = new Database(dbPath, { readonly: true, fileMustExist: true });
    try {
      // Every write answered 2xx is in the database, whatever the relay did meanwhile.
      const exists = (table: string) => db.prepare<[string], { status?: string }>(`SELECT * FROM ${table} WHERE id = ?`);
      const fit = exists('fits');
      const lost = {
        fits: acks.fits.filter((id) => !fit.get(id)),
        submitted: acks.submitted.filter((id) => !['awaiting-check', 'checked'].includes(fit.get(id)?.status ?? '')),
        checked: acks.checked.filter((id) => !id.startsWith('not:') && fit.get(id)?.status !== 'checked'),
        invitations: acks.invitations.filter((id) => !exists('invitations').get(id)),
        wells: acks.wells.filter((id) => !exists('wells').get(id)),
      };
      expect(lost).toEqual({ fits: [], submitted: [], checked: [], invitations: [], wells: [] });

      // Every message queued is delivered once the relay recovers (retries every 0.5 s, doubling).
      const deadline = Date.now() + 60_000;
      let pending = Infinity;
      while (Date.now() < deadline) {
        pending = (db.prepare("SELECT count(*) AS n FROM mail_outbox WHERE status <> 'sent'").get() as { n: number }).n;
        if (pending === 0) break;
        await sleep(250);
      }
      expect(pending).toBe(0);

      const queued = db.prepare('SELECT id FROM mail_outbox').all() as { id: string }[];
      const ids = relay.state.accepted.map((m) => m.messageId);
      const repeats = ids.filter((id, i) => ids.indexOf(id) !== i);
      expect(repeats).toEqual([]);
      expect(new Set(ids)).toEqual(new Set(queued.map((q) => `<${q.id}@kfield.outbox>`)));
      // The repeats of one reset within minutes sent nothing new; an address with no account gets nothing.
      expect(relay.state.accepted.filter((m) => m.to.includes(demoEmail('Viewer')))).toHaveLength(1);
      expect(relay.state.accepted.filter((m) => m.to.includes('nobody.here@demo.kfield.example'))).toHaveLength(0);
    } finally {
      db.close();
    }
  });
});
