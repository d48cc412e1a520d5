/**
 * The PostgreSQL job queue (pg-boss 10: later majors need Node 22). Every instance of the server
 * starts one; a job is fetched by exactly one of them, and a scheduled job (cron) fires once per
 * schedule whichever instances run. Register a job in ./registry.ts; nothing here names one.
 */
import PgBoss from 'pg-boss';

/** One kind of job: its queue name, what it does, and (optionally) when it runs by itself. */
export interface JobDefinition<T extends object = object> {
  name: string;
  run: (data: T) => Promise<void>;
  /** A cron expression (UTC) for a job that runs on a timer. */
  cron?: string;
}

export interface Jobs {
  /** Queues a job; the local worker is woken so it starts without waiting for its next poll. */
  send: (name: string, data?: object) => Promise<void>;
  /** Stops fetching, lets running jobs finish (up to `timeoutMs`), closes the queue's pool. */
  stop: (timeoutMs?: number) => Promise<void>;
}

export interface JobsOptions {
  connectionString: string;
  definitions: JobDefinition[];
  /** Seconds between a worker's polls (pg-boss's default is 2). */
  pollingIntervalSeconds?: number;
  /** Whether this instance fetches and runs jobs (false: it only queues them). */
  work?: boolean;
}

export async function startJobs(options: JobsOptions): Promise<Jobs> {
  const boss = new PgBoss({
    connectionString: options.connectionString,
    max: 3,
    application_name: 'trayplan-jobs',
  });
  boss.on('error', (err: Error) => console.error('Job queue error:', err.message));
  await boss.start();
  const workers = new Map<string, string>();
  for (const job of options.definitions) {
    await boss.createQueue(job.name);
    if (options.work !== false) {
      const id = await boss.work<object>(
        job.name,
        { pollingIntervalSeconds: options.pollingIntervalSeconds ?? 2, batchSize: 1 },
        async ([one]) => {
          if (one) await job.run(one.data);
        },
      );
      workers.set(job.name, id);
    }
    if (job.cron) await boss.schedule(job.name, job.cron, {}, { tz: 'UTC' });
  }
  return {
    send: async (name, data = {}) => {
      await boss.send(name, data);
      const worker = workers.get(name);
      if (worker) boss.notifyWorker(worker);
    },
    stop: (timeoutMs = 10_000) => boss.stop({ graceful: true, wait: true, timeout: timeoutMs }),
  };
}
