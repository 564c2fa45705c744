import { randomUUID } from 'node:crypto';
import { startTestServer } from '../support/test-server';
import { demoEmail } from '../support/test-server';
import { Membership } from '../../server/features/sites/membership.entity';
import { Well } from '../../server/features/wells/well.entity';

const WELLS = 20_000;
const RUNS = 15;
const TARGET_MS = 150;

/** GET /api/sites/:siteId/map/wells for a site of 20,000 wells, a third with a Checked fit. */
export async function run(): Promise<void> {
  const ts = await startTestServer({ DEMO_DATA: 'true' });
  try {
    // Only Admins create sites by default: the Admin creates it and makes the demo Lead its Lead.
    const admin = await ts.as(demoEmail('Admin'));
    const site = (await admin.post('/api/sites', { name: 'Bench network', epsgCode: 32632, displayUnits: 'SI' }).expect(201)).body;
    const leadId: string = (await ts.ds.query(`SELECT id FROM users WHERE email = ?`, [demoEmail('Lead')]))[0].id;
    await ts.ds.getRepository(Membership).insert({ siteId: site.id, userId: leadId, role: 'Lead' });
    const lead = await ts.as(demoEmail('Lead'));
    const template = await ts.ds.getRepository(Well).findOneByOrFail({ siteId: ts.demoSiteId });
    const analystId: string = (await ts.ds.query(`SELECT id FROM users WHERE email = ?`, [demoEmail('Analyst')]))[0].id;
    const recordId: string | undefined = (await ts.ds.query(`SELECT id FROM records LIMIT 1`))[0]?.id;
    await ts.ds.transaction(async (m) => {
      const wells = m.getRepository(Well);
      for (let i = 0; i < WELLS; i += 200) {
        const batch = [];
        for (let j = i; j < Math.min(WELLS, i + 200); j++) {
          const { id: _i, createdAt: _c, updatedAt: _u, ...t } = template;
          batch.push(wells.create({ ...t, id: randomUUID(), siteId: site.id, name: `B-${j}`, lon: t.lon + (j % 150) * 1e-4, lat: t.lat + Math.floor(j / 150) * 1e-4 }));
        }
        await m.createQueryBuilder().insert().into(Well).values(batch).updateEntity(false).execute();
      }
      if (recordId) {
        const ids: { id: string }[] = await m.query(`SELECT id FROM wells WHERE siteId = ?`, [site.id]);
        const now = new Date().toISOString();
        for (const [k, w] of ids.entries()) {
          if (k % 3) continue;
          await m.query(
            `INSERT INTO fits (id, siteId, wellId, recordId, chainId, revision, status, method, line, geometry, options, note, result, flags, kMetersPerSecond, preparedById, createdAt, updatedAt)
             VALUES (?, ?, ?, ?, ?, 1, 'checked', 'hvorslev', 'anchored', '{}', '{}', '', '{}', '[]', ?, ?, ?, ?)`,
            [`f-${k}`, site.id, w.id, recordId, `f-${k}`, 10 ** (-6 + (k % 40) / 10), analystId, now, now],
          );
        }
      }
    });
    const url = `/api/sites/${site.id}/map/wells`;
    // Time to the last byte, as a browser sees it; the body is counted, not parsed.
    let bytes = 0;
    const fetchOnce = async () => {
      const t = performance.now();
      await lead
        .get(url)
        .expect(200)
        .buffer(true)
        .parse((res, cb) => {
          let n = 0;
          res.on('data', (c: Buffer) => (n += c.length));
          res.on('end', () => cb(null, (bytes = n)));
        });
      return performance.now() - t;
    };
    const cold = await fetchOnce();
    const times: number[] = [];
    for (let i = 0; i < RUNS; i++) times.push(await fetchOnce());
    times.sort((a, b) => a - b);
    const median = times[Math.floor(RUNS / 2)];
    // A change to one well: the next answer rebuilds the layer in SQLite.
    const rebuilt: number[] = [];
    for (let i = 0; i < 5; i++) {
      await ts.ds.query(`UPDATE wells SET notes = ? WHERE siteId = ? AND name = 'B-1'`, [`bench ${i}`, site.id]);
      rebuilt.push(await fetchOnce());
    }
    rebuilt.sort((a, b) => a - b);
    console.log(`wells endpoint, ${WELLS} wells, ${(bytes / 1e6).toFixed(1)} MB GeoJSON:`);
    console.log(`  unchanged layer: median ${median.toFixed(1)} ms over ${RUNS} requests (target < ${TARGET_MS} ms) — ${median < TARGET_MS ? 'met' : 'NOT met'}; ratio to target ${(median / TARGET_MS).toFixed(2)}`);
    console.log(`  after a change (layer rebuilt): median ${rebuilt[2].toFixed(1)} ms over 5; first request ${cold.toFixed(1)} ms`);
  } finally {
    await ts.close();
  }
}
