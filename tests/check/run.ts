/**
 * `npm run check` (and the first step of `npm test`): formatting, lint and types, so that a
 * change that breaks any of them fails before the suites run. Prints one line per gate and exits
 * non-zero when any fails. Two gates run at a time (the machines have two cores).
 */
import { spawn } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { ESLint } from 'eslint';
import { eslintConfig } from './eslint-config.js';

const root = fileURLToPath(new URL('../..', import.meta.url));
const bin = (name: string) => path.join(root, 'node_modules/.bin', name);

export interface GateResult {
  name: string;
  ok: boolean;
  output: string;
}

function command(name: string, cmd: string, args: string[]): () => Promise<GateResult> {
  return () =>
    new Promise((resolve) => {
      const child = spawn(cmd, args, { cwd: root, stdio: ['ignore', 'pipe', 'pipe'] });
      let output = '';
      child.stdout.on('data', (c: Buffer) => (output += c.toString()));
      child.stderr.on('data', (c: Buffer) => (output += c.toString()));
      child.on('close', (code) => resolve({ name, ok: code === 0, output }));
    });
}

async function lint(): Promise<GateResult> {
  const eslint = new ESLint({ cwd: root, overrideConfigFile: true, overrideConfig: eslintConfig });
  const results = await eslint.lintFiles(['server', 'shared', 'src', 'tests', 'drizzle.config.ts']);
  const problems = results.reduce((n, r) => n + r.errorCount + r.warningCount, 0);
  const output = problems ? await (await eslint.loadFormatter('stylish')).format(results) : '';
  return { name: `ESLint (${results.length} files)`, ok: problems === 0, output };
}

/** Every gate: Prettier, ESLint, and each TypeScript project (the client's templates through ngc). */
export const gates: (() => Promise<GateResult>)[] = [
  lint,
  command('Prettier', bin('prettier'), ['--check', '--log-level', 'warn', '.']),
  command('types: server, shared, tests', bin('tsc'), ['-p', 'tsconfig.json', '--noEmit']),
  command('types: client and templates', bin('ngc'), ['-p', 'src/tsconfig.app.json', '--noEmit']),
  command('types: client specs', bin('tsc'), ['-p', 'src/tsconfig.spec.json', '--noEmit']),
];

/** Runs every gate, two at a time; resolves with their results in the order above. */
export async function runGates(): Promise<GateResult[]> {
  const results: GateResult[] = new Array(gates.length);
  let next = 0;
  const worker = async () => {
    while (next < gates.length) {
      const i = next++;
      results[i] = await gates[i]();
    }
  };
  await Promise.all([worker(), worker()]);
  return results;
}

/** Prints each gate's line (and the output of those that failed); returns whether all passed. */
export function report(results: GateResult[]): boolean {
  for (const r of results) {
    console.log(`${r.ok ? 'ok  ' : 'FAIL'} ${r.name}`);
    if (!r.ok) console.log(r.output.trim());
  }
  return results.every((r) => r.ok);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) {
  const started = Date.now();
  const ok = report(await runGates());
  console.log(
    `checks ${ok ? 'passed' : 'FAILED'} in ${((Date.now() - started) / 1000).toFixed(0)} s`,
  );
  process.exit(ok ? 0 : 1);
}
