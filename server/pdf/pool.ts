/**
 * The worker-thread pool that renders PDFs off the event loop (piscina). It starts on the first
 * render, not at import, and `closePdfPool()` stops it on shutdown. Two threads, for the 2-core
 * machines Trayplan runs on; each runs at a lower priority (nice +10, through piscina's
 * `niceIncrement`) so that when a render and a request want the same core, the request wins.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import type { RenderJob } from './model.js';

/** Threads rendering at once. */
export const PDF_THREADS = 2;
/** Jobs that may wait for a thread; beyond that a request is told to come back later. */
export const PDF_MAX_QUEUE = 32;
/** A render taking longer than this is abandoned. */
export const PDF_TIMEOUT_MS = 60_000;

/**
 * The worker module beside this file, with this file's own extension: `worker.ts` when the
 * server runs from source under tsx, `worker.js` if it is ever compiled.
 */
export const PDF_WORKER_FILE = path.join(
  path.dirname(fileURLToPath(import.meta.url)),
  `worker${path.extname(fileURLToPath(import.meta.url))}`,
);

/**
 * A `.ts` worker needs tsx's loader in its own thread: worker threads do not take it from the
 * parent's hooks, so it is registered by `--import tsx` in the worker's execArgv.
 */
export const PDF_WORKER_EXEC_ARGV = PDF_WORKER_FILE.endsWith('.ts') ? ['--import', 'tsx'] : [];

let pool: Piscina<RenderJob, Uint8Array> | null = null;
let inFlight = 0;

function startPool(): Piscina<RenderJob, Uint8Array> {
  pool ??= new Piscina<RenderJob, Uint8Array>({
    filename: PDF_WORKER_FILE,
    execArgv: PDF_WORKER_EXEC_ARGV,
    minThreads: PDF_THREADS,
    maxThreads: PDF_THREADS,
    maxQueue: PDF_MAX_QUEUE,
    niceIncrement: 10,
    // A stuck render must not hold the shutdown for long.
    closeTimeout: 10_000,
  });
  return pool;
}

/** Whether the queue is full (the route answers 503 then). */
export class PdfBusyError extends Error {
  override readonly name = 'PdfBusyError';
}

/** Renders a job on the pool (starting it if needed); rejects when `signal` aborts. */
export async function renderInPool(job: RenderJob, signal?: AbortSignal): Promise<Uint8Array> {
  const p = startPool();
  if (p.queueSize >= PDF_MAX_QUEUE) throw new PdfBusyError('Too many files are being made.');
  const timeout = AbortSignal.timeout(PDF_TIMEOUT_MS);
  inFlight++;
  try {
    const bytes = await p.run(job, {
      signal: signal ? AbortSignal.any([signal, timeout]) : timeout,
    });
    // A moved buffer arrives as the typed array itself.
    return bytes instanceof Uint8Array ? bytes : new Uint8Array(bytes as ArrayBufferLike);
  } finally {
    inFlight--;
  }
}

/** What the pool is doing (for tests and the benchmark). */
export function pdfPoolState(): { started: boolean; threads: number; inFlight: number } {
  return { started: pool !== null, threads: pool?.threads.length ?? 0, inFlight };
}

/**
 * Stops the pool: waits for renders already running (up to 10 s), then ends the threads. Call
 * it on shutdown after the HTTP server has stopped taking requests. A later render starts a new
 * pool, so calling it twice, or before any render, is harmless.
 */
export async function closePdfPool(): Promise<void> {
  const p = pool;
  pool = null;
  if (p) await p.close();
}
