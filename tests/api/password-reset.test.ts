import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEmail, linkToken, startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

async function requestReset(email: string) {
  const c = await ts.client().refreshCsrf();
  await c.post('/api/auth/password/forgot', { email }).expect(202);
  return linkToken((await ts.outbox(email))[0].text, 'reset');
}

describe('password reset', () => {
  it('e-mails a link whose new password works, once only, and ends other sessions', async () => {
    const email = demoEmail('Analyst');
    const elsewhere = await ts.as(email);
    const token = await requestReset(email);
    const c = await ts.client().refreshCsrf();
    await c.post('/api/auth/password/reset', { token, password: 'brand-new-password-1' }).expect(200);
    await elsewhere.get('/api/auth/me').expect(401);
    await ts.as(email, 'brand-new-password-1');
    const old = await (await ts.client().refreshCsrf()).post('/api/auth/login', { email, password: 'kfield-demo-pass' });
    expect(old.status).toBe(401);
    const reused = await c.post('/api/auth/password/reset', { token, password: 'another-password-2' });
    expect(reused.status).toBe(400);
    expect(reused.body.error.fields.token).toMatch(/already been used/);
  });

  it('answers 202 for an unknown address and sends nothing', async () => {
    const c = await ts.client().refreshCsrf();
    await c.post('/api/auth/password/forgot', { email: 'nobody@demo.kfield.example' }).expect(202);
    expect(await ts.outbox('nobody@demo.kfield.example')).toHaveLength(0);
  });

  it('refuses an expired link and a password over 72 bytes', async () => {
    const email = demoEmail('Viewer');
    const token = await requestReset(email);
    const c = await ts.client().refreshCsrf();
    const long = await c.post('/api/auth/password/reset', { token, password: 'é'.repeat(37) });
    expect(long.status).toBe(400);
    expect(long.body.error.fields.password).toMatch(/at most 72 bytes/);
    await ts.ds.query('UPDATE password_resets SET expiresAt = ?', [new Date(Date.now() - 1000).toISOString().replace('T', ' ').replace('Z', '')]);
    const expired = await c.post('/api/auth/password/reset', { token, password: 'brand-new-password-1' });
    expect(expired.status).toBe(400);
    expect(expired.body.error.fields.token).toMatch(/expired/);
  });

  it('refuses a malformed e-mail with a field message', async () => {
    const c = await ts.client().refreshCsrf();
    const r = await c.post('/api/auth/password/forgot', { email: 'not mail' });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.email).toMatch(/valid e-mail/);
  });
});
