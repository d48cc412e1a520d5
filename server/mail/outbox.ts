/**
 * The e-mail outbox: messages are inserted in the transaction of the action that causes them and
 * delivered afterwards by this worker, retried with capped exponential backoff while SMTP is down.
 */
import nodemailer, { type Transporter } from 'nodemailer';
import { and, asc, eq, lte, sql } from 'drizzle-orm';
import type { Db, Tx } from '../db/client.js';
import { outbox } from '../db/schema/outbox.js';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

/** Queues a message inside the caller's transaction. */
export async function enqueueMail(tx: Tx, mail: OutgoingMail): Promise<void> {
  await tx.insert(outbox).values({
    toAddress: mail.to,
    subject: mail.subject,
    textBody: mail.text,
    htmlBody: mail.html ?? null,
  });
}

/** Seconds before retry number `attempts` (1, 2, …): 5 s doubling, at most 15 minutes. */
export function backoffSeconds(attempts: number): number {
  return Math.min(5 * 2 ** Math.max(0, attempts - 1), 15 * 60);
}

export interface OutboxWorker {
  /** Sends what is due now; resolves when this pass is over. */
  kick: () => Promise<void>;
  /** Sends until nothing due remains (tests). */
  drain: () => Promise<void>;
  stop: () => Promise<void>;
}

/** nodemailer over SMTP_URL; a loopback server (the fake) is spoken to without STARTTLS. */
export function createMailTransport(smtpUrl: string): Transporter {
  const url = new URL(smtpUrl);
  const loopback = url.hostname === '127.0.0.1' || url.hostname === 'localhost';
  return nodemailer.createTransport({
    host: url.hostname,
    port: Number(url.port) || (url.protocol === 'smtps:' ? 465 : 587),
    secure: url.protocol === 'smtps:',
    ignoreTLS: loopback,
    ...(url.username
      ? { auth: { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) } }
      : {}),
  });
}

export function startOutboxWorker(
  db: Db,
  transport: Transporter,
  from: string,
  pollMs = 5000,
): OutboxWorker {
  let running: Promise<void> | null = null;
  let again = false;
  let stopped = false;

  async function pass(): Promise<number> {
    let sent = 0;
    for (;;) {
      if (stopped) return sent;
      const done = await db.transaction(async (tx) => {
        const [row] = await tx
          .select()
          .from(outbox)
          .where(and(eq(outbox.status, 'pending'), lte(outbox.nextAttemptAt, sql`now()`)))
          .orderBy(asc(outbox.createdAt))
          .limit(1)
          .for('update', { skipLocked: true });
        if (!row) return false;
        try {
          await transport.sendMail({
            from,
            to: row.toAddress,
            subject: row.subject,
            text: row.textBody,
            ...(row.htmlBody ? { html: row.htmlBody } : {}),
          });
          await tx
            .update(outbox)
            .set({
              status: 'sent',
              sentAt: sql`now()`,
              attempts: row.attempts + 1,
              lastError: null,
            })
            .where(eq(outbox.id, row.id));
          sent++;
        } catch (err) {
          const attempts = row.attempts + 1;
          await tx
            .update(outbox)
            .set({
              attempts,
              lastError: (err as Error).message.slice(0, 500),
              nextAttemptAt: sql`now() + make_interval(secs => ${backoffSeconds(attempts)})`,
            })
            .where(eq(outbox.id, row.id));
        }
        return true;
      });
      if (!done) return sent;
    }
  }

  function kick(): Promise<void> {
    if (running) {
      again = true;
      return running;
    }
    running = (async () => {
      do {
        again = false;
        try {
          await pass();
        } catch (err) {
          if (!stopped) console.error('Outbox pass failed:', (err as Error).message);
        }
      } while (again && !stopped);
    })().finally(() => {
      running = null;
    });
    return running;
  }

  const timer = setInterval(() => void kick(), pollMs);
  timer.unref();

  return {
    kick,
    drain: async () => {
      await kick();
      await kick();
    },
    stop: async () => {
      stopped = true;
      clearInterval(timer);
      await running;
      transport.close();
    },
  };
}
