/** One figure of `npm run bench`. */
export interface BenchRow {
  /** What was measured, e.g. `engine: compute 8 groups × 250 lines × 8 tubs`. */
  name: string;
  /** Median over repeated runs. */
  median: number;
  /** Unit of `median`: `µs`, `ms`, `req/s`, … */
  unit: string;
  /** This figure divided by a baseline measured in the same run, where one makes sense. */
  ratio?: number;
  /** Target, caveats, or how the baseline was made. */
  note?: string;
  /** How many timed samples the median is over. */
  samples?: number;
}

/** A bench module: runs its measurements and returns their rows. */
export type BenchModule = () => Promise<BenchRow[]>;
