import { startTestServer, demoEmail } from '../support/test-server';

const RUNS = 5;
const TARGET_MS = 5000;

const median = (xs: number[]) => xs.slice().sort((a, b) => a - b)[Math.floor(xs.length / 2)];

/**
 * The demo site's report (24 wells, every Checked fit's page in the appendix) over HTTP, to the
 * last byte; baseline: one fit's report (one page of the appendix) on the same server.
 */
export async function run(): Promise<void> {
  const ts = await startTestServer({ DEMO_DATA: 'true' });
  try {
    const lead = await ts.as(demoEmail('Lead'));
    const fitId: string = (await ts.ds.query(`SELECT id FROM fits WHERE siteId = ? AND status = 'checked' LIMIT 1`, [ts.demoSiteId]))[0].id;
    const wells: number = (await ts.ds.query(`SELECT COUNT(*) AS n FROM wells WHERE siteId = ?`, [ts.demoSiteId]))[0].n;
    const time = async (url: string) => {
      const t = performance.now();
      let bytes = 0;
      await lead
        .get(url)
        .expect(200)
        .buffer(true)
        .parse((res, cb) => {
          res.on('data', (c: Buffer) => (bytes += c.length));
          res.on('end', () => cb(null, bytes));
        });
      return { ms: performance.now() - t, bytes };
    };
    await time(`/api/fits/${fitId}/report.pdf`);
    const fit: number[] = [];
    const site: number[] = [];
    let size = 0;
    for (let i = 0; i < RUNS; i++) {
      fit.push((await time(`/api/fits/${fitId}/report.pdf`)).ms);
      const s = await time(`/api/sites/${ts.demoSiteId}/reports/site.pdf`);
      site.push(s.ms);
      size = s.bytes;
    }
    const m = median(site);
    console.log(`site report, ${wells} wells: median ${m.toFixed(0)} ms of ${RUNS} (${(size / 1024).toFixed(0)} KB; target < ${TARGET_MS} ms) ${m < TARGET_MS ? 'OK' : 'OVER TARGET'}`);
    console.log(`baseline, one fit report: median ${median(fit).toFixed(0)} ms; ratio ${(m / median(fit)).toFixed(1)}×`);
  } finally {
    await ts.close();
  }
}
