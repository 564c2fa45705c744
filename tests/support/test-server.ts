import fs from 'node:fs';
import http from 'node:http';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import type { DataSource } from 'typeorm';
import { createApp, type KfieldApp } from '../../server/app';
import { loadConfig, type Config } from '../../server/config';
import { openDatabase } from '../../server/db/data-source';
import { DEMO_PASSWORD, DEMO_USERS, seedDemoIfEmpty } from '../../server/db/seed/demo';
import { startFakeSmtp, type FakeSmtp } from '../../server/features/mail/fake-smtp';
import { createMailer, type Mailer } from '../../server/features/mail/mailer';
import { LocalMail } from '../../server/features/mail/local-mail.entity';
import type { MailWorkerOptions } from '../../server/features/mail/outbox';
import { OutboxMessage } from '../../server/features/mail/outbox-message.entity';
import { Site } from '../../server/features/sites/site.entity';

export { DEMO_PASSWORD, DEMO_USERS };
export const demoEmail = (role: 'Admin' | 'Lead' | 'Analyst' | 'Checker' | 'Viewer') =>
  DEMO_USERS.find((u) => (role === 'Admin' ? u.isAdmin : u.role === role))!.email;

/** A signed-in (or anonymous) client that sends the session's CSRF token with every change. */
export class ApiClient {
  csrf = '';
  constructor(public agent: ReturnType<typeof request.agent>) {}

  async refreshCsrf() {
    const r = await this.agent.get('/api/auth/csrf').expect(200);
    this.csrf = r.body.csrfToken;
    return this;
  }
  get(url: string) {
    return this.agent.get(url);
  }
  post(url: string, body?: object) {
    return this.agent.post(url).set('x-csrf-token', this.csrf).send(body ?? {});
  }
  patch(url: string, body?: object) {
    return this.agent.patch(url).set('x-csrf-token', this.csrf).send(body ?? {});
  }
  delete(url: string) {
    return this.agent.delete(url).set('x-csrf-token', this.csrf);
  }
  send(method: string, url: string, body?: object) {
    const m = method.toLowerCase() as 'get' | 'post' | 'patch' | 'put' | 'delete';
    const t = this.agent[m](url);
    return m === 'get' ? t : t.set('x-csrf-token', this.csrf).send(body ?? {});
  }
  async signIn(email: string, password = DEMO_PASSWORD) {
    await this.refreshCsrf();
    const r = await this.post('/api/auth/login', { email, password });
    if (r.status !== 200) throw new Error(`sign-in of ${email} failed: ${r.status} ${JSON.stringify(r.body)}`);
    this.csrf = r.body.csrfToken;
    return this;
  }
}

export interface TestServer {
  config: Config;
  ds: DataSource;
  kfield: KfieldApp;
  server: http.Server;
  baseUrl: string;
  dbPath: string;
  smtp: FakeSmtp;
  mailer: Mailer;
  demoSiteId: string;
  client(): ApiClient;
  as(email: string, password?: string): Promise<ApiClient>;
  /** What Kfield queued (newest first), delivered or not. */
  outbox(to?: string): Promise<OutboxMessage[]>;
  /** What the local mail service received (newest first), after draining the outbox. */
  delivered(to?: string): Promise<LocalMail[]>;
  close(): Promise<void>;
}

/** The real app on port 0 against a fresh, migrated SQLite file with the demo scenario. */
export interface TestServerOptions {
  /** The relay the outbox delivers to (default: the local fake SMTP service started here). */
  mailer?: Mailer;
  mailOptions?: MailWorkerOptions;
}

export async function startTestServer(env: Record<string, string> = {}, existingDbPath?: string, opts: TestServerOptions = {}): Promise<TestServer> {
  const dbPath = existingDbPath ?? path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'kfield-test-')), 'kfield.sqlite');
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_PATH: dbPath, BCRYPT_COST: '10', CLIENT_DIST: 'dist/client', ...env });
  const ds = await openDatabase(dbPath);
  await seedDemoIfEmpty(ds, config);
  const smtp = await startFakeSmtp(ds, 0);
  const mailer = opts.mailer ?? createMailer({ host: '127.0.0.1', port: smtp.port, secure: false, from: config.MAIL_FROM });
  const kfield = createApp({ config, ds, mailer, mailOptions: opts.mailOptions, log: () => undefined });
  const server = http.createServer(kfield.app);
  await new Promise<void>((r) => server.listen(Number(env.PORT ?? 0), '127.0.0.1', () => r()));
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const demoSiteId = (await ds.getRepository(Site).findOneByOrFail({ isDemo: true })).id;
  const ts: TestServer = {
    config, ds, kfield, server, baseUrl, dbPath, smtp, mailer, demoSiteId,
    client: () => new ApiClient(request.agent(server)),
    as: async (email, password) => new ApiClient(request.agent(server)).signIn(email, password),
    outbox: async (to) => {
      const all = await ds.getRepository(OutboxMessage).find({ order: { createdAt: 'DESC' } });
      return to ? all.filter((m) => m.toAddresses.includes(to)) : all;
    },
    delivered: async (to) => {
      await kfield.mail.drain();
      const all = await ds.getRepository(LocalMail).find({ order: { receivedAt: 'DESC' } });
      return to ? all.filter((m) => m.toAddresses.includes(to)) : all;
    },
    close: async () => {
      await new Promise<void>((r) => server.close(() => r()));
      await kfield.close();
      mailer.close();
      await smtp.close();
      await ds.destroy();
    },
  };
  return ts;
}

/** A port that was free a moment ago, so that PUBLIC_URL (links in e-mails) can name it before listening. */
export async function freePort(): Promise<number> {
  const srv = net.createServer();
  await new Promise<void>((r) => srv.listen(0, '127.0.0.1', () => r()));
  const port = (srv.address() as AddressInfo).port;
  await new Promise<void>((r) => srv.close(() => r()));
  return port;
}

/** The token in the first Kfield link of a message, e.g. /invitations/<token> or ?token=<token>. */
export function linkToken(text: string, kind: 'invitation' | 'reset'): string {
  const m = kind === 'invitation' ? /\/invitations\/([A-Za-z0-9_-]+)/.exec(text) : /reset-password\?token=([A-Za-z0-9_-]+)/.exec(text);
  if (!m) throw new Error(`no ${kind} link in: ${text}`);
  return decodeURIComponent(m[1]);
}
