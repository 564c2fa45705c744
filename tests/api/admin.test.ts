import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { User } from '../../server/features/users/user.entity';
import { demoEmail, linkToken, startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

describe('admin: users', () => {
  it('creates an account with a first password, and one without gets a reset link by e-mail', async () => {
    const admin = await ts.as(demoEmail('Admin'));
    const withPw = await admin.post('/api/admin/users', { email: 'field.tech@demo.kfield.example', name: 'Field Tech', password: 'first-password-12' }).expect(201);
    expect(withPw.body).toMatchObject({ email: 'field.tech@demo.kfield.example', isAdmin: false, disabled: false, memberships: [] });
    await ts.as('field.tech@demo.kfield.example', 'first-password-12');

    await admin.post('/api/admin/users', { email: 'no.password@demo.kfield.example', name: 'No Password' }).expect(201);
    const [mail] = await ts.outbox('no.password@demo.kfield.example');
    const token = linkToken(mail.text, 'reset');
    await (await ts.client().refreshCsrf()).post('/api/auth/password/reset', { token, password: 'chosen-password-1' }).expect(200);
    await ts.as('no.password@demo.kfield.example', 'chosen-password-1');
  });

  it('refuses a duplicate e-mail and bad fields', async () => {
    const admin = await ts.as(demoEmail('Admin'));
    const dup = await admin.post('/api/admin/users', { email: demoEmail('Lead'), name: 'Again' });
    expect(dup.status).toBe(409);
    expect(dup.body.error.fields.email).toBeTruthy();
    const bad = await admin.post('/api/admin/users', { email: 'x', name: '' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['email', 'name']);
  });

  it('disables an account (its sessions end) and enables it again', async () => {
    const admin = await ts.as(demoEmail('Admin'));
    const viewer = await ts.as(demoEmail('Viewer'));
    const id = (await ts.ds.getRepository(User).findOneByOrFail({ email: demoEmail('Viewer') })).id;
    const r = await admin.patch(`/api/admin/users/${id}`, { disabled: true }).expect(200);
    expect(r.body.disabled).toBe(true);
    await viewer.get('/api/auth/me').expect(401);
    await admin.patch(`/api/admin/users/${id}`, { disabled: false }).expect(200);
    await ts.as(demoEmail('Viewer'));
  });

  it('answers an empty change to an account with the account as it is (not 500)', async () => {
    const admin = await ts.as(demoEmail('Admin'));
    const { users } = (await admin.get('/api/admin/users').expect(200)).body as { users: { id: string; email: string; name: string }[] };
    const viewer = users.find((u) => u.email === demoEmail('Viewer'))!;
    for (const body of [{}, { unknown: 1 }]) {
      const r = await admin.patch(`/api/admin/users/${viewer.id}`, body);
      expect(r.status).toBe(200);
      expect(r.body.name).toBe(viewer.name);
    }
  });

  it('will not let an Admin lock themselves out', async () => {
    const admin = await ts.as(demoEmail('Admin'));
    const me = (await admin.get('/api/auth/me')).body.user;
    const r = await admin.patch(`/api/admin/users/${me.id}`, { disabled: true });
    expect(r.status).toBe(409);
    expect((await admin.patch(`/api/admin/users/${me.id}`, { isAdmin: false })).status).toBe(409);
  });

  it('sends a reset link on request and lists memberships', async () => {
    const admin = await ts.as(demoEmail('Admin'));
    const users = (await admin.get('/api/admin/users').expect(200)).body.users;
    const checker = users.find((u: { email: string }) => u.email === demoEmail('Checker'));
    expect(checker.memberships[0]).toMatchObject({ role: 'Checker', siteName: expect.stringMatching(/Willow Bend/) });
    await admin.post(`/api/admin/users/${checker.id}/reset`).expect(202);
    expect((await ts.outbox(demoEmail('Checker')))[0].subject).toMatch(/Reset your Kfield password/);
  });
});

describe('admin: outbox', () => {
  it('shows what Kfield queued and sent, newest first, and clears the sent messages', async () => {
    const admin = await ts.as(demoEmail('Admin'));
    const lead = await ts.as(demoEmail('Lead'));
    await lead.post(`/api/sites/${ts.demoSiteId}/invitations`, { email: 'outbox.check@demo.kfield.example', role: 'Viewer' }).expect(201);
    const r = await admin.get('/api/admin/outbox').expect(200);
    expect(r.body.messages[0]).toMatchObject({ to: ['outbox.check@demo.kfield.example'], subject: expect.stringMatching(/invited/) });
    expect(r.body.messages[0].text).toMatch(/\/invitations\//);
    await ts.kfield.mail.drain();
    const sent = await admin.get('/api/admin/outbox').expect(200);
    expect(sent.body.messages[0]).toMatchObject({ status: 'sent', attempts: 1, sentAt: expect.any(String), nextAttemptAt: null });
    expect(sent.body.counts.sent).toBe(sent.body.messages.length);
    expect((await ts.delivered('outbox.check@demo.kfield.example'))).toHaveLength(1);
    await admin.delete('/api/admin/outbox').expect(204);
    expect((await admin.get('/api/admin/outbox')).body.messages).toEqual([]);
  });
});
