/** A small timing harness: warm-up, batched samples, median. */
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';

// A full collection before each measurement keeps one measurement's garbage out of the next.
setFlagsFromString('--expose-gc');
const collect = runInNewContext('gc') as () => void;

export interface MeasureOptions {
  /** Time spent warming up before sampling (ms). */
  warmupMs?: number;
  /** Time budget for sampling (ms); at least `minSamples` are taken anyway. */
  budgetMs?: number;
  minSamples?: number;
  /** Each sample runs the function this long at least (ms), so tiny functions are timed fairly. */
  sampleMs?: number;
}

export interface Measurement {
  /** Median time of one call, in microseconds. */
  medianUs: number;
  samples: number;
}

/**
 * Each result is compared with a marker object so the work cannot be dropped, and is garbage
 * as soon as the call returns, as a plan is once the server has sent it: keeping the previous
 * result alive would double the live heap and charge its copying to the next call.
 */
const marker = {};
export let sink = 0;

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
}

/** Times `fn`: the median over samples of the mean time per call within each sample. */
export function measure(fn: () => unknown, opts: MeasureOptions = {}): Measurement {
  const { warmupMs = 200, budgetMs = 1500, minSamples = 15, sampleMs = 2 } = opts;
  collect();
  const warmEnd = performance.now() + warmupMs;
  let calls = 0;
  while (performance.now() < warmEnd || calls < 3) {
    if (fn() === marker) sink++;
    calls++;
  }
  // Calls per sample so one sample lasts about `sampleMs`.
  const t0 = performance.now();
  if (fn() === marker) sink++;
  const once = Math.max(performance.now() - t0, 0.0005);
  const batch = Math.max(1, Math.round(sampleMs / once));
  const times: number[] = [];
  const end = performance.now() + budgetMs;
  while (times.length < minSamples || performance.now() < end) {
    const start = performance.now();
    for (let i = 0; i < batch; i++) if (fn() === marker) sink++;
    times.push(((performance.now() - start) / batch) * 1000);
    if (times.length >= 2000) break;
  }
  return { medianUs: median(times), samples: times.length };
}
