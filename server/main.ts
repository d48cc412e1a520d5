/**
 * Runs the app against an existing database: `DATABASE_URL` and `SMTP_URL` must be set
 * (production). The start command (start.ts) wraps this with a local cluster and the mail fake.
 */
import type { Server } from 'node:http';
import { loadConfig, type Config } from './config.js';
import { openDatabase, printableDatabaseUrl, runMigrations, type Database } from './db/client.js';
import { createApp } from './app.js';
import { createMailTransport } from './mail/outbox.js';
import { startJobs, type Jobs } from './jobs/index.js';
import { jobDefinitions, MAIL_JOB } from './jobs/registry.js';
import type { DevMail } from '../shared/schemas/members.js';
import { closePdfPool } from './pdf/pool.js';
import { closeTrayEvents } from './trays/events.js';
import { createSessionStore } from './auth/session.js';
import { drainable } from './drain.js';

export interface Running {
  server: Server;
  database: Database;
  /** The PostgreSQL job queue (outbox delivery and every scheduled job). */
  jobs: Jobs;
  /** Drains the server (every request already sent is answered), stops the workers, closes the pool. */
  close: () => Promise<void>;
}

export async function serve(
  config: Config,
  extra: {
    devMail?: () => DevMail[];
    /** Seconds between the job workers' polls (pg-boss's default 2). */
    jobPollSeconds?: number;
  } = {},
): Promise<Running> {
  if (!config.databaseUrl) throw new Error('DATABASE_URL is not set.');
  if (!config.smtpUrl || config.smtpUrl === 'fake') {
    throw new Error('SMTP_URL must name an SMTP server (smtp://host:port).');
  }
  const database = openDatabase(config.databaseUrl, 20);
  await runMigrations(database.db);
  const transport = createMailTransport(config.smtpUrl);
  const jobs = await startJobs({
    connectionString: config.databaseUrl,
    definitions: jobDefinitions({
      db: database.db,
      transport,
      mailFrom: config.mailFrom,
      appUrl: config.appUrl,
    }),
    pollingIntervalSeconds: extra.jobPollSeconds,
  });
  // Any instance may deliver a message; the claim in deliverDue makes sure only one does.
  const kickMail = () =>
    void jobs
      .send(MAIL_JOB)
      .catch((err: Error) => console.error('Queueing mail failed:', err.message));
  const sessionStore = createSessionStore(database.pool, true);
  const app = createApp(
    {
      db: database.db,
      pool: database.pool,
      config,
      kickMail,
      devMail: extra.devMail,
    },
    { sessionStore },
  );
  const server = await new Promise<Server>((resolve, reject) => {
    const s = app.listen(config.port, config.host, () => resolve(s));
    s.once('error', reject);
  });
  const drain = drainable(server);
  kickMail();
  let closing: Promise<void> | null = null;
  return {
    server,
    database,
    jobs,
    close: () =>
      (closing ??= (async () => {
        // In order: no new connections, every request already sent answered; then the workers
        // that use the pool; then the session store (its prune timer) and last the pool itself.
        // Open event streams never finish by themselves: end them first, then drain.
        const streams = closeTrayEvents();
        await drain({ idleGraceMs: 1000, hardLimitMs: 10_000 });
        await Promise.all([jobs.stop(), closePdfPool(), streams]);
        transport.close();
        sessionStore.close();
        await database.pool.end();
      })()),
  };
}

/** Stops cleanly on SIGINT and SIGTERM, then runs `after` (stopping the cluster, say). */
export function stopOnSignals(
  running: Running,
  after: () => Promise<void> | void = () => {},
): void {
  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`\n${signal}: stopping Trayplan…`);
    try {
      await running.close();
      await after();
    } finally {
      process.exit(0);
    }
  };
  process.on('SIGINT', () => void stop('SIGINT'));
  process.on('SIGTERM', () => void stop('SIGTERM'));
}

const isEntry = import.meta.url === `file://${process.argv[1]}`;
if (isEntry) {
  const config = loadConfig();
  const running = await serve(config);
  console.log(`Trayplan listening on http://${config.host}:${config.port}`);
  console.log(`Database: ${printableDatabaseUrl(config.databaseUrl)}`);
  stopOnSignals(running);
}
