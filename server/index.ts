import 'reflect-metadata';
import type { Server } from 'node:http';
import { createApp } from './app';
import { ConfigError, loadConfig, startupWarnings } from './config';
import { openDatabase } from './db/data-source';
import { seedDemoIfEmpty } from './db/seed/demo';
import { startFakeSmtp, type FakeSmtp } from './features/mail/fake-smtp';
import { createMailer } from './features/mail/mailer';
import { installCrashNet } from './lib/crash-net';

async function main() {
  installCrashNet((msg, e) => console.error(`Kfield: ${msg}:`, e));
  const config = loadConfig();
  const ds = await openDatabase(config.DATABASE_PATH);
  for (const warning of startupWarnings(config)) console.warn(warning);
  if (config.DEMO_DATA) {
    const seeded = await seedDemoIfEmpty(ds, config);
    if (seeded) console.log('Kfield: loaded the demo scenario (invented data) into the empty database');
  }
  let smtp: FakeSmtp | null = null;
  if (config.FAKE_SMTP) {
    smtp = await startFakeSmtp(ds, config.SMTP_PORT, '127.0.0.1');
    console.log(`Kfield: local mail service on 127.0.0.1:${smtp.port} (messages appear in Admin → Outbox)`);
  }
  const mailer = createMailer({
    host: config.FAKE_SMTP ? '127.0.0.1' : config.SMTP_HOST,
    port: smtp?.port ?? config.SMTP_PORT,
    secure: config.FAKE_SMTP ? false : config.SMTP_SECURE,
    user: config.FAKE_SMTP ? undefined : config.SMTP_USER,
    password: config.SMTP_PASSWORD,
    from: config.MAIL_FROM,
  });
  const kfield = createApp({ config, ds, mailer, mailOptions: { retryBaseMs: config.MAIL_RETRY_BASE_SECONDS * 1000, maxAttempts: config.MAIL_MAX_ATTEMPTS } });
  const server: Server = await new Promise((resolve, reject) => {
    const s = kfield.app.listen(config.PORT, config.HOST, () => resolve(s));
    s.once('error', reject);
  });
  const addr = server.address();
  const port = typeof addr === 'object' && addr ? addr.port : config.PORT;
  console.log(`Kfield is serving http://${config.HOST === '0.0.0.0' ? 'localhost' : config.HOST}:${port} (database ${config.DATABASE_PATH})`);

  let stopping = false;
  const shutdown = (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`Kfield: ${signal} received, finishing open requests`);
    const force = setTimeout(() => process.exit(1), 10_000);
    force.unref();
    server.close(async () => {
      await kfield.close();
      mailer.close();
      await smtp?.close();
      await ds.destroy();
      console.log('Kfield: stopped');
      process.exit(0);
    });
    server.closeIdleConnections();
  };
  process.on('SIGTERM', () => shutdown('SIGTERM'));
  process.on('SIGINT', () => shutdown('SIGINT'));
}

main().catch((e) => {
  if (e instanceof ConfigError) console.error(e.message);
  else if ((e as NodeJS.ErrnoException).code === 'EADDRINUSE') console.error(`Kfield cannot start: ${(e as Error).message} — another program uses the port; set PORT or SMTP_PORT`);
  else console.error('Kfield cannot start:', e);
  process.exit(1);
});
