/**
 * `npm start`: everything a fresh machine needs to run Trayplan with its demo school.
 * A project-local PostgreSQL cluster under .data/ (durable), migrations, the demo seed, the client
 * build when missing or stale, the SMTP fake on loopback, and the app on 127.0.0.1:3000.
 * `npm run dev` does the same without the client build and runs the Angular dev server beside it.
 */
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig } from './config.js';
import {
  clusterIsRunning,
  ensureDatabase,
  startCluster,
  type RunningCluster,
} from './db/cluster.js';
import { openDatabase, printableDatabaseUrl, runMigrations } from './db/client.js';
import { seedDemo, DEMO_ACCOUNTS, DEMO_PASSWORD } from './seed/index.js';
import { startFakeSmtp, type FakeSmtp } from './mail/fake-smtp.js';
import { serve, stopOnSignals } from './main.js';
import { clientDir } from './app.js';

const root = fileURLToPath(new URL('..', import.meta.url));
const dev = process.argv.includes('--dev');

/** Newest modification time under the given paths (files only). */
function newest(paths: string[]): number {
  let max = 0;
  const walk = (p: string) => {
    if (!existsSync(p)) return;
    const st = statSync(p);
    if (st.isDirectory()) {
      for (const e of readdirSync(p)) if (e !== 'node_modules') walk(path.join(p, e));
    } else max = Math.max(max, st.mtimeMs);
  };
  paths.forEach(walk);
  return max;
}

/** Builds the client when its build is missing or older than its sources. */
export function buildClientIfStale(): void {
  const index = path.join(clientDir, 'index.html');
  const sources = ['src', 'shared', 'angular.json', 'package-lock.json'].map((p) =>
    path.join(root, p),
  );
  if (existsSync(index) && statSync(index).mtimeMs >= newest(sources)) return;
  console.log('Building the client (about half a minute)…');
  const res = spawnSync(path.join(root, 'node_modules/.bin/ng'), ['build'], {
    cwd: root,
    stdio: 'inherit',
    env: { ...process.env, NG_CLI_ANALYTICS: 'false' },
  });
  if (res.status !== 0) throw new Error('The client build failed (see above).');
}

async function main(): Promise<void> {
  let cluster: RunningCluster | null = null;
  let databaseUrl = process.env.DATABASE_URL ?? '';
  if (!databaseUrl) {
    const dataDir = path.resolve(root, process.env.TRAYPLAN_DATA_DIR ?? '.data/postgres');
    const port = Number(process.env.TRAYPLAN_PG_PORT ?? 54329);
    if (clusterIsRunning(dataDir)) {
      throw new Error(`PostgreSQL already runs from ${dataDir}: is another "npm start" running?`);
    }
    console.log(
      `Starting PostgreSQL on 127.0.0.1:${port} (data in ${path.relative(root, dataDir)})…`,
    );
    cluster = startCluster({ dataDir, port, durable: true });
    await ensureDatabase(cluster, 'trayplan');
    databaseUrl = cluster.url('trayplan');
  }
  const stopCluster = () => cluster?.stop();
  try {
    const setup = openDatabase(databaseUrl, 2);
    await runMigrations(setup.db);
    if (await seedDemo(setup.db)) console.log('Seeded the demo school.');
    await setup.pool.end();

    if (!dev) buildClientIfStale();

    let fake: FakeSmtp | null = null;
    let smtpUrl = process.env.SMTP_URL ?? '';
    if (!smtpUrl || smtpUrl === 'fake') {
      fake = await startFakeSmtp(Number(process.env.SMTP_FAKE_PORT ?? 0));
      smtpUrl = fake.url;
    }
    const config = loadConfig({ databaseUrl, smtpUrl });
    const running = await serve(config, { devMail: fake ? () => fake.messages() : undefined });
    const ng = dev
      ? spawn(path.join(root, 'node_modules/.bin/ng'), ['serve', '--port', '4200'], {
          cwd: root,
          stdio: 'inherit',
        })
      : null;
    stopOnSignals(running, async () => {
      ng?.kill('SIGTERM');
      await fake?.close();
      stopCluster();
    });
    const url = dev ? 'http://127.0.0.1:4200 (API on ' + config.appUrl + ')' : config.appUrl;
    console.log(`\nTrayplan is running at ${url}`);
    // Another instance joins this one with the same DATABASE_URL, SMTP_URL and SESSION_SECRET.
    console.log(`Database: ${printableDatabaseUrl(databaseUrl)}`);
    if (fake)
      console.log(
        `E-mail goes to the local fake SMTP server (${fake.url}); admins read it under "Mail outbox".`,
      );
    console.log(`\nDemo accounts (demo data only), password "${DEMO_PASSWORD}":`);
    for (const a of DEMO_ACCOUNTS) console.log(`  ${a.role.padEnd(8)} ${a.email}`);
    console.log('\nPress Ctrl-C to stop.');
  } catch (err) {
    stopCluster();
    throw err;
  }
}

main().catch((err: Error) => {
  console.error(`\nTrayplan could not start: ${err.message}`);
  process.exit(1);
});
