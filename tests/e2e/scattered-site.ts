import { randomUUID } from 'node:crypto';
import { Membership } from '../../server/features/sites/membership.entity';
import { Well } from '../../server/features/wells/well.entity';
import { demoEmail } from '../support/test-server';
import type { E2E } from './driver';

/**
 * A generated site of `wells` invented wells scattered over about 1 km beside the demo site, each
 * with one Checked fit (K from 1e-6 to 1e-3 m/s, log-uniform, from a fixed seed), the demo Analyst
 * a member. Written straight to the database: the browser test and the bench time the map, not the
 * fit workflow.
 */
export async function scatteredSite(e2e: E2E, name: string, wells = 100): Promise<{ id: string }> {
  const admin = await e2e.ts.as(demoEmail('Admin'));
  const site = (await admin.post('/api/sites', { name, epsgCode: 32632, displayUnits: 'SI' }).expect(201)).body as { id: string };
  const ds = e2e.ts.ds;
  const analystId: string = (await ds.query(`SELECT id FROM users WHERE email = ?`, [demoEmail('Analyst')]))[0].id;
  await ds.getRepository(Membership).insert({ siteId: site.id, userId: analystId, role: 'Analyst' });
  const template = await ds.getRepository(Well).findOneByOrFail({ siteId: e2e.ts.demoSiteId });
  const recordId: string = (await ds.query(`SELECT id FROM records LIMIT 1`))[0].id;
  let seed = 7;
  const rand = () => ((seed = (seed * 16807) % 2147483647) - 1) / 2147483646;
  await ds.transaction(async (m) => {
    const now = new Date().toISOString();
    for (let j = 0; j < wells; j++) {
      const { id: _i, createdAt: _c, updatedAt: _u, ...t } = template;
      const id = randomUUID();
      await m.getRepository(Well).insert({ ...t, id, siteId: site.id, name: `S-${j}`, lon: t.lon + rand() * 0.013, lat: t.lat + rand() * 0.009 });
      await m.query(
        `INSERT INTO fits (id, siteId, wellId, recordId, chainId, revision, status, method, line, geometry, options, note, result, flags, kMetersPerSecond, preparedById, createdAt, updatedAt)
         VALUES (?, ?, ?, ?, ?, 1, 'checked', 'hvorslev', 'anchored', '{}', '{}', '', '{}', '[]', ?, ?, ?, ?)`,
        [`s-${j}`, site.id, id, recordId, `s-${j}`, 10 ** (-6 + 3 * rand()), analystId, now, now],
      );
    }
  });
  return site;
}
