import type { BenchDataset } from './dataset';

/** One printed figure; `goal` and `met` when the figure has a target. */
export interface Figure {
  label: string;
  value: string;
  goal?: string;
  met?: boolean;
}

export interface BenchContext {
  root: string;
  /** Built lazily, once, by the first measurement that needs the 100,000-claim database. */
  dataset(): BenchDataset;
  connections: number;
  durationSeconds: number;
}

/** One measurement of `npm run bench`: a file under tests/bench/measurements/ exports one of these. */
export interface Measurement {
  name: string;
  run(ctx: BenchContext): Promise<Figure[]>;
}
