/**
 * The e-mail outbox: messages are inserted in the transaction of the action that causes them and
 * delivered afterwards by this worker, retried with capped exponential backoff while SMTP is down.
 */
import nodemailer, { type Transporter } from 'nodemailer';
import { and, eq, sql } from 'drizzle-orm';
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

/** A claim older than this was lost with its worker (a crash mid-send): the message goes again. */
export const LOST_CLAIM_MINUTES = 5;

type OutboxRow = typeof outbox.$inferSelect;

/**
 * Claims the oldest message that is due, in one UPDATE: of any number of workers on any number
 * of instances exactly one gets it. SKIP LOCKED lets the others claim the next one meanwhile.
 */
export async function claimNext(db: Db): Promise<OutboxRow | undefined> {
  const result = await db.execute<Record<string, unknown>>(sql`
    UPDATE outbox SET status = 'sending', claimed_at = now(), attempts = attempts + 1
    WHERE id = (
      SELECT id FROM outbox
      WHERE (status = 'pending' AND next_attempt_at <= now())
         OR (status = 'sending'
             AND claimed_at < now() - make_interval(mins => ${LOST_CLAIM_MINUTES}))
      ORDER BY created_at
      LIMIT 1
      FOR UPDATE SKIP LOCKED
    )
    RETURNING id`);
  const id = result.rows[0]?.id as string | undefined;
  if (!id) return undefined;
  const [row] = await db.select().from(outbox).where(eq(outbox.id, id));
  return row;
}

/** Sends every message that is due, one claim at a time; resolves with how many went out. */
export async function deliverDue(
  db: Db,
  transport: Transporter,
  from: string,
  shouldStop: () => boolean = () => false,
): Promise<number> {
  let sent = 0;
  for (;;) {
    if (shouldStop()) return sent;
    const row = await claimNext(db);
    if (!row) return sent;
    try {
      await transport.sendMail({
        from,
        to: row.toAddress,
        subject: row.subject,
        text: row.textBody,
        ...(row.htmlBody ? { html: row.htmlBody } : {}),
      });
      await db
        .update(outbox)
        .set({ status: 'sent', sentAt: sql`now()`, lastError: null })
        .where(and(eq(outbox.id, row.id), eq(outbox.status, 'sending')));
      sent++;
    } catch (err) {
      await db
        .update(outbox)
        .set({
          status: 'pending',
          claimedAt: null,
          lastError: (err as Error).message.slice(0, 500),
          nextAttemptAt: sql`now() + make_interval(secs => ${backoffSeconds(row.attempts)})`,
        })
        .where(eq(outbox.id, row.id));
    }
  }
}

/** Runs deliverDue in this process on a timer and on kick() (tests and single-process runs). */
export function startOutboxWorker(
  db: Db,
  transport: Transporter,
  from: string,
  pollMs = 5000,
): OutboxWorker {
  let running: Promise<void> | null = null;
  let again = false;
  let stopped = false;

  function kick(): Promise<void> {
    if (running) {
      again = true;
      return running;
    }
    running = (async () => {
      do {
        again = false;
        try {
          await deliverDue(db, transport, from, () => stopped);
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
