/**
 * A clean stop (what SIGTERM runs): stop accepting connections, answer every request already sent
 * on an open connection (even one the server has not read yet), then close the session store and
 * the pool in that order. Raw sockets make "sent but not yet read" exact: the second request of
 * each keep-alive connection is written in the same tick as the stop begins.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import net from 'node:net';
import { loadConfig } from '../../server/config.js';
import { freePort } from '../../server/db/cluster.js';
import { serve, type Running } from '../../server/main.js';
import { freshDatabase, type TestDatabase } from '../support/db.js';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp.js';

let database: TestDatabase;
let smtp: FakeSmtp;
before(async () => {
  database = await freshDatabase();
  smtp = await startFakeSmtp();
});
after(async () => {
  await smtp.close();
  await database.drop();
});

const CONNECTIONS = 30;
const request = (path: string) => `GET ${path} HTTP/1.1\r\nHost: 127.0.0.1\r\n\r\n`;

/** A keep-alive connection that collects complete HTTP answers (Content-Length bodies). */
function connection(port: number) {
  const socket = net.connect(port, '127.0.0.1');
  let buffer = '';
  const answers: number[] = [];
  let waiters: (() => void)[] = [];
  let ended = false;
  socket.setEncoding('utf8');
  socket.on('data', (chunk: string) => {
    buffer += chunk;
    for (;;) {
      const headEnd = buffer.indexOf('\r\n\r\n');
      if (headEnd < 0) break;
      const head = buffer.slice(0, headEnd);
      const length = Number(/content-length: (\d+)/i.exec(head)?.[1] ?? 0);
      if (buffer.length < headEnd + 4 + length) break;
      answers.push(Number(head.split(' ')[1]));
      buffer = buffer.slice(headEnd + 4 + length);
    }
    waiters.forEach((w) => w());
  });
  const end = () => {
    ended = true;
    waiters.forEach((w) => w());
  };
  socket.on('close', end).on('error', end);
  return {
    socket,
    answers,
    /** Resolves when `n` answers arrived or the connection ended. */
    until: (n: number) =>
      new Promise<void>((resolve) => {
        const check = () => (answers.length >= n || ended ? resolve() : undefined);
        waiters = [...waiters, check];
        check();
      }),
  };
}

describe('stopping the server', () => {
  it('answers every request already sent on a connection, then closes in order', async () => {
    const port = await freePort();
    const running: Running = await serve(
      loadConfig({ databaseUrl: database.url, smtpUrl: smtp.url, port, host: '127.0.0.1' }),
    );
    const errors: string[] = [];
    const originalError = console.error;
    console.error = (...args: unknown[]) => {
      errors.push(args.map(String).join(' '));
    };
    try {
      const conns = Array.from({ length: CONNECTIONS }, () => connection(port));
      for (const c of conns) c.socket.write(request('/api/health'));
      await Promise.all(conns.map((c) => c.until(1)));
      assert.ok(conns.every((c) => c.answers[0] === 200));

      // The second request of every connection is on its way when the stop begins.
      for (const c of conns) c.socket.write(request('/api/health'));
      const closing = running.close();
      await Promise.all(conns.map((c) => c.until(2)));
      const second = conns.map((c) => c.answers[1]);
      assert.equal(
        second.filter((s) => s === 200).length,
        CONNECTIONS,
        `second answers: ${second.join(' ')}`,
      );
      // New connections are refused once the stop began.
      await assert.rejects(
        new Promise((resolve, reject) => {
          const s = net.connect(port, '127.0.0.1', () => resolve(s));
          s.on('error', reject);
        }),
      );
      await closing;
      await new Promise((r) => setTimeout(r, 300));
      conns.forEach((c) => c.socket.destroy());
    } finally {
      console.error = originalError;
    }
    assert.deepEqual(
      errors.filter((e) => /pool|session/i.test(e)),
      [],
      'nothing uses the pool after it ended',
    );
    assert.equal(running.database.pool.ending, true);
  });
});
