/** Timing helpers shared by the benchmark modules. */
import { performance } from 'node:perf_hooks';

export function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

/** Runs `fn` `warmup` times untimed, then `runs` times; returns each run's milliseconds. */
export function timeRuns(fn: () => unknown, runs: number, warmup = 3): number[] {
  for (let i = 0; i < warmup; i++) fn();
  const out: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    out.push(performance.now() - t0);
  }
  return out;
}

export function round(x: number, digits = 3): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}
