/**
 * Test databases: each test file gets a database of its own, copied from a template that the
 * test runner migrated and seeded once (CREATE DATABASE … TEMPLATE takes a fraction of a second).
 * Run alone (without tests/run.ts), a file starts a throwaway cluster for itself.
 */
import { mkdtempSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { freePort, startCluster } from '../../server/db/cluster.js';
import { openDatabase, runMigrations, type Database } from '../../server/db/client.js';
import { seedDemo } from '../../server/seed/index.js';

export const TEMPLATE_DB = 'trayplan_template';

/** Starts a throwaway cluster (fsync off) and makes the seeded template in it. */
export async function startTestCluster() {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'trayplan-test-'));
  const cluster = startCluster({
    dataDir: path.join(dir, 'pg'),
    port: await freePort(),
    durable: false,
  });
  const admin = new pg.Client({ connectionString: cluster.url('postgres') });
  await admin.connect();
  await admin.query(`CREATE DATABASE ${TEMPLATE_DB}`);
  await admin.end();
  const template = openDatabase(cluster.url(TEMPLATE_DB), 2);
  await runMigrations(template.db);
  await seedDemo(template.db);
  await template.pool.end();
  return { cluster, dir, baseUrl: cluster.url('').replace(/\/$/, '') };
}

let base: Promise<string> | null = null;
function clusterBase(): Promise<string> {
  base ??= (async () => {
    if (process.env.TRAYPLAN_TEST_PG) return process.env.TRAYPLAN_TEST_PG;
    const started = await startTestCluster();
    process.on('exit', () => started.cluster.stop());
    return started.baseUrl;
  })();
  return base;
}

export interface TestDatabase extends Database {
  url: string;
  name: string;
  /** Closes the pool and drops the database. */
  drop: () => Promise<void>;
}

/** A new database holding the migrated schema and the demo seed. */
export async function freshDatabase(): Promise<TestDatabase> {
  const baseUrl = await clusterBase();
  const name = `t_${process.pid}_${Math.random().toString(36).slice(2, 10)}`;
  const admin = new pg.Client({ connectionString: `${baseUrl}/postgres` });
  await admin.connect();
  // Copies may not start while another connection uses the template: retry briefly.
  for (let i = 0; ; i++) {
    try {
      await admin.query(`CREATE DATABASE ${name} TEMPLATE ${TEMPLATE_DB}`);
      break;
    } catch (err) {
      if (i > 50) throw err;
      await new Promise((r) => setTimeout(r, 100));
    }
  }
  await admin.end();
  const url = `${baseUrl}/${name}`;
  const database = openDatabase(url, 5);
  return {
    ...database,
    url,
    name,
    drop: async () => {
      await database.pool.end();
      const c = new pg.Client({ connectionString: `${baseUrl}/postgres` });
      await c.connect();
      await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      await c.end();
    },
  };
}
