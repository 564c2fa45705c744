import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, demoEmail, startTestServer, type TestServer } from '../support/test-server';
import { User } from '../../server/features/users/user.entity';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const sid = (res: request.Response) => {
  const c = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((s) => s.startsWith('kfield.sid='));
  return c ? c.split(';')[0] : null;
};

describe('sign-in', () => {
  it('answers 401 to /api/auth/me when signed out', async () => {
    const r = await ts.client().get('/api/auth/me');
    expect(r.status).toBe(401);
    expect(r.body.error.code).toBe('UNAUTHENTICATED');
  });

  it('signs in each demo role and returns the user', async () => {
    for (const role of ['Admin', 'Lead', 'Analyst', 'Checker', 'Viewer'] as const) {
      const c = await ts.as(demoEmail(role));
      const me = await c.get('/api/auth/me').expect(200);
      expect(me.body.user.email).toBe(demoEmail(role));
      expect(me.body.user.isAdmin).toBe(role === 'Admin');
    }
  });

  it('sets an HttpOnly SameSite=Lax session cookie and changes the session id at sign-in', async () => {
    const c = ts.client();
    const before = await c.get('/api/auth/csrf');
    const anonSid = sid(before);
    expect(anonSid).toBeTruthy();
    c.csrf = before.body.csrfToken;
    const login = await c.post('/api/auth/login', { email: demoEmail('Lead'), password: DEMO_PASSWORD }).expect(200);
    const cookie = ([] as string[]).concat(login.headers['set-cookie']).find((s) => s.startsWith('kfield.sid='))!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Secure/);
    expect(sid(login)).not.toBe(anonSid);
    // The old anonymous id no longer carries anything.
    const stale = await request(ts.server).get('/api/auth/me').set('Cookie', anonSid!);
    expect(stale.status).toBe(401);
  });

  it('refuses wrong passwords with 401 and the same message for unknown accounts', async () => {
    const c = await ts.client().refreshCsrf();
    const wrong = await c.post('/api/auth/login', { email: demoEmail('Viewer'), password: 'not-the-password' });
    const unknown = await c.post('/api/auth/login', { email: 'nobody@demo.kfield.example', password: 'not-the-password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
  });

  it('names the bad field when the e-mail is malformed or the password missing', async () => {
    const c = await ts.client().refreshCsrf();
    const r = await c.post('/api/auth/login', { email: 'not-an-email', password: '' });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.email).toMatch(/valid e-mail/);
    expect(r.body.error.fields.password).toMatch(/required/);
  });

  it('answers 400 to a body that is not JSON', async () => {
    const c = await ts.client().refreshCsrf();
    const r = await c.agent.post('/api/auth/login').set('x-csrf-token', c.csrf).set('Content-Type', 'application/json').send('{"email":');
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('MALFORMED_JSON');
  });

  it('sign-out destroys the session', async () => {
    const c = await ts.as(demoEmail('Analyst'));
    await c.get('/api/auth/me').expect(200);
    const out = await c.post('/api/auth/logout').expect(200);
    expect(out.body.csrfToken).toBeTruthy();
    await c.get('/api/auth/me').expect(401);
  });

  it('refuses a disabled account and ends its sessions', async () => {
    const c = await ts.as(demoEmail('Checker'));
    await ts.ds.getRepository(User).update({ email: demoEmail('Checker') }, { disabled: true });
    await c.get('/api/auth/me').expect(401);
    const again = await ts.client().refreshCsrf();
    const r = await again.post('/api/auth/login', { email: demoEmail('Checker'), password: DEMO_PASSWORD });
    // Answered like a wrong password (issue 16 item 6: no account enumeration).
    expect(r.status).toBe(401);
    expect(r.body.error.code).toBe('BAD_CREDENTIALS');
    await ts.ds.getRepository(User).update({ email: demoEmail('Checker') }, { disabled: false });
  });
});

describe('CSRF', () => {
  it('refuses a state-changing call without the token with 403', async () => {
    const c = await ts.as(demoEmail('Lead'));
    const r = await c.agent.post('/api/sites').send({ name: 'X', epsgCode: 32632, displayUnits: 'SI' });
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('CSRF_INVALID');
  });

  it('refuses a wrong token with 403', async () => {
    const c = await ts.as(demoEmail('Lead'));
    const r = await c.agent.post('/api/sites').set('x-csrf-token', 'forged-token').send({ name: 'X', epsgCode: 32632, displayUnits: 'SI' });
    expect(r.status).toBe(403);
    // The code, too: a Lead creating a site is refused anyway (SITE_CREATOR_REQUIRED) once past CSRF.
    expect(r.body.error.code).toBe('CSRF_INVALID');
  });

  it('refuses sign-in without the token', async () => {
    const r = await ts.client().agent.post('/api/auth/login').send({ email: demoEmail('Lead'), password: DEMO_PASSWORD });
    expect(r.status).toBe(403);
  });
});

describe('sessions', () => {
  it('survive a server restart on the same database file', async () => {
    const first = await startTestServer({ LOGIN_MAX_FAILURES: '100' });
    const c = await first.as(demoEmail('Lead'));
    const cookie = (await c.get('/api/auth/me').expect(200)).request.cookies;
    const dbPath = first.dbPath;
    await first.close();
    const second = await startTestServer({}, dbPath);
    try {
      const r = await request(second.server).get('/api/auth/me').set('Cookie', cookie);
      expect(r.status).toBe(200);
      expect(r.body.user.email).toBe(demoEmail('Lead'));
    } finally {
      await second.close();
    }
  });

  it('end after the absolute lifetime even when active', async () => {
    const short = await startTestServer({ SESSION_ABSOLUTE_SECONDS: '1' });
    try {
      const c = await short.as(demoEmail('Lead'));
      await c.get('/api/auth/me').expect(200);
      await new Promise((r) => setTimeout(r, 1300));
      await c.get('/api/auth/me').expect(401);
    } finally {
      await short.close();
    }
  });
});

describe('rate limiting', () => {
  it('answers the 6th failed sign-in for one account from one address within the window with 429 and a retry time', async () => {
    const limited = await startTestServer();
    try {
      const email = demoEmail('Viewer');
      for (let i = 0; i < 5; i++) {
        const c = await limited.client().refreshCsrf();
        expect((await c.post('/api/auth/login', { email, password: `wrong-password-${i}` })).status).toBe(401);
      }
      const c = await limited.client().refreshCsrf();
      const r = await c.post('/api/auth/login', { email, password: DEMO_PASSWORD });
      expect(r.status).toBe(429);
      expect(r.body.error.code).toBe('RATE_LIMITED');
      expect(r.body.error.message).toMatch(/Try again in \d+ minutes?/);
      expect(Number(r.headers['retry-after'])).toBeGreaterThan(0);
    } finally {
      await limited.close();
    }
  });

  it('limits per account, and another account from the same address still signs in', async () => {
    const limited = await startTestServer({ LOGIN_MAX_FAILURES: '3' });
    try {
      for (let i = 0; i < 3; i++) {
        const c = await limited.client().refreshCsrf();
        await c.post('/api/auth/login', { email: demoEmail('Analyst'), password: 'wrong-password-x' }).expect(401);
      }
      const c = await limited.client().refreshCsrf();
      const r = await c.post('/api/auth/login', { email: demoEmail('Analyst'), password: DEMO_PASSWORD });
      expect(r.status).toBe(429);
      expect(r.body.error.message).toMatch(/for this account/);
      await limited.as(demoEmail('Lead'));
    } finally {
      await limited.close();
    }
  });

  it('does not count successful sign-ins', async () => {
    const limited = await startTestServer({ LOGIN_MAX_FAILURES: '2' });
    try {
      for (let i = 0; i < 4; i++) await limited.as(demoEmail('Lead'));
    } finally {
      await limited.close();
    }
  });
});
