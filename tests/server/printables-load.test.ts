/**
 * PDF rendering runs off the event loop: a lazily started pool of worker threads (piscina),
 * running the TypeScript worker under tsx, closed by `closePdfPool()`. While four unit packs
 * render at once, `GET /api/health` keeps answering: every check comes back while the renders
 * are still running (an event loop held by rendering would answer only after them). How fast it
 * answers is a figure of `npm run bench` (health p99 while four unit packs render), never a
 * timed test.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readdirSync, readFileSync } from 'node:fs';
import { eq } from 'drizzle-orm';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';
import { download } from '../support/planning.js';
import { units } from '../../server/db/schema/index.js';
import {
  closePdfPool,
  PDF_THREADS,
  PDF_WORKER_EXEC_ARGV,
  PDF_WORKER_FILE,
  pdfPoolState,
} from '../../server/pdf/pool.js';

let t: TestApp;
let teacher: Browser;
let unitId = '';

async function until(condition: () => boolean, timeoutMs: number): Promise<void> {
  const end = Date.now() + timeoutMs;
  while (!condition()) {
    if (Date.now() > end) throw new Error('timed out waiting');
    await new Promise((r) => setTimeout(r, 10));
  }
}

/** Nice values of this process's threads (Linux: /proc/self/task/<tid>/stat, field 19). */
function threadNiceValues(): number[] {
  return readdirSync('/proc/self/task').map((tid) => {
    const stat = readFileSync(`/proc/self/task/${tid}/stat`, 'utf8');
    return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[16]);
  });
}

before(async () => {
  t = await testApp();
  teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
  const [unit] = await t.database.db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
  unitId = unit!.id;
});
after(async () => {
  await closePdfPool();
  await t.close();
});

describe('the PDF worker pool', () => {
  it('is not started by building the app or by requests that render nothing', async () => {
    assert.deepEqual(pdfPoolState(), { started: false, threads: 0, inFlight: 0 });
    assert.equal((await new Browser(t.app).get('/api/health')).status, 200);
    assert.equal((await teacher.get(`/api/units/${unitId}/prep.ics`)).status, 200);
    assert.equal(pdfPoolState().started, false);
  });

  it('starts on the first render, running the TypeScript worker under tsx, at a lower priority', async () => {
    assert.match(PDF_WORKER_FILE, /server\/pdf\/worker\.ts$/);
    assert.deepEqual(PDF_WORKER_EXEC_ARGV, ['--import', 'tsx']);
    const res = await download(teacher, `/api/units/${unitId}/pack.pdf`);
    assert.equal(res.status, 200);
    assert.equal((res.body as Buffer).subarray(0, 5).toString(), '%PDF-');
    assert.deepEqual(pdfPoolState(), { started: true, threads: PDF_THREADS, inFlight: 0 });
    if (process.platform === 'linux') {
      assert.ok(threadNiceValues().includes(10), 'render threads at nice +10');
      assert.ok(threadNiceValues().includes(0), 'the main thread at normal priority');
    }
  });

  it('answers GET /api/health while four unit packs render', { timeout: 120_000 }, async () => {
    const anonymous = new Browser(t.app);
    const packs = [1, 2, 3, 4].map(() => download(teacher, `/api/units/${unitId}/pack.pdf`));
    // Wait until all four are loaded and handed to the pool: two rendering, two queued.
    await until(() => pdfPoolState().inFlight === 4, 30_000);
    for (let i = 0; i < 10; i++) {
      const res = await anonymous.get('/api/health');
      assert.equal(res.status, 200);
      assert.deepEqual(res.body, { status: 'ok', db: 'ok' });
    }
    // The renders were still running when the last health check came back.
    assert.ok(pdfPoolState().inFlight > 0, 'packs still rendering');
    for (const res of await Promise.all(packs)) {
      assert.equal(res.status, 200);
      assert.equal((res.body as Buffer).subarray(0, 5).toString(), '%PDF-');
    }
    assert.equal(pdfPoolState().inFlight, 0);
  });

  // The timeout only guards against a hang: a unit pack on a busy machine takes seconds.
  it(
    'closes on closePdfPool() and starts again for the next file',
    { timeout: 120_000 },
    async () => {
      await closePdfPool();
      assert.deepEqual(pdfPoolState(), { started: false, threads: 0, inFlight: 0 });
      await closePdfPool();
      const res = await download(teacher, `/api/units/${unitId}/pack.pdf`);
      assert.equal(res.status, 200);
      assert.equal(pdfPoolState().started, true);
    },
  );
});
