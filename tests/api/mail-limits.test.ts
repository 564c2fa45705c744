import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEmail, startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
};

describe('mail floods', () => {
  it('sends one reset mail for repeated requests within minutes, and answers each the same', async () => {
    const anon = await ts.client().refreshCsrf();
    const email = demoEmail('Checker');
    const answers = [];
    for (let i = 0; i < 4; i++) answers.push(await anon.post('/api/auth/password/forgot', { email }));
    expect(answers.map((a) => a.status)).toEqual([202, 202, 202, 202]);
    expect(new Set(answers.map((a) => JSON.stringify(a.body))).size).toBe(1);
    expect(await ts.outbox(email)).toHaveLength(1);
  });

  it('refuses reset requests from one client address past its hourly count, whether or not the addresses have accounts', async () => {
    const anon = await ts.client().refreshCsrf();
    const statuses: number[] = [];
    for (let i = 0; i < 25; i++) statuses.push((await anon.post('/api/auth/password/forgot', { email: `stranger.${i}@demo.kfield.example` })).status);
    expect(statuses.filter((s) => s === 202).length).toBeLessThanOrEqual(20);
    const last = await anon.post('/api/auth/password/forgot', { email: demoEmail('Lead') });
    expect(last.status).toBe(429);
    expect(last.body.error.code).toBe('RATE_LIMITED');
    expect(last.headers['retry-after']).toBeTruthy();
  });

  it('does not send a second invitation to the same address within minutes, and caps one account’s invitations', async () => {
    const lead = await ts.as(demoEmail('Lead'));
    const first = await lead.post(`/api/sites/${ts.demoSiteId}/invitations`, { email: 'twice@demo.kfield.example', role: 'Viewer' }).expect(201);
    const again = await lead.post(`/api/sites/${ts.demoSiteId}/invitations`, { email: 'twice@demo.kfield.example', role: 'Analyst' }).expect(201);
    expect(again.body.id).toBe(first.body.id);
    expect(again.body.role).toBe('Analyst');
    expect(await ts.outbox('twice@demo.kfield.example')).toHaveLength(1);

    const statuses: number[] = [];
    for (let i = 0; i < 52; i++) statuses.push((await lead.post(`/api/sites/${ts.demoSiteId}/invitations`, { email: `bulk.${i}@demo.kfield.example`, role: 'Viewer' })).status);
    // 50 requests per account per hour (decision 011); the two to 'twice@' above count.
    expect(statuses.filter((s) => s === 201)).toHaveLength(48);
    expect(statuses.slice(-1)[0]).toBe(429);
  });

  it('never lets a Viewer create a site or invite anyone', async () => {
    const viewer = await ts.as(demoEmail('Viewer'));
    const invite = await viewer.post(`/api/sites/${ts.demoSiteId}/invitations`, { email: 'friend@demo.kfield.example', role: 'Viewer' });
    expect(invite.status).toBe(403);
    const site = await viewer.post('/api/sites', { name: 'Viewer site', epsgCode: 32632, displayUnits: 'SI', hydroUnits: ['Sand'] });
    expect(site.status).toBe(403);
    expect(await ts.outbox('friend@demo.kfield.example')).toHaveLength(0);
  });
});

describe('no account enumeration by time', () => {
  it('answers a reset request in the same time whether or not the account exists (medians within 20 %)', async () => {
    // Each request from its own client address would be fairer to the limits; one client and fresh
    // addresses keep every request a first (mailed) one for the known accounts.
    const known: number[] = [];
    const unknown: number[] = [];
    const accounts = ['Admin', 'Lead', 'Analyst', 'Viewer'] as const;
    for (let round = 0; round < 3; round++) {
      const anon = await ts.client().refreshCsrf();
      for (let i = 0; i < 6; i++) {
        const pairs: [number[], string][] = [
          [known, demoEmail(accounts[(round * 6 + i) % accounts.length])],
          [unknown, `nobody.${round}.${i}@demo.kfield.example`],
        ];
        for (const [list, email] of round % 2 ? pairs.reverse() : pairs) {
          const t0 = performance.now();
          const r = await anon.post('/api/auth/password/forgot', { email });
          list.push(performance.now() - t0);
          expect([202, 429]).toContain(r.status);
        }
      }
    }
    const [k, u] = [median(known), median(unknown)];
    console.log(`reset answer medians: known ${k.toFixed(2)} ms, unknown ${u.toFixed(2)} ms`);
    expect(Math.abs(k - u) / Math.max(k, u)).toBeLessThan(0.2);
  });
});

describe('least exposure', () => {
  it('shows a Viewer members’ names and roles, not their e-mail addresses', async () => {
    const viewer = await ts.as(demoEmail('Viewer'));
    const r = await viewer.get(`/api/sites/${ts.demoSiteId}/members`).expect(200);
    expect(r.body.members.length).toBeGreaterThan(2);
    for (const m of r.body.members) {
      expect(m.name).toBeTruthy();
      expect(m.role).toBeTruthy();
      expect(m.email).toBeNull();
    }
    expect(JSON.stringify(r.body)).not.toMatch(/@/);
    const analyst = await ts.as(demoEmail('Analyst'));
    const seen = await analyst.get(`/api/sites/${ts.demoSiteId}/members`).expect(200);
    expect(seen.body.members.map((m: { email: string }) => m.email)).toContain(demoEmail('Lead'));
  });
});
