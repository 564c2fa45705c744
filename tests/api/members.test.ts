import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Invitation } from '../../server/features/members/invitation.entity';
import { Membership } from '../../server/features/sites/membership.entity';
import { User } from '../../server/features/users/user.entity';
import { createApp } from '../../server/app';
import { createMailer } from '../../server/features/mail/mailer';
import request from 'supertest';
import { DEMO_PASSWORD, demoEmail, linkToken, startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const members = (siteId: string) => `/api/sites/${siteId}/members`;

describe('invitations', () => {
  it('e-mails a single-use link that creates the account with the invited role', async () => {
    const lead = await ts.as(demoEmail('Lead'));
    const inv = await lead.post(`/api/sites/${ts.demoSiteId}/invitations`, { email: 'New.Geologist@Demo.Kfield.Example', role: 'Checker' }).expect(201);
    expect(inv.body.email).toBe('new.geologist@demo.kfield.example');
    const [mail] = await ts.outbox('new.geologist@demo.kfield.example');
    expect(mail.subject).toMatch(/invited to Willow Bend/);
    const token = linkToken(mail.text, 'invitation');
    // The token is stored only as a hash.
    expect(await ts.ds.getRepository(Invitation).countBy({ tokenHash: token })).toBe(0);

    const anon = await ts.client().refreshCsrf();
    const preview = await anon.get(`/api/invitations/${token}`).expect(200);
    expect(preview.body).toMatchObject({ role: 'Checker', accountExists: false, siteName: expect.stringMatching(/Willow Bend/) });
    const accepted = await anon.post('/api/invitations/accept', { token, name: 'Nia Geologist', password: 'a-long-new-password' }).expect(200);
    anon.csrf = accepted.body.csrfToken;
    const sites = (await anon.get('/api/sites').expect(200)).body.sites;
    expect(sites).toHaveLength(1);
    expect(sites[0].myRole).toBe('Checker');

    const again = await ts.client().refreshCsrf();
    const reused = await again.post('/api/invitations/accept', { token, name: 'Someone', password: 'another-password-1' });
    expect(reused.status).toBe(410);
    expect(reused.body.error.code).toBe('INVITATION_USED');
  });

  it('refuses an expired invitation and a too-short password without creating anything', async () => {
    const lead = await ts.as(demoEmail('Lead'));
    await lead.post(`/api/sites/${ts.demoSiteId}/invitations`, { email: 'late@demo.kfield.example', role: 'Viewer' }).expect(201);
    const token = linkToken((await ts.outbox('late@demo.kfield.example'))[0].text, 'invitation');
    const anon = await ts.client().refreshCsrf();
    const short = await anon.post('/api/invitations/accept', { token, name: 'Late', password: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.error.fields.password).toMatch(/at least 12 bytes/);
    const long = await anon.post('/api/invitations/accept', { token, name: 'Late', password: 'x'.repeat(73) });
    expect(long.body.error.fields.password).toMatch(/at most 72 bytes/);
    expect(await ts.ds.getRepository(User).countBy({ email: 'late@demo.kfield.example' })).toBe(0);

    await ts.ds.getRepository(Invitation).update({ email: 'late@demo.kfield.example' }, { expiresAt: new Date(Date.now() - 1000) });
    const expired = await anon.post('/api/invitations/accept', { token, name: 'Late', password: 'a-long-new-password' });
    expect(expired.status).toBe(410);
    expect(expired.body.error.code).toBe('INVITATION_EXPIRED');
    expect(await ts.ds.getRepository(User).countBy({ email: 'late@demo.kfield.example' })).toBe(0);
  });

  it('adds an existing account that proves its password', async () => {
    // A site the demo Viewer leads: only Admins create sites by default, so the Admin creates it and makes the Viewer its Lead.
    const admin = await ts.as(demoEmail('Admin'));
    const own = (await admin.post('/api/sites', { name: 'Viewer own', epsgCode: 4326, displayUnits: 'SI' }).expect(201)).body;
    const viewerId = (await ts.ds.getRepository(User).findOneByOrFail({ email: demoEmail('Viewer') })).id;
    await ts.ds.getRepository(Membership).insert({ siteId: own.id, userId: viewerId, role: 'Lead' });
    const outsiderLead = await ts.as(demoEmail('Viewer'));
    await outsiderLead.post(`/api/sites/${own.id}/invitations`, { email: demoEmail('Analyst'), role: 'Analyst' }).expect(201);
    const token = linkToken((await ts.outbox(demoEmail('Analyst')))[0].text, 'invitation');
    const anon = await ts.client().refreshCsrf();
    expect((await anon.get(`/api/invitations/${token}`)).body.accountExists).toBe(true);
    const wrong = await anon.post('/api/invitations/accept', { token, password: 'not-my-password' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields.password).toBeTruthy();
    await anon.post('/api/invitations/accept', { token, password: DEMO_PASSWORD }).expect(200);
    const analystId = (await ts.ds.getRepository(User).findOneByOrFail({ email: demoEmail('Analyst') })).id;
    expect((await ts.ds.getRepository(Membership).findOneByOrFail({ siteId: own.id, userId: analystId })).role).toBe('Analyst');
  });

  it('refuses to invite a current member, and a Lead can revoke a pending invitation', async () => {
    const lead = await ts.as(demoEmail('Lead'));
    const dup = await lead.post(`/api/sites/${ts.demoSiteId}/invitations`, { email: demoEmail('Checker'), role: 'Viewer' });
    expect(dup.status).toBe(409);
    expect(dup.body.error.code).toBe('ALREADY_MEMBER');
    const inv = (await lead.post(`/api/sites/${ts.demoSiteId}/invitations`, { email: 'revoke.me@demo.kfield.example', role: 'Viewer' }).expect(201)).body;
    const listed = (await lead.get(members(ts.demoSiteId)).expect(200)).body.invitations;
    expect(listed.map((i: { id: string }) => i.id)).toContain(inv.id);
    await lead.delete(`/api/sites/${ts.demoSiteId}/invitations/${inv.id}`).expect(204);
    const token = linkToken((await ts.outbox('revoke.me@demo.kfield.example'))[0].text, 'invitation');
    expect((await ts.client().get(`/api/invitations/${token}`)).status).toBe(404);
  });

  it('hides pending invitations from members who are not Leads', async () => {
    const viewer = await ts.as(demoEmail('Viewer'));
    const r = await viewer.get(members(ts.demoSiteId)).expect(200);
    expect(r.body.members.length).toBeGreaterThanOrEqual(4);
    expect(r.body.invitations).toEqual([]);
  });

  it('keeps the invitation and queues its message when the mail relay is down', async () => {
    const deadMailer = createMailer({ host: '127.0.0.1', port: 1, secure: false, from: 'x@localhost' });
    const broken = createApp({ config: ts.config, ds: ts.ds, mailer: deadMailer, mailOptions: { retryBaseMs: 60_000 }, log: () => undefined });
    const agent = request.agent(broken.app);
    let csrf = (await agent.get('/api/auth/csrf')).body.csrfToken;
    csrf = (await agent.post('/api/auth/login').set('x-csrf-token', csrf).send({ email: demoEmail('Lead'), password: DEMO_PASSWORD })).body.csrfToken;
    const r = await agent.post(`/api/sites/${ts.demoSiteId}/invitations`).set('x-csrf-token', csrf).send({ email: 'kept@demo.kfield.example', role: 'Viewer' });
    // Confirmed means stored: the relay is not part of the request any more.
    expect(r.status).toBe(201);
    expect(await ts.ds.getRepository(Invitation).countBy({ email: 'kept@demo.kfield.example' })).toBe(1);
    // One attempt fails at once; the next is not due for a minute.
    await broken.mail.drain(3000);
    const [queued] = await ts.outbox('kept@demo.kfield.example');
    expect(queued).toMatchObject({ kind: 'invitation', status: 'pending', attempts: 1, lastError: expect.stringMatching(/ECONNREFUSED/) });
    expect(queued.nextAttemptAt.getTime()).toBeGreaterThan(Date.now() + 30_000);
    await broken.close();
  });
});

describe('members', () => {
  it('lets a Lead change a role and remove a member, but never the last Lead', async () => {
    const lead = await ts.as(demoEmail('Lead'));
    const list = (await lead.get(members(ts.demoSiteId))).body.members as { userId: string; email: string; role: string }[];
    const viewer = list.find((m) => m.email === demoEmail('Viewer'))!;
    const me = list.find((m) => m.email === demoEmail('Lead'))!;
    const promoted = await lead.patch(`${members(ts.demoSiteId)}/${viewer.userId}`, { role: 'Analyst' }).expect(200);
    expect(promoted.body.role).toBe('Analyst');
    const bad = await lead.patch(`${members(ts.demoSiteId)}/${viewer.userId}`, { role: 'Owner' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.role).toBeTruthy();
    const demote = await lead.patch(`${members(ts.demoSiteId)}/${me.userId}`, { role: 'Viewer' });
    expect(demote.status).toBe(409);
    expect(demote.body.error.code).toBe('LAST_LEAD');
    expect((await lead.delete(`${members(ts.demoSiteId)}/${me.userId}`)).status).toBe(409);
    await lead.patch(`${members(ts.demoSiteId)}/${viewer.userId}`, { role: 'Viewer' }).expect(200);

    const tmp = (await lead.post(`/api/sites/${ts.demoSiteId}/invitations`, { email: 'short.stay@demo.kfield.example', role: 'Viewer' }).expect(201)).body;
    const token = linkToken((await ts.outbox('short.stay@demo.kfield.example'))[0].text, 'invitation');
    await (await ts.client().refreshCsrf()).post('/api/invitations/accept', { token, name: 'Short Stay', password: 'a-long-new-password' }).expect(200);
    const stayer = (await lead.get(members(ts.demoSiteId))).body.members.find((m: { email: string }) => m.email === 'short.stay@demo.kfield.example');
    expect(tmp.role).toBe('Viewer');
    await lead.delete(`${members(ts.demoSiteId)}/${stayer.userId}`).expect(204);
    const after = (await lead.get(members(ts.demoSiteId))).body.members.map((m: { email: string }) => m.email);
    expect(after).not.toContain('short.stay@demo.kfield.example');
  });
});
