/**
 * PDF benchmark: render times of the demo's longest lesson pack, a 30-page lesson pack and the
 * "Rescue Rovers" unit pack (median over repeated runs, with pages per second), and the health
 * route's latency while four unit packs render beside its latency when idle, in the same run on
 * the same server (the ratio is what means something on a noisy machine).
 *
 * Renders go through the worker pool the routes use; the health checks go over real HTTP to a
 * server listening on loopback. Run alone: `node --import tsx tests/bench/pdf.ts`.
 */
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import { asc, eq } from 'drizzle-orm';
import { createApp } from '../../server/app.js';
import { loadConfig } from '../../server/config.js';
import { loadLessonPack, loadPrintContext, loadUnitPack } from '../../server/pdf/load.js';
import { closePdfPool, pdfPoolState, renderInPool } from '../../server/pdf/pool.js';
import type { LessonPackModel, PrintContext, RenderJob } from '../../server/pdf/model.js';
import { lessons, units } from '../../server/db/schema/index.js';
import { loadPrepInput } from '../../server/prep/load.js';
import { computePrepPlan } from '../../shared/prep/index.js';
import { DEMO_PASSWORD } from '../../server/seed/index.js';
import { freshDatabase, startTestCluster, type TestDatabase } from '../support/db.js';
import type { BenchRow } from './types.js';

const RUNS = 7;
const round = (x: number, digits = 1) => Number(x.toFixed(digits));

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
}

function percentile(values: number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)]!;
}

/** Pages of a PDF: its page objects (`/Type /Page`, not `/Pages`). */
function pageCount(bytes: Uint8Array): number {
  return (
    Buffer.from(bytes)
      .toString('latin1')
      .match(/\/Type \/Page\b(?!s)/g)?.length ?? 0
  );
}

async function timeRenders(job: RenderJob): Promise<{ ms: number; pages: number }> {
  await renderInPool(job); // warm-up: worker start, fonts, JIT
  const times: number[] = [];
  let pages = 0;
  for (let i = 0; i < RUNS; i++) {
    const start = performance.now();
    const bytes = await renderInPool(job);
    times.push(performance.now() - start);
    pages = pageCount(bytes);
  }
  return { ms: median(times), pages };
}

/** Every demo lesson's pack model (and the print context of its school). */
async function demoLessons(
  db: TestDatabase,
): Promise<{ models: LessonPackModel[]; print: PrintContext }> {
  const rows = await db.db.select({ id: lessons.id, schoolId: lessons.schoolId }).from(lessons);
  const models = (await Promise.all(rows.map((r) => loadLessonPack(db.db, r.id)))).filter(
    (m): m is LessonPackModel => m !== null && m.plan !== null,
  );
  return { models, print: await loadPrintContext(db.db, rows[0]!.schoolId, new Date()) };
}

/** The longest demo lesson re-planned for 44 students in pairs: 22 groups, 30 pages. */
async function thirtyPageLesson(db: TestDatabase, base: LessonPackModel): Promise<LessonPackModel> {
  const input = (await loadPrepInput(db.db, base.id))!;
  input.class.studentCount = 44;
  input.lesson.groupSize = 2;
  const plan = computePrepPlan(input);
  return { ...base, studentCount: 44, plan };
}

/** Signs in over HTTP and gives a cookie header for later requests. */
async function signIn(base: string, email: string): Promise<string> {
  const csrf = await fetch(`${base}/api/auth/csrf`);
  const cookies = csrf.headers.getSetCookie().map((c) => c.split(';')[0]!);
  const token = decodeURIComponent(cookies.find((c) => c.startsWith('XSRF-TOKEN='))!.slice(11));
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: {
      'content-type': 'application/json',
      'x-xsrf-token': token,
      cookie: cookies.join('; '),
    },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status}`);
  const session = res.headers.getSetCookie().map((c) => c.split(';')[0]!);
  return [
    ...cookies.filter((c) => !session.some((s) => s.split('=')[0] === c.split('=')[0])),
    ...session,
  ].join('; ');
}

async function healthOnce(base: string): Promise<number> {
  const start = performance.now();
  const res = await fetch(`${base}/api/health`);
  await res.arrayBuffer();
  if (res.status !== 200) throw new Error(`health ${res.status}`);
  return performance.now() - start;
}

/** Health latency (ms) idle, and while four unit packs are downloading (three rounds). */
async function healthUnderLoad(db: TestDatabase, unitId: string) {
  const config = loadConfig({
    databaseUrl: db.url,
    smtpUrl: 'smtp://127.0.0.1:1',
    development: true,
  });
  const app = createApp(
    { db: db.db, pool: db.pool, config, kickMail: () => {} },
    { pruneSessions: false, clientDir: '/nonexistent' },
  );
  const server = app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  try {
    const cookie = await signIn(base, 'teacher@kestrel-ridge.example');
    for (let i = 0; i < 50; i++) await healthOnce(base); // warm-up
    const idle: number[] = [];
    for (let i = 0; i < 400; i++) idle.push(await healthOnce(base));
    const loaded: number[] = [];
    for (let round = 0; round < 3; round++) {
      const packs = [1, 2, 3, 4].map(async () => {
        const res = await fetch(`${base}/api/units/${unitId}/pack.pdf`, { headers: { cookie } });
        await res.arrayBuffer();
        if (res.status !== 200) throw new Error(`unit pack ${res.status}`);
      });
      while (pdfPoolState().inFlight < 4) await new Promise((r) => setTimeout(r, 5));
      // Only checks made while all four are still in the pool count as "under load".
      while (pdfPoolState().inFlight >= 2) {
        const ms = await healthOnce(base);
        if (pdfPoolState().inFlight >= 2) loaded.push(ms);
        await new Promise((r) => setTimeout(r, 5));
      }
      await Promise.all(packs);
    }
    return { idle, loaded };
  } finally {
    await new Promise((r) => server.close(r));
  }
}

/** The bench module (see tests/bench/run.ts). */
export async function benchPdf(): Promise<BenchRow[]> {
  // Reuse a cluster the runner started; else start one for this run.
  let stop = () => {};
  if (!process.env.TRAYPLAN_TEST_PG) {
    const started = await startTestCluster();
    process.env.TRAYPLAN_TEST_PG = started.baseUrl;
    stop = () => started.cluster.stop();
  }
  const db = await freshDatabase();
  try {
    const { models, print } = await demoLessons(db);
    const pagesOf = (m: LessonPackModel) => m.plan!.groups.length + 8;
    const longest = models.reduce((a, b) => (pagesOf(b) > pagesOf(a) ? b : a));
    const lesson = await timeRenders({ kind: 'lesson-pack', print, lesson: longest });
    const thirty = await timeRenders({
      kind: 'lesson-pack',
      print,
      lesson: await thirtyPageLesson(db, longest),
    });
    const [unit] = await db.db
      .select()
      .from(units)
      .where(eq(units.title, 'Rescue Rovers'))
      .orderBy(asc(units.title));
    const unitPack = (await loadUnitPack(db.db, unit!.id))!;
    const unitRun = await timeRenders({ kind: 'unit-pack', print, ...unitPack });
    const { idle, loaded } = await healthUnderLoad(db, unit!.id);
    const [idle50, idle99] = [percentile(idle, 50), percentile(idle, 99)];
    const [load50, load99] = [percentile(loaded, 50), percentile(loaded, 99)];
    const pps = (r: { ms: number; pages: number }) => round(r.pages / (r.ms / 1000));
    const met = (ok: boolean) => (ok ? 'met' : 'MISSED');
    return [
      {
        name: `pdf: longest demo lesson pack ("${longest.title}", ${lesson.pages} pages)`,
        median: round(lesson.ms),
        unit: 'ms',
        samples: RUNS,
        note: `${pps(lesson)} pages/s, in the worker pool`,
      },
      {
        name: `pdf: ${thirty.pages}-page lesson pack (that lesson, 44 students in pairs)`,
        median: round(thirty.ms),
        unit: 'ms',
        samples: RUNS,
        note: `${pps(thirty)} pages/s; target: a 30-page pack < 1000 ms median: ${met(thirty.ms < 1000)}`,
      },
      {
        name: `pdf: unit pack "Rescue Rovers" (${unitRun.pages} pages)`,
        median: round(unitRun.ms),
        unit: 'ms',
        samples: RUNS,
        note: `${pps(unitRun)} pages/s`,
      },
      { name: 'health: p50, idle', median: round(idle50, 2), unit: 'ms', samples: idle.length },
      { name: 'health: p99, idle', median: round(idle99, 2), unit: 'ms', samples: idle.length },
      {
        name: 'health: p50 while 4 unit packs render',
        median: round(load50, 2),
        unit: 'ms',
        samples: loaded.length,
        ratio: round(load50 / idle50, 2),
        note: 'ratio = p50 under load ÷ p50 idle',
      },
      {
        name: 'health: p99 while 4 unit packs render',
        median: round(load99, 2),
        unit: 'ms',
        samples: loaded.length,
        ratio: round(load99 / idle99, 2),
        note: `ratio = p99 under load ÷ p99 idle; target ≤ 3×: ${met(load99 <= 3 * idle99)}`,
      },
    ];
  } finally {
    await closePdfPool();
    await db.drop();
    stop();
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  for (const row of await benchPdf()) console.log(JSON.stringify(row));
}
