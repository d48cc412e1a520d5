/**
 * A project-local PostgreSQL cluster on 127.0.0.1, run from Debian's `postgresql` binaries.
 * Used by the start command (durable, under `.data/`) and by the tests (throwaway, fsync off).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import {
  existsSync,
  mkdirSync,
  readdirSync,
  writeFileSync,
  appendFileSync,
  chmodSync,
} from 'node:fs';
import { createServer } from 'node:net';
import path from 'node:path';

export interface ClusterOptions {
  /** Folder holding the cluster's data (created on first run). */
  dataDir: string;
  port: number;
  /** Whether to keep fsync on: true for the start command, false for throwaway test clusters. */
  durable: boolean;
}

export interface RunningCluster {
  url: (database: string) => string;
  port: number;
  stop: () => void;
}

const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

/** Finds the newest PostgreSQL bin folder, installing Debian's package when missing and root. */
export function findPostgresBin(): string {
  const found = newestBin();
  if (found) return found;
  if (!isRoot) {
    throw new Error(
      'PostgreSQL is not installed. Install it with: sudo apt-get install postgresql ' +
        '(Trayplan starts its own cluster; the system one is not used).',
    );
  }
  console.log('PostgreSQL is missing: installing Debian\'s "postgresql" package…');
  mkdirSync('/etc/postgresql-common/createcluster.d', { recursive: true });
  writeFileSync(
    '/etc/postgresql-common/createcluster.d/no-main.conf',
    'create_main_cluster = false\n',
  );
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  execFileSync('apt-get', ['install', '-y', '-qq', '--no-install-recommends', 'postgresql'], {
    stdio: 'inherit',
    env,
  });
  const after = newestBin();
  if (!after) throw new Error('PostgreSQL was installed but its binaries were not found.');
  return after;
}

function newestBin(): string | null {
  const root = '/usr/lib/postgresql';
  if (!existsSync(root)) return null;
  const versions = readdirSync(root)
    .filter((v) => existsSync(path.join(root, v, 'bin', 'pg_ctl')))
    .sort((a, b) => Number(a) - Number(b));
  const last = versions.at(-1);
  return last ? path.join(root, last, 'bin') : null;
}

/** Runs a PostgreSQL tool, as the `postgres` user when we are root (they refuse root). */
function runTool(bin: string, tool: string, args: string[], quiet = true): void {
  const cmd = isRoot ? 'runuser' : path.join(bin, tool);
  const full = isRoot ? ['-u', 'postgres', '--', path.join(bin, tool), ...args] : args;
  const res = spawnSync(cmd, full, { stdio: quiet ? 'pipe' : 'inherit', encoding: 'utf8' });
  if (res.status !== 0) {
    throw new Error(`${tool} failed (${res.status}): ${res.stderr ?? ''}${res.stdout ?? ''}`);
  }
}

/** Makes every parent of `dir` traversable so the postgres user can reach it (root only). */
function makeReachable(dir: string): void {
  if (!isRoot) return;
  let current = path.resolve(dir);
  while (current !== path.dirname(current)) {
    current = path.dirname(current);
    try {
      const mode = (
        spawnSync('stat', ['-c', '%a', current], { encoding: 'utf8' }).stdout ?? ''
      ).trim();
      const bits = parseInt(mode, 8);
      if (!Number.isNaN(bits) && (bits & 0o001) === 0) chmodSync(current, bits | 0o001);
    } catch {
      // A parent we cannot change is left alone; initdb reports it clearly if it matters.
    }
  }
}

/** Creates (first run) and starts a cluster; returns how to reach and stop it. */
export function startCluster(options: ClusterOptions): RunningCluster {
  const bin = findPostgresBin();
  const dataDir = path.resolve(options.dataDir);
  mkdirSync(dataDir, { recursive: true });
  makeReachable(dataDir);
  if (isRoot) execFileSync('chown', ['-R', 'postgres:postgres', dataDir]);
  if (!existsSync(path.join(dataDir, 'PG_VERSION'))) {
    runTool(bin, 'initdb', [
      '-D',
      dataDir,
      '-U',
      'trayplan',
      '--auth=trust',
      '--encoding=UTF8',
      '--locale=C.UTF-8',
    ]);
    appendFileSync(
      path.join(dataDir, 'postgresql.conf'),
      "\ninclude_if_exists = 'trayplan.conf'\n",
    );
  }
  // Settings are rewritten on every start so a changed port or durability always applies.
  const socketDir = dataDir.length < 90 ? dataDir : '';
  writeFileSync(
    path.join(dataDir, 'trayplan.conf'),
    [
      `listen_addresses = '127.0.0.1'`,
      `port = ${options.port}`,
      `unix_socket_directories = '${socketDir}'`,
      `fsync = ${options.durable ? 'on' : 'off'}`,
      `synchronous_commit = ${options.durable ? 'on' : 'off'}`,
      `full_page_writes = ${options.durable ? 'on' : 'off'}`,
      `max_connections = 200`,
      '',
    ].join('\n'),
  );
  if (isRoot) execFileSync('chown', ['-R', 'postgres:postgres', dataDir]);
  runTool(bin, 'pg_ctl', [
    '-D',
    dataDir,
    '-l',
    path.join(dataDir, 'server.log'),
    '-w',
    '-t',
    '60',
    'start',
  ]);
  let stopped = false;
  return {
    port: options.port,
    url: (database) => `postgres://trayplan@127.0.0.1:${options.port}/${database}`,
    stop: () => {
      if (stopped) return;
      stopped = true;
      try {
        runTool(bin, 'pg_ctl', ['-D', dataDir, '-m', 'fast', '-w', 'stop']);
      } catch (err) {
        console.error('Could not stop PostgreSQL cleanly:', (err as Error).message);
      }
    },
  };
}

/** Whether a PostgreSQL server already runs from this data folder (left by an earlier run). */
export function clusterIsRunning(dataDir: string): boolean {
  const bin = newestBin();
  if (!bin || !existsSync(path.join(dataDir, 'postmaster.pid'))) return false;
  const cmd = isRoot ? 'runuser' : path.join(bin, 'pg_ctl');
  const args = isRoot
    ? ['-u', 'postgres', '--', path.join(bin, 'pg_ctl'), '-D', dataDir, 'status']
    : ['-D', dataDir, 'status'];
  return spawnSync(cmd, args, { stdio: 'ignore' }).status === 0;
}

/** A TCP port on 127.0.0.1 that nothing listens on right now. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/** Creates a database when it does not exist yet (connects to `postgres`). */
export async function ensureDatabase(cluster: RunningCluster, name: string): Promise<void> {
  const pg = await import('pg');
  const client = new pg.default.Client({ connectionString: cluster.url('postgres') });
  await client.connect();
  try {
    const found = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [name]);
    if (found.rowCount === 0) await client.query(`CREATE DATABASE "${name.replace(/"/g, '')}"`);
  } finally {
    await client.end();
  }
}
