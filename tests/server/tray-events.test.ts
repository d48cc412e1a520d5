/**
 * The teacher's live board (WHATWG HTML, "Server-sent events"): two instances of the server on
 * one database, as two HTTP clients see them. A tick saved through one instance reaches a stream
 * open on the other (PostgreSQL LISTEN/NOTIFY); a stream opened again starts with the whole board
 * (catching up); shutting down ends open streams.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { createApp } from '../../server/app.js';
import { closeTrayEvents } from '../../server/trays/events.js';
import { testApp, type TestApp } from '../support/app.js';
import { TEACHER } from '../support/planning.js';
import { DEMO_PASSWORD } from '../../server/seed/index.js';
import { demoLessonId, moveLesson } from '../support/trays.js';
import { trayLabelCodes } from '../../server/trays/labels.js';
import type { TrayBoard } from '../../shared/schemas/trays.js';
import type { PrepPlan } from '../../shared/prep/index.js';

let t: TestApp;
const servers: http.Server[] = [];
const bases: string[] = [];
let lessonId = '';
let cookie = '';
let tokens: string[] = [];
let plan: PrepPlan;

function listen(app: http.RequestListener): Promise<{ server: http.Server; base: string }> {
  const server = http.createServer(app);
  return new Promise((resolve) =>
    server.listen(0, '127.0.0.1', () =>
      resolve({ server, base: `http://127.0.0.1:${(server.address() as AddressInfo).port}` }),
    ),
  );
}

/** Signs in with fetch (a second HTTP client, its own cookies) and returns the cookie header. */
async function signIn(base: string): Promise<string> {
  const csrf = await fetch(`${base}/api/auth/csrf`);
  const jar = csrf.headers.getSetCookie().map((c) => c.split(';')[0]!);
  const xsrf = decodeURIComponent(jar.find((c) => c.startsWith('XSRF-TOKEN='))!.slice(11));
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-xsrf-token': xsrf, cookie: jar.join('; ') },
    body: JSON.stringify({ email: TEACHER, password: DEMO_PASSWORD }),
  });
  assert.equal(res.status, 200);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0]!)
    .join('; ');
}

/** An open event stream: its boards as they arrive, and whether the server ended it. */
interface Stream {
  boards: TrayBoard[];
  raw: string;
  ended: Promise<void>;
  close: () => void;
  next: (test: (b: TrayBoard) => boolean) => Promise<TrayBoard>;
}

function openStream(base: string): Promise<Stream> {
  return new Promise((resolve, reject) => {
    const req = http.get(
      `${base}/api/lessons/${lessonId}/trays/events`,
      { headers: { cookie, accept: 'text/event-stream' } },
      (res) => {
        assert.equal(res.statusCode, 200);
        assert.match(res.headers['content-type'] ?? '', /^text\/event-stream/);
        const waiting: { test: (b: TrayBoard) => boolean; done: (b: TrayBoard) => void }[] = [];
        const stream: Stream = {
          boards: [],
          raw: '',
          ended: new Promise((r) => res.on('end', () => r())),
          close: () => req.destroy(),
          next: (test) =>
            new Promise((done) => {
              const hit = stream.boards.find(test);
              if (hit) done(hit);
              else waiting.push({ test, done });
            }),
        };
        let buffer = '';
        res.setEncoding('utf8');
        res.on('data', (chunk: string) => {
          stream.raw += chunk;
          buffer += chunk;
          let cut;
          while ((cut = buffer.indexOf('\n\n')) >= 0) {
            const block = buffer.slice(0, cut);
            buffer = buffer.slice(cut + 2);
            const data = block
              .split('\n')
              .filter((l) => l.startsWith('data: '))
              .map((l) => l.slice(6))
              .join('\n');
            if (!data || !/^event: trays$/m.test(block)) continue;
            const board = JSON.parse(data) as TrayBoard;
            stream.boards.push(board);
            for (const w of [...waiting]) {
              if (w.test(board)) {
                waiting.splice(waiting.indexOf(w), 1);
                w.done(board);
              }
            }
          }
        });
        resolve(stream);
      },
    );
    req.on('error', reject);
  });
}

const within = <T>(p: Promise<T>, ms = 5000) =>
  Promise.race([
    p,
    new Promise<never>((_, reject) => setTimeout(() => reject(new Error('timed out')), ms)),
  ]);

before(async () => {
  t = await testApp();
  lessonId = await demoLessonId(t.database.db);
  await moveLesson(t.database.db, lessonId, 0);
  // Two instances of the server: each app has its own LISTEN connection and streams.
  for (const app of [
    t.app,
    createApp(t.ctx, { pruneSessions: false, clientDir: '/nonexistent' }),
  ]) {
    const { server, base } = await listen(app);
    servers.push(server);
    bases.push(base);
  }
  cookie = await signIn(bases[1]!);
  const codes = await trayLabelCodes(t.ctx, lessonId, [1, 2, 3]);
  tokens = codes.groupUrls.map((u) => u.split('/tray/')[1]!);
  const res = await fetch(`${bases[0]}/api/lessons/${lessonId}/prep`, { headers: { cookie } });
  plan = (await res.json()) as PrepPlan;
});
after(async () => {
  await closeTrayEvents();
  for (const s of servers) await new Promise((r) => s.close(r));
  await t.close();
});

describe('GET /api/lessons/:id/trays/events', () => {
  it('sends the board at once, then a tick saved on the other instance', async () => {
    const stream = await openStream(bases[1]!);
    const first = await within(stream.next(() => true));
    assert.equal(first.groups.length, plan.groups.length);
    assert.equal(first.groups[1]!.linesOut, 0);
    // The tick goes to the other instance, from a client without any cookie.
    const part = plan.groups[1]!.lines[0]!.partCode;
    const put = await fetch(`${bases[0]}/api/trays/${tokens[1]}/lines/${part}`, {
      method: 'PUT',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ out: true }),
    });
    assert.equal(put.status, 200);
    const next = await within(stream.next((b) => b.groups[1]!.linesOut === 1));
    assert.equal(next.groups[0]!.linesOut, 0);
    stream.close();
  });

  it('catches up on reconnect: a stream opened after a tick starts with it', async () => {
    const part = plan.groups[2]!.lines[0]!.partCode;
    await fetch(`${bases[1]}/api/trays/${tokens[2]}/lines/${part}`, {
      method: 'PUT',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ out: true, back: true, missing: 1 }),
    });
    const stream = await openStream(bases[0]!);
    const first = await within(stream.next(() => true));
    assert.deepEqual(first.groups[2]!.missing, [{ partCode: part, count: 1 }]);
    assert.equal(first.groups[2]!.linesBack, 1);
    assert.match(stream.raw, /^retry: \d+$/m);
    stream.close();
  });

  it('is 401 without a session', async () => {
    const res = await fetch(`${bases[0]}/api/lessons/${lessonId}/trays/events`);
    assert.equal(res.status, 401);
  });

  it('ends open streams cleanly when the server shuts down', async () => {
    const streams = [await openStream(bases[0]!), await openStream(bases[1]!)];
    await within(Promise.all(streams.map((s) => s.next(() => true))));
    await closeTrayEvents();
    await within(Promise.all(streams.map((s) => s.ended)));
  });
});
