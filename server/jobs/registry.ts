/**
 * Every job Trayplan runs, in one place. Add a job here (a name, what it does, and a cron
 * expression when it runs by itself); startJobs() creates its queue and a worker on every instance.
 */
import type { Transporter } from 'nodemailer';
import type { Db } from '../db/client.js';
import { deliverDue } from '../mail/outbox.js';
import { pruneCounters } from '../auth/throttle.js';
import { pruneSentReminders, sweepReminders } from '../reminders/sweep.js';
import type { JobDefinition } from './index.js';

/** Sends the outbox: queued after each commit that adds mail, and every minute for retries. */
export const MAIL_JOB = 'mail-deliver';
/** Deletes sign-in and reset counters whose 15-minute window ended. */
export const PRUNE_COUNTERS_JOB = 'attempt-counters-prune';

/** Queues the reminder e-mails that are due (charging, morning summary) and sends them. */
export const REMINDERS_JOB = 'prep-reminders';
/** Forgets sent reminders that can no longer be due. */
export const PRUNE_REMINDERS_JOB = 'sent-reminders-prune';

export interface JobDeps {
  db: Db;
  transport: Transporter;
  mailFrom: string;
  /** Public address of the app, for the links in reminders. */
  appUrl: string;
}

export function jobDefinitions(deps: JobDeps): JobDefinition[] {
  return [
    {
      name: MAIL_JOB,
      cron: '* * * * *',
      run: async () => {
        await deliverDue(deps.db, deps.transport, deps.mailFrom);
      },
    },
    {
      // Every minute: a reminder is due from its minute on, so one sweep that did not run (a
      // restart, every instance down) is caught up by the next; the claim stops doubles.
      name: REMINDERS_JOB,
      cron: '* * * * *',
      run: async () => {
        const queued = await sweepReminders(deps.db, deps.appUrl);
        if (queued > 0) await deliverDue(deps.db, deps.transport, deps.mailFrom);
      },
    },
    {
      name: PRUNE_REMINDERS_JOB,
      cron: '17 3 * * *',
      run: async () => {
        await pruneSentReminders(deps.db);
      },
    },
    {
      name: PRUNE_COUNTERS_JOB,
      cron: '*/15 * * * *',
      run: async () => {
        await pruneCounters(deps.db);
      },
    },
  ];
}
