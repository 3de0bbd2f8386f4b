/**
 * Starts Rollwise: applies migrations, seeds the demo scenario when asked
 * (never in production), and serves app + API on one origin.
 * Run directly (`node --import tsx server/main.ts`) it reads the environment
 * and stops cleanly on SIGINT/SIGTERM.
 */
import type { AddressInfo } from 'node:net';
import { pathToFileURL } from 'node:url';
import { loadConfig, type Config } from './config.js';
import { createDatabase } from './db/client.js';
import { migrateDatabase } from './db/migrate.js';
import { seedDemo } from './db/seed.js';
import { seedDemoProgramme } from './db/seed-programme.js';
import { createApp } from './app.js';
import { createLogger } from './http/logging.js';
import { startFakeSmtp, type FakeSmtp } from './mail/fake-smtp.js';
import { capturedMail } from './db/schema.js';

export interface RunningServer {
  url: string;
  /** smtp://… of the in-process fake SMTP server, when ROLLWISE_FAKE_SMTP started one. */
  smtpUrl?: string | undefined;
  /** The listening HTTP server, for embedding and for tests that watch its events. */
  http: import('node:http').Server;
  close(): Promise<void>;
}

export async function startServer(overrides: Partial<Config> = {}): Promise<RunningServer> {
  const config: Config = { ...loadConfig(process.env), ...overrides };
  if (config.production) config.seedDemo = false;
  const logger = createLogger(config.logLevel);
  const db = createDatabase(config.databaseUrl, {
    connectTimeoutMs: config.dbConnectTimeoutMs,
    onPoolError: (err) => logger.warn({ err }, 'database connection lost'),
  });
  try {
    await migrateDatabase(db);
    if (config.seedDemo) {
      await seedDemo(db.orm, { bcryptRounds: config.bcryptRounds, publicUrl: config.publicUrl });
      await seedDemoProgramme(db.orm);
    }
  } catch (err) {
    await db.close();
    throw err;
  }
  // Development and tests: the fake SMTP server runs in this process and stores what it receives.
  let fake: FakeSmtp | undefined;
  if (config.fakeSmtp && !config.production) {
    fake = await startFakeSmtp({
      port: config.fakeSmtpPort,
      store: async (m) => {
        await db.orm
          .insert(capturedMail)
          .values({ messageId: m.messageId, fromAddress: m.from, toAddresses: m.to, subject: m.subject, textBody: m.text, receivedAt: m.receivedAt })
          .onConflictDoNothing();
      },
    });
    config.smtpUrl ??= fake.url;
    logger.info({ smtp: fake.url }, 'fake SMTP server listening (development only)');
  }
  const app = createApp(config, db);
  const server = await new Promise<import('node:http').Server>((resolve, reject) => {
    const s = app.listen(config.port, config.host, (err?: Error) => (err ? reject(err) : resolve(s)));
  });
  const { port } = server.address() as AddressInfo;
  const host = config.host === '0.0.0.0' || config.host === '::' ? '127.0.0.1' : config.host;
  const url = `http://${host.includes(':') ? `[${host}]` : host}:${port}`;
  logger.info({ url }, 'Rollwise is listening');
  let closing: Promise<void> | undefined;
  return {
    url,
    smtpUrl: fake?.url,
    http: server,
    close: () =>
      (closing ??= (async () => {
        // Requests in flight may finish (up to the grace period, longer than a compute request's time limit); idle keep-alive connections close now,
        // and each connection closes as soon as its last request has been answered.
        await new Promise<void>((resolve) => {
          const force = setTimeout(() => server.closeAllConnections(), config.shutdownGraceMs);
          const sweep = setInterval(() => server.closeIdleConnections(), 50);
          server.close(() => {
            clearTimeout(force);
            clearInterval(sweep);
            resolve();
          });
          server.closeIdleConnections();
        });
        await app.close();
        await fake?.close();
        await db.close();
      })()),
  };
}

const runDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href;
if (runDirectly) {
  startServer().then(
    (s) => {
      console.log(`Rollwise is running at ${s.url}`);
      const stop = () => {
        s.close().then(
          () => process.exit(0),
          () => process.exit(1),
        );
      };
      process.once('SIGINT', stop);
      process.once('SIGTERM', stop);
    },
    (err: unknown) => {
      console.error('Rollwise could not start:', err instanceof Error ? err.message : err);
      process.exit(1);
    },
  );
}
