/**
 * `npm run bench`: runs every bench module in turn, prints one table and writes
 * tests/bench/results.json. Add a module by adding a line to BENCHES.
 */
import { writeFileSync } from 'node:fs';
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { benchEngine } from './engine.js';
import { benchServer } from './server.js';
import { benchPdf } from './pdf.js';
import type { BenchModule, BenchRow } from './types.js';
import { startTestCluster } from '../support/db.js';

const BENCHES: { name: string; run: BenchModule }[] = [
  { name: 'engine', run: benchEngine },
  { name: 'server', run: benchServer },
  { name: 'pdf', run: benchPdf },
];

function table(rows: BenchRow[]): string {
  const cells = rows.map((r) => [
    r.name,
    String(r.median),
    r.unit,
    r.ratio === undefined ? '' : `${r.ratio}×`,
    r.note ?? '',
  ]);
  const head = ['name', 'median', 'unit', 'ratio', 'note'];
  const widths = head.map((h, i) => Math.max(h.length, ...cells.map((c) => c[i]!.length)));
  const line = (c: string[]) =>
    c
      .map((x, i) => (i === 1 || i === 3 ? x.padStart(widths[i]!) : x.padEnd(widths[i]!)))
      .join('  ');
  return [line(head), widths.map((w) => '-'.repeat(w)).join('  '), ...cells.map(line)].join('\n');
}

async function main(): Promise<void> {
  const only = process.argv.slice(2);
  // One throwaway cluster (fsync off, seeded template) for every bench that needs a database.
  const cluster = process.env.TRAYPLAN_TEST_PG ? null : await startTestCluster();
  if (cluster) process.env.TRAYPLAN_TEST_PG = cluster.baseUrl;
  try {
    await runAll(only);
  } finally {
    cluster?.cluster.stop();
  }
}

async function runAll(only: string[]): Promise<void> {
  const results: { module: string; rows: BenchRow[] }[] = [];
  for (const bench of BENCHES) {
    if (only.length && !only.includes(bench.name)) continue;
    console.log(`running ${bench.name} …`);
    results.push({ module: bench.name, rows: await bench.run() });
  }
  const rows = results.flatMap((r) => r.rows);
  console.log(`\n${table(rows)}\n`);
  const out = fileURLToPath(new URL('./results.json', import.meta.url));
  const machine = {
    node: process.version,
    cpu: os.cpus()[0]?.model ?? 'unknown',
    cores: os.cpus().length,
    // Other work on the machine skews absolute times; the ratios are measured within the run.
    loadAverage: os.loadavg().map((x) => Number(x.toFixed(2))),
  };
  writeFileSync(
    out,
    `${JSON.stringify({ ranAt: new Date().toISOString(), machine, results }, null, 2)}\n`,
  );
  console.log(`wrote ${out}`);
}

await main();
