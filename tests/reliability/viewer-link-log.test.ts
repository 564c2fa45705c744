import { afterAll, expect, it } from 'vitest';
import { freePort, HttpSession, signedIn, startServerProcess, tempDir, type ServerProcess } from './support';

let server: ServerProcess | undefined;
afterAll(async () => server?.stop());

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

it('never writes a viewer link’s token to the server log: views, dead links, 429s, a failing mail relay and a restart', async () => {
  // A relay that is not there: every e-mail of the link fails and is retried, and each failure is logged.
  const deadRelayPort = await freePort();
  const env = { FAKE_SMTP: 'false', SMTP_HOST: '127.0.0.1', SMTP_PORT: String(deadRelayPort), MAIL_RETRY_BASE_SECONDS: '1', MAIL_MAX_ATTEMPTS: '2', VIEW_REQUESTS_PER_MINUTE: '40' };
  const dbPath = `${tempDir('kfield-viewlog-')}/kfield.sqlite`;
  const port = await freePort();
  server = await startServerProcess({ dbPath, port, env });
  const lead = await signedIn(server.baseUrl, 'Lead');
  const siteId = (await lead.getJson<{ sites: { id: string; isDemo?: boolean; name: string }[] }>('/api/sites')).sites[0].id;
  const made = await lead.post(`/api/sites/${siteId}/viewer-links`, { label: 'Log check', layers: { wells: true, surface: true, outlines: true, sketches: true } });
  expect(made.status).toBe(201);
  const { id, url } = made.json<{ id: string; url: string }>();
  const token = url.split('/view/')[1];
  expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);

  const viewer = new HttpSession(server.baseUrl);
  for (const p of ['', '/wells', '/k-surface', '/outlines', '/capture-sketches', '/nothing-here']) await viewer.get(`/api/view/${token}${p}`);
  await viewer.get(`/view/${token}`);
  await viewer.get(`/api/view/${token}?x=${token}`);
  // Mail it through the dead relay, and once with a URL that is not the link's.
  expect((await lead.post(`/api/viewer-links/${id}/email`, { to: ['regulator@example.org'], url })).status).toBe(200);
  expect((await lead.post(`/api/viewer-links/${id}/email`, { to: ['regulator@example.org'], url: `${url}x` })).status).toBe(400);
  // Revoked: every view is now a 404, then enough of them for the limiter's 429.
  await lead.request('DELETE', `/api/viewer-links/${id}`);
  let limited = false;
  for (let i = 0; i < 45 && !limited; i++) limited = (await viewer.get(`/api/view/${token}/wells`)).status === 429;
  expect(limited).toBe(true);
  // The outbox tries the dead relay, retries, gives up and logs why.
  for (let i = 0; i < 150 && !/giving up/.test(server.output()); i++) await sleep(100);
  await server.stop();
  const first = server.output();
  expect(first).toMatch(/giving up[\s\S]*ECONNREFUSED/);
  // Restarted on the same database: start-up logs nothing of the link either.
  server = await startServerProcess({ dbPath, port, env });
  await viewer.get(`/view/${token}`);

  const log = first + server.output();
  expect(log.length).toBeGreaterThan(0);
  expect(log).not.toContain(token);
  expect(log).not.toContain(encodeURIComponent(token));
}, 120_000);
