/**
 * The prep route under load (autocannon, 50 connections, loopback only, bounded in time) beside
 * the health route in the same run, on a throwaway cluster holding the demo seed.
 */
import autocannon from 'autocannon';
import type { AddressInfo } from 'node:net';
import { asc, eq } from 'drizzle-orm';
import { Browser, testApp } from '../support/app.js';
import { lessons, units } from '../../server/db/schema/index.js';
import type { BenchRow } from './types.js';

function load(url: string, headers: Record<string, string>): Promise<autocannon.Result> {
  return autocannon({ url, connections: 50, duration: 5, headers });
}

export async function benchServer(): Promise<BenchRow[]> {
  const t = await testApp();
  const server = t.app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  try {
    const b = new Browser(t.app);
    const res = await b.signIn('teacher@kestrel-ridge.example');
    const cookie = ([] as string[])
      .concat(res.headers['set-cookie'] ?? [])
      .map((c) => c.split(';')[0])
      .join('; ');
    const [unit] = await t.database.db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
    const [lesson] = await t.database.db
      .select()
      .from(lessons)
      .where(eq(lessons.unitId, unit!.id))
      .orderBy(asc(lessons.position))
      .offset(1)
      .limit(1);
    const health = await load(`${base}/api/health`, {});
    // The floor every signed-in request pays (session read, actor load): the prep route's baseline.
    const me = await load(`${base}/api/auth/me`, { cookie });
    const prep = await load(`${base}/api/lessons/${lesson!.id}/prep`, { cookie });
    if (prep.non2xx > 0) throw new Error(`prep answered ${prep.non2xx} non-2xx responses`);
    // The lesson page's refresh of an unchanged plan: a conditional GET answered 304.
    const tag = (await b.get(`/api/lessons/${lesson!.id}/prep`)).headers['etag'] as string;
    const unchanged = await load(`${base}/api/lessons/${lesson!.id}/prep`, {
      cookie,
      'if-none-match': tag,
    });
    if (unchanged['3xx'] !== unchanged.requests.total - unchanged.errors)
      throw new Error('the conditional prep GET did not answer 304 every time');
    if (me.non2xx > 0) throw new Error(`auth/me answered ${me.non2xx} non-2xx responses`);
    const share = me.requests.average ? prep.requests.average / me.requests.average : 0;
    const unchangedShare = me.requests.average
      ? unchanged.requests.average / me.requests.average
      : 0;
    return [
      {
        name: 'server: GET /api/auth/me, 50 connections',
        median: me.latency.p50,
        unit: 'ms',
        note: `p99 ${me.latency.p99} ms, ${Math.round(me.requests.average)} req/s`,
      },
      {
        name: 'server: prep throughput ÷ auth/me throughput',
        median: Number((share * 100).toFixed(0)),
        unit: '%',
        note: `target ≥ 50 %: ${share >= 0.5 ? 'met' : 'missed'}`,
      },
      {
        name: 'server: unchanged prep (304) throughput ÷ auth/me throughput',
        median: Number((unchangedShare * 100).toFixed(0)),
        unit: '%',
        note: `target ≥ 80 %: ${unchangedShare >= 0.8 ? 'met' : 'missed'}; p50 ${unchanged.latency.p50} ms, ${Math.round(unchanged.requests.average)} req/s`,
      },
      {
        name: 'server: GET /api/health, 50 connections',
        median: health.latency.p50,
        unit: 'ms',
        note: `p99 ${health.latency.p99} ms, ${Math.round(health.requests.average)} req/s`,
      },
      {
        name: 'server: GET /api/lessons/:id/prep (demo lesson 2), 50 connections',
        median: prep.latency.p50,
        unit: 'ms',
        ratio: Number(
          (prep.requests.average ? health.requests.average / prep.requests.average : 0).toFixed(1),
        ),
        note: `p99 ${prep.latency.p99} ms, ${Math.round(prep.requests.average)} req/s; ratio = health req/s ÷ prep req/s`,
      },
    ];
  } finally {
    // autocannon stops by dropping its connections; the answers it abandoned are still being
    // computed (and their sessions touched). Wait until the pool has had nothing to do for a
    // moment, so the pool ends after the last of them, not under them.
    const pool = t.database.pool;
    for (let quiet = 0; quiet < 3;) {
      await new Promise((r) => setTimeout(r, 100));
      quiet = pool.totalCount === pool.idleCount && pool.waitingCount === 0 ? quiet + 1 : 0;
    }
    // Let the last answers finish before the pool closes under them.
    await new Promise<void>((resolve) => {
      server.close(() => resolve());
      server.closeIdleConnections();
      setTimeout(() => server.closeAllConnections(), 2000).unref();
    });
    await t.close();
  }
}
