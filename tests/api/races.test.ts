import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashToken, newToken } from '../../server/auth/tokens';
import { Invitation } from '../../server/features/members/invitation.entity';
import { Site } from '../../server/features/sites/site.entity';
import { User } from '../../server/features/users/user.entity';
import { demoEmail, startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

describe('two simultaneous creations of the same e-mail', () => {
  it('by an Admin: one 201 and one 409 naming the e-mail, and one account', async () => {
    const admin = await ts.as(demoEmail('Admin'));
    const email = 'twice.created@demo.kfield.example';
    const answers = await Promise.all([
      admin.post('/api/admin/users', { email, name: 'First Try', password: 'first-password-12' }),
      admin.post('/api/admin/users', { email, name: 'Second Try', password: 'second-password-12' }),
    ]);
    expect(answers.map((a) => a.status).sort(), JSON.stringify(answers.map((a) => a.body))).toEqual([201, 409]);
    const refused = answers.find((a) => a.status === 409)!;
    expect(refused.body.error.fields.email).toBe('An account with this e-mail already exists');
    expect(await ts.ds.getRepository(User).countBy({ email })).toBe(1);
  });

  it('by accepting two invitations to the same new address: one 200 and one 409, and one account', async () => {
    const email = 'invited.twice@demo.kfield.example';
    // The second site and both invitations are written directly, as two e-mailed invitations would
    // leave them: what is under test is the accept.
    const other = await ts.ds.getRepository(Site).save(
      ts.ds.getRepository(Site).create({ name: 'Second site for the race', epsgCode: 4326, crsName: 'WGS 84', displayUnits: 'SI', hydroUnits: [], basemapId: null }),
    );
    const leadId = (await ts.ds.getRepository(User).findOneByOrFail({ email: demoEmail('Lead') })).id;
    const tokens = [newToken(), newToken()];
    await ts.ds.getRepository(Invitation).insert(
      [ts.demoSiteId, other.id].map((siteId, i) => ({
        siteId, email, role: 'Viewer' as const, tokenHash: hashToken(tokens[i]), invitedById: leadId,
        expiresAt: new Date(Date.now() + 3600_000), usedAt: null, revokedAt: null,
      })),
    );
    const clients = await Promise.all(tokens.map(() => ts.client().refreshCsrf()));
    const answers = await Promise.all(
      tokens.map((token, i) => clients[i].post('/api/invitations/accept', { token, name: 'Invited Twice', password: `a-long-password-${i}` })),
    );
    expect(answers.map((a) => a.status).sort(), JSON.stringify(answers.map((a) => a.body))).toEqual([200, 409]);
    expect(answers.find((a) => a.status === 409)!.body.error).toMatchObject({ code: 'CONFLICT', fields: { email: 'An account with this e-mail already exists' } });
    expect(await ts.ds.getRepository(User).countBy({ email })).toBe(1);
  });
});
