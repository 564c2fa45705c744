import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { User } from '../../server/features/users/user.entity';
import { DEMO_PASSWORD, demoEmail, linkToken, startTestServer, type ApiClient, type TestServer } from '../support/test-server';

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

async function timedLogin(c: ApiClient, email: string, password: string, from?: string) {
  const t0 = performance.now();
  const req = c.agent.post('/api/auth/login').set('x-csrf-token', c.csrf);
  const r = await (from ? req.set('X-Forwarded-For', from) : req).send({ email, password });
  return { status: r.status, body: r.body, headers: r.headers, ms: performance.now() - t0 };
}

// Issue 16 item 6; OWASP ASVS 5.0 §6.3 (authentication does not reveal which accounts exist).
describe('sign-in does not tell accounts apart', () => {
  let ts: TestServer;
  beforeAll(async () => {
    // The production cost factor, so that a dummy hash of a different cost would show.
    ts = await startTestServer({ BCRYPT_COST: '12', LOGIN_MAX_FAILURES: '1000', LOGIN_MAX_FAILURES_PER_ACCOUNT_ADDRESS: '1000', LOGIN_SLOWDOWN_AFTER_PER_ADDRESS: '1000' });
  }, 60_000);
  afterAll(async () => ts.close());

  it('costs the same bcrypt work for an unknown e-mail as for a known one (medians of 15 within 20 %)', async () => {
    const c = await ts.client().refreshCsrf();
    await timedLogin(c, 'warm-up@demo.kfield.example', 'wrong-password-0');
    await timedLogin(c, demoEmail('Viewer'), 'wrong-password-0');
    const known: number[] = [];
    const unknown: number[] = [];
    for (let i = 0; i < 15; i++) {
      const k = await timedLogin(c, demoEmail('Viewer'), `wrong-password-${i}`);
      const u = await timedLogin(c, `nobody-${i}@demo.kfield.example`, `wrong-password-${i}`);
      expect([k.status, u.status]).toEqual([401, 401]);
      known.push(k.ms);
      unknown.push(u.ms);
    }
    const [mk, mu] = [median(known), median(unknown)];
    console.log(`sign-in medians at BCRYPT_COST=12: known e-mail ${mk.toFixed(0)} ms, unknown e-mail ${mu.toFixed(0)} ms`);
    expect(Math.abs(mu - mk) / mk).toBeLessThan(0.2);
  }, 120_000);

  it('answers a disabled account like a wrong password (401, same code and message)', async () => {
    const email = demoEmail('Checker');
    await ts.ds.getRepository(User).update({ email }, { disabled: true });
    try {
      const c = await ts.client().refreshCsrf();
      const disabled = await timedLogin(c, email, DEMO_PASSWORD);
      const wrong = await timedLogin(c, demoEmail('Analyst'), 'not-the-password');
      expect(disabled.status).toBe(401);
      expect(disabled.body).toEqual(wrong.body);
    } finally {
      await ts.ds.getRepository(User).update({ email }, { disabled: false });
    }
  });
});

// Issue 16 item 7: failures count per account and per account-and-address; an address alone is
// only slowed down, so a crowd behind one address is not locked out by someone else's guessing.
describe('sign-in lockouts', () => {
  const env = { TRUST_PROXY: 'true' };

  it('refuses an account from the address that failed too often (429, Retry-After), not from another address', async () => {
    const ts = await startTestServer({ ...env, LOGIN_MAX_FAILURES: '100', LOGIN_MAX_FAILURES_PER_ACCOUNT_ADDRESS: '3' });
    try {
      const c = await ts.client().refreshCsrf();
      for (let i = 0; i < 3; i++) expect((await timedLogin(c, demoEmail('Analyst'), 'wrong-password-x', '198.51.100.7')).status).toBe(401);
      const blocked = await timedLogin(c, demoEmail('Analyst'), DEMO_PASSWORD, '198.51.100.7');
      expect(blocked.status).toBe(429);
      expect(blocked.body.error.code).toBe('RATE_LIMITED');
      expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
      expect((await timedLogin(await ts.client().refreshCsrf(), demoEmail('Analyst'), DEMO_PASSWORD, '203.0.113.9')).status).toBe(200);
    } finally {
      await ts.close();
    }
  });

  it('refuses an account that failed too often from many addresses, everywhere', async () => {
    const ts = await startTestServer({ ...env, LOGIN_MAX_FAILURES: '4', LOGIN_MAX_FAILURES_PER_ACCOUNT_ADDRESS: '100' });
    try {
      const c = await ts.client().refreshCsrf();
      for (let i = 0; i < 4; i++) expect((await timedLogin(c, demoEmail('Analyst'), 'wrong-password-x', `198.51.100.${i + 1}`)).status).toBe(401);
      const blocked = await timedLogin(c, demoEmail('Analyst'), DEMO_PASSWORD, '203.0.113.50');
      expect(blocked.status).toBe(429);
      expect(blocked.body.error.message).toMatch(/for this account/);
      expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    } finally {
      await ts.close();
    }
  });

  it('never refuses an address for failures across accounts: a correct password for another account still signs in', async () => {
    const ts = await startTestServer(env);
    try {
      const c = await ts.client().refreshCsrf();
      // Twelve failures from one address, over several accounts (the old per-address limit refused the 11th).
      for (let i = 0; i < 12; i++) {
        const who = i % 2 ? `guess-${i}@demo.kfield.example` : demoEmail(i % 4 ? 'Viewer' : 'Checker');
        expect((await timedLogin(c, who, `wrong-password-${i}`, '198.51.100.20')).status).toBe(401);
      }
      const ok = await timedLogin(await ts.client().refreshCsrf(), demoEmail('Lead'), DEMO_PASSWORD, '198.51.100.20');
      expect(ok.status).toBe(200);
    } finally {
      await ts.close();
    }
  });

  it('slows an address down after many failures, with a growing delay, but still answers', async () => {
    const ts = await startTestServer({ ...env, LOGIN_SLOWDOWN_AFTER_PER_ADDRESS: '3' });
    try {
      const c = await ts.client().refreshCsrf();
      const times: number[] = [];
      for (let i = 0; i < 6; i++) {
        const r = await timedLogin(c, `guess-${i}@demo.kfield.example`, 'wrong-password-x', '198.51.100.30');
        expect(r.status).toBe(401);
        times.push(r.ms);
      }
      const before = median(times.slice(0, 3));
      expect(times[3] - before).toBeGreaterThan(400);
      expect(times[5] - times[3]).toBeGreaterThan(400);
      const ok = await timedLogin(await ts.client().refreshCsrf(), demoEmail('Lead'), DEMO_PASSWORD, '198.51.100.30');
      expect(ok.status).toBe(200);
      // Another address is not slowed.
      const other = await timedLogin(c, 'guess-x@demo.kfield.example', 'wrong-password-x', '203.0.113.30');
      expect(other.ms).toBeLessThan(before + 400);
    } finally {
      await ts.close();
    }
  }, 30_000);
});

// Issue 16 item 8; OWASP ASVS 5.0 §6.2.4, §6.2.11, §6.2.12: common and breached passwords and the
// account's own words are refused where a password is chosen, with the reason on the field.
describe('new passwords', () => {
  let ts: TestServer;
  beforeAll(async () => {
    ts = await startTestServer();
  });
  afterAll(async () => ts.close());

  async function invitationToken(email: string) {
    const lead = await ts.as(demoEmail('Lead'));
    await lead.post(`/api/sites/${ts.demoSiteId}/invitations`, { email, role: 'Viewer' }).expect(201);
    return linkToken((await ts.outbox(email))[0].text, 'invitation');
  }
  async function resetToken(email: string) {
    const c = await ts.client().refreshCsrf();
    await c.post('/api/auth/password/forgot', { email }).expect(202);
    return linkToken((await ts.outbox(email))[0].text, 'reset');
  }

  it('refuses a common password when an Admin creates an account', async () => {
    const admin = await ts.as(demoEmail('Admin'));
    const r = await admin.post('/api/admin/users', { email: 'common.pw@demo.kfield.example', name: 'Common Pw', password: 'qwerty123456' });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.password).toMatch(/common and breached/);
  });

  it('refuses a password of one repeated character on reset', async () => {
    const token = await resetToken(demoEmail('Viewer'));
    const c = await ts.client().refreshCsrf();
    const r = await c.post('/api/auth/password/reset', { token, password: 'zzzzzzzzzzzzzzzz' });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.password).toMatch(/one character repeated/);
  });

  it('refuses a common password when accepting an invitation', async () => {
    const token = await invitationToken('common.accept@demo.kfield.example');
    const c = await ts.client().refreshCsrf();
    const r = await c.post('/api/invitations/accept', { token, name: 'Cara Common', password: '1qaz2wsx3edc' });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.password).toMatch(/common and breached/);
  });

  it("refuses the account's own name when an Admin creates an account", async () => {
    const admin = await ts.as(demoEmail('Admin'));
    const r = await admin.post('/api/admin/users', { email: 'named.pw@demo.kfield.example', name: 'Juniper Okonkwo', password: 'juniper-okonkwo-77' });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.password).toMatch(/your name/);
  });

  it("refuses the account's own e-mail on reset", async () => {
    const email = demoEmail('Analyst');
    const token = await resetToken(email);
    const c = await ts.client().refreshCsrf();
    const r = await c.post('/api/auth/password/reset', { token, password: `${email}!` });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.password).toMatch(/your e-mail/);
  });

  it("refuses the new account's name when accepting an invitation", async () => {
    const token = await invitationToken('named.accept@demo.kfield.example');
    const c = await ts.client().refreshCsrf();
    const r = await c.post('/api/invitations/accept', { token, name: 'Odile Brennan', password: 'odile-brennan-1990' });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.password).toMatch(/your name/);
  });
});
