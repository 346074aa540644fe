import { pino } from 'pino';
import { seedDemo } from '../seeds/demo';
import { createApp } from './app';
import { loadConfig } from './config';
import { openDatabase } from './db/database';
import { migrateToLatest } from './db/migrate';
import { startIngest } from './ingest-runtime';
import { startScheduler } from './scheduler';
import { queueMissingPatternWork } from './services/pattern.service';
import { startFakeSmtp, type FakeSmtp } from './mail/fake-smtp';
import { createSmtpMailer } from './mail/mailer';
import { closeSecrPool } from './workers/secr-pool';

/** Starts Maculo: config, database and migrations, mail, demo data, HTTP. */
async function main(): Promise<void> {
  const config = loadConfig();
  const log = pino({ level: config.logLevel });
  const { db, sqlite } = openDatabase(config.databasePath);
  const applied = await migrateToLatest(db);
  if (applied.length) log.info({ applied }, 'database migrated');

  let fakeSmtp: FakeSmtp | null = null;
  let smtpUrl = config.smtpUrl;
  if (!smtpUrl) {
    fakeSmtp = await startFakeSmtp(db);
    smtpUrl = fakeSmtp.url;
    log.info(
      { port: fakeSmtp.port },
      'no SMTP_URL set: e-mail goes to the local outbox (Admin → Outbox)',
    );
  }
  const mailer = createSmtpMailer(smtpUrl, config.mailFrom);

  const ingest = await startIngest(db, config, log);
  if (config.seedDemo) {
    const seeded = await seedDemo(db, {
      log,
      ingest,
      cacheDir: config.demoCacheDir,
    });
    if (seeded) log.info('demo project seeded (see README for the demo accounts)');
  }
  // Coat-pattern features still missing (seeded or imported data, a new vocabulary) are computed
  // in the background by the job queue; the server answers meanwhile.
  const patternJobs = await queueMissingPatternWork(db);
  if (patternJobs) {
    log.info({ jobs: patternJobs }, 'coat-pattern features queued');
    ingest.runner.kick();
  }

  const app = createApp({ db, sqlite, config, log, mailer, ingest });
  const stopScheduler = startScheduler({ db, mailer, log, publicUrl: config.publicUrl });
  const server = app.listen(config.port, config.host, () => {
    log.info(`Maculo is running on ${config.publicUrl}`);
  });
  server.on('close', () => void closeSecrPool());

  const shutdown = (signal: string) => {
    log.info({ signal }, 'shutting down');
    server.close(() => {
      stopScheduler();
      mailer.close();
      void ingest.stop();
      void Promise.resolve(fakeSmtp?.close()).finally(
        () => void db.destroy().finally(() => process.exit(0)),
      );
    });
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.on('SIGTERM', () => shutdown('SIGTERM'));
  process.on('SIGINT', () => shutdown('SIGINT'));
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
