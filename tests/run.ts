/**
 * `npm test`: makes sure PostgreSQL and Chromium are installed, starts a throwaway cluster
 * (temporary folder, free port, fsync off), runs every suite, prints each suite's counts and a
 * last line `N passed, N failed`, and exits non-zero on any failure or on a suite that ran nothing.
 */
import { spawn } from 'node:child_process';
import { existsSync, readdirSync, rmSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import { findPostgresBin, freePort } from '../server/db/cluster.js';
import { startTestCluster, TEMPLATE_DB } from './support/db.js';
import { report, runGates } from './check/run.js';

const root = fileURLToPath(new URL('..', import.meta.url));
const CHROMIUM = '/usr/bin/chromium';
const only = process.argv.slice(2);
/**
 * How long one suite may run before it is stopped: far above a quiet run (a few minutes), so a
 * machine busy with other work slows a suite down without failing it; a hung suite still ends.
 */
const SUITE_LIMIT_MS = 20 * 60_000;

interface SuiteResult {
  name: string;
  passed: number;
  failed: number;
  ok: boolean;
  note?: string;
}

function ensureChromium(): void {
  if (existsSync(CHROMIUM)) return;
  if (process.getuid?.() !== 0) {
    throw new Error(
      'Chromium is missing: install Debian\'s "chromium" package (sudo apt-get install chromium).',
    );
  }
  console.log('Chromium is missing: installing Debian\'s "chromium" package…');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  execFileSync(
    'apt-get',
    ['install', '-y', '-qq', '--no-install-recommends', 'chromium', 'fonts-dejavu-core'],
    {
      stdio: 'inherit',
      env,
    },
  );
}

function files(dir: string): string[] {
  const full = path.join(root, dir);
  if (!existsSync(full)) return [];
  return readdirSync(full)
    .filter((f) => f.endsWith('.test.ts'))
    .sort()
    .map((f) => path.join(dir, f));
}

/** Runs a command, echoing its output, and resolves with everything it printed. */
function run(
  cmd: string,
  args: string[],
  env: NodeJS.ProcessEnv,
  timeoutMs: number,
): Promise<{ code: number; out: string }> {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { cwd: root, env, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    const take = (chunk: Buffer, to: NodeJS.WriteStream) => {
      out += chunk.toString();
      to.write(chunk);
    };
    child.stdout.on('data', (c: Buffer) => take(c, process.stdout));
    child.stderr.on('data', (c: Buffer) => take(c, process.stderr));
    const timer = setTimeout(() => {
      out += `\n[timed out after ${timeoutMs / 1000} s]\n`;
      child.kill('SIGKILL');
    }, timeoutMs);
    child.on('close', (code) => {
      clearTimeout(timer);
      resolve({ code: code ?? 1, out });
    });
  });
}

/** Counts from node's test runner (spec reporter's closing lines). */
function nodeCounts(name: string, code: number, out: string): SuiteResult {
  const num = (label: string) => Number(new RegExp(`ℹ ${label} (\\d+)`).exec(out)?.[1] ?? 0);
  const passed = num('pass');
  const failed = num('fail') + num('cancelled');
  const ok = code === 0 && failed === 0 && passed > 0;
  return {
    name,
    passed,
    failed: failed || (ok ? 0 : 1),
    ok,
    note: passed === 0 ? 'ran no test' : undefined,
  };
}

/** Counts from the summary line karma.conf.js's own reporter prints (`Karma summary: …`). */
function karmaCounts(code: number, out: string): SuiteResult {
  // eslint-disable-next-line no-control-regex
  const plain = out.replace(/\u001b\[[0-9;]*m/g, '');
  const m = /^Karma summary: (\d+) passed, (\d+) failed, (\d+) skipped, error: (yes|no)$/m.exec(
    plain,
  );
  const passed = Number(m?.[1] ?? 0);
  const failed = Number(m?.[2] ?? 0);
  const broken = !m || m[4] === 'yes';
  const ok = code === 0 && failed === 0 && passed > 0 && !broken;
  return {
    name: 'client (Karma)',
    passed,
    failed: failed || (ok ? 0 : 1),
    ok,
    note: passed === 0 ? 'ran no test' : broken ? 'the run itself broke' : undefined,
  };
}

async function copyDatabase(baseUrl: string, name: string): Promise<string> {
  const admin = new pg.Client({ connectionString: `${baseUrl}/postgres` });
  await admin.connect();
  await admin.query(`CREATE DATABASE ${name} TEMPLATE ${TEMPLATE_DB}`);
  await admin.end();
  return `${baseUrl}/${name}`;
}

/** Starts the app the way `npm start` does (server/start.ts), on its own database and port. */
async function startApp(databaseUrl: string, env: NodeJS.ProcessEnv) {
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/start.ts'], {
    cwd: root,
    env: { ...env, DATABASE_URL: databaseUrl, PORT: String(port), SMTP_URL: '' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let log = '';
  child.stdout.on('data', (c: Buffer) => (log += c.toString()));
  child.stderr.on('data', (c: Buffer) => (log += c.toString()));
  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 5 * 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`The app exited while starting:\n${log}`);
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok && log.includes('Trayplan is running')) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error(`The app did not start in time:\n${log}`);
    await new Promise((r) => setTimeout(r, 300));
  }
  return {
    url,
    log: () => log,
    stop: () =>
      new Promise<number>((resolve) => {
        child.once('exit', (code) => resolve(code ?? 0));
        child.kill('SIGTERM');
      }),
  };
}

async function main(): Promise<number> {
  const results: SuiteResult[] = [];
  // Formatting, lint and types first: a change that breaks one of them fails before any suite.
  if (only.length === 0 || only.includes('check')) {
    console.log('=== checks (Prettier, ESLint, TypeScript) ===');
    const gates = await runGates();
    if (!report(gates)) {
      const passed = gates.filter((g) => g.ok).length;
      console.log(`\n${passed} passed, ${gates.length - passed} failed`);
      return 1;
    }
    results.push({ name: 'checks', passed: gates.length, failed: 0, ok: true });
    if (only.length === 1) {
      console.log(`\n${gates.length} passed, 0 failed`);
      return 0;
    }
  }
  findPostgresBin();
  ensureChromium();
  console.log('Starting a throwaway PostgreSQL cluster for the tests…');
  const { cluster, dir, baseUrl } = await startTestCluster();
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    TRAYPLAN_TEST_PG: baseUrl,
    CHROME_BIN: CHROMIUM,
    NG_CLI_ANALYTICS: 'false',
    NODE_ENV: 'test',
    FORCE_COLOR: '0',
  };
  const want = (name: string) => only.length === 0 || only.includes(name);
  const nodeTest = (list: string[]) => [
    '--import',
    'tsx',
    '--test',
    '--test-reporter=spec',
    ...list,
  ];
  try {
    for (const [name, dir] of [
      ['shared', 'tests/shared'],
      ['server', 'tests/server'],
    ] as const) {
      if (!want(name)) continue;
      console.log(`\n=== ${name} suite ===`);
      const list = files(dir);
      const r = await run(process.execPath, nodeTest(list), env, SUITE_LIMIT_MS);
      results.push(nodeCounts(name, list.length ? r.code : 1, r.out));
    }
    if (want('client')) {
      console.log('\n=== client suite (Karma, headless Chromium) ===');
      const r = await run(
        path.join(root, 'node_modules/.bin/ng'),
        ['test', '--watch=false'],
        env,
        SUITE_LIMIT_MS,
      );
      results.push(karmaCounts(r.code, r.out));
    }
    if (want('e2e')) {
      console.log('\n=== end-to-end suite (the app as npm start runs it, Chromium) ===');
      const list = files('tests/e2e');
      let app: Awaited<ReturnType<typeof startApp>> | null = null;
      try {
        app = await startApp(await copyDatabase(baseUrl, 'e2e'), env);
        const r = await run(
          process.execPath,
          nodeTest(list),
          { ...env, TRAYPLAN_E2E_URL: app.url },
          SUITE_LIMIT_MS,
        );
        results.push(nodeCounts('e2e', list.length ? r.code : 1, r.out));
      } catch (err) {
        console.error((err as Error).message);
        results.push({
          name: 'e2e',
          passed: 0,
          failed: 1,
          ok: false,
          note: 'the app did not start',
        });
      } finally {
        if (app) {
          const code = await app.stop();
          if (code !== 0) {
            console.error(`The app exited with ${code} on SIGTERM:\n${app.log().slice(-2000)}`);
            results.push({ name: 'clean shutdown', passed: 0, failed: 1, ok: false });
          }
        }
      }
    }
  } finally {
    cluster.stop();
    rmSync(dir, { recursive: true, force: true });
  }

  console.log('\n=== summary ===');
  for (const r of results) {
    console.log(
      `${r.ok ? 'ok  ' : 'FAIL'} ${r.name}: ${r.passed} passed, ${r.failed} failed${r.note ? ` (${r.note})` : ''}`,
    );
  }
  const passed = results.reduce((n, r) => n + r.passed, 0);
  const failed = results.reduce((n, r) => n + r.failed, 0);
  console.log(`${passed} passed, ${failed} failed`);
  return results.every((r) => r.ok) && results.length > 0 ? 0 : 1;
}

main().then(
  (code) => process.exit(code),
  (err: Error) => {
    console.error(`The tests could not run: ${err.message}`);
    console.log('0 passed, 1 failed');
    process.exit(1);
  },
);
