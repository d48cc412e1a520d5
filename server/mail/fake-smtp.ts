/**
 * The development and test stand-in for a hosted SMTP service: an smtp-server on loopback that
 * keeps every message it receives in memory, parsed back with mailparser.
 */
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import { randomUUID } from 'node:crypto';
import type { DevMail } from '../../shared/schemas/members.js';

export interface FakeSmtp {
  port: number;
  url: string;
  /** Messages received, newest first. */
  messages: () => DevMail[];
  /** The raw RFC 5322 source of each message, in arrival order. */
  raw: () => string[];
  /** Resolves when `count` messages in all have arrived (or rejects after `timeoutMs`). */
  waitFor: (count: number, timeoutMs?: number) => Promise<DevMail[]>;
  /** Whether to refuse every message, to simulate an outage. */
  setRefusing: (refusing: boolean) => void;
  close: () => Promise<void>;
}

const LINK = /https?:\/\/[^\s<>"')]+/g;

export async function startFakeSmtp(port = 0): Promise<FakeSmtp> {
  const received: DevMail[] = [];
  const sources: string[] = [];
  const waiters: { count: number; resolve: () => void }[] = [];
  let refusing = false;

  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    disableReverseLookup: true,
    logger: false,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        if (refusing) {
          callback(
            Object.assign(new Error('Mailbox unavailable (simulated outage)'), {
              responseCode: 451,
            }),
          );
          return;
        }
        const source = Buffer.concat(chunks).toString('utf8');
        simpleParser(source)
          .then((mail) => {
            const text = mail.text ?? '';
            const toField = Array.isArray(mail.to) ? mail.to : mail.to ? [mail.to] : [];
            sources.push(source);
            received.unshift({
              id: randomUUID(),
              to: toField.flatMap((a) => a.value.map((v) => v.address ?? '')),
              from: mail.from?.text ?? '',
              subject: mail.subject ?? '',
              text,
              receivedAt: new Date().toISOString(),
              links: [...new Set(text.match(LINK) ?? [])],
            });
            for (const w of waiters.filter((w) => received.length >= w.count)) w.resolve();
            callback();
          })
          .catch((err: Error) => callback(err));
      });
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const address = server.server.address();
  const actual = typeof address === 'object' && address ? address.port : port;

  return {
    port: actual,
    url: `smtp://127.0.0.1:${actual}`,
    messages: () => [...received],
    raw: () => [...sources],
    setRefusing: (r) => {
      refusing = r;
    },
    waitFor: (count, timeoutMs = 10_000) =>
      new Promise((resolve, reject) => {
        if (received.length >= count) return resolve([...received]);
        const timer = setTimeout(
          () => reject(new Error(`Expected ${count} messages, got ${received.length}`)),
          timeoutMs,
        );
        waiters.push({
          count,
          resolve: () => {
            clearTimeout(timer);
            resolve([...received]);
          },
        });
      }),
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}
