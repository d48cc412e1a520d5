/**
 * Every job Trayplan runs, in one place. Add a job here (a name, what it does, and a cron
 * expression when it runs by itself); startJobs() creates its queue and a worker on every instance.
 */
import type { Transporter } from 'nodemailer';
import type { Db } from '../db/client.js';
import { deliverDue } from '../mail/outbox.js';
import { pruneCounters } from '../auth/throttle.js';
import type { JobDefinition } from './index.js';

/** Sends the outbox: queued after each commit that adds mail, and every minute for retries. */
export const MAIL_JOB = 'mail-deliver';
/** Deletes sign-in and reset counters whose 15-minute window ended. */
export const PRUNE_COUNTERS_JOB = 'attempt-counters-prune';

export interface JobDeps {
  db: Db;
  transport: Transporter;
  mailFrom: string;
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
      name: PRUNE_COUNTERS_JOB,
      cron: '*/15 * * * *',
      run: async () => {
        await pruneCounters(deps.db);
      },
    },
  ];
}
