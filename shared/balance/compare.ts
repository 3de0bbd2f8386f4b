/**
 * Side-by-side comparison of two balance results (baseline and variant):
 * every numeric output with its change. Time histories are returned as
 * paired series rather than compared sample by sample; the sensitivity
 * ranking is not compared (it is a ranking, not a value).
 */
import type { BalanceResult } from './index.js';

export interface ComparisonRow {
  /** Dotted path of the output, e.g. `understeerBudget.rollSteer` or `gains.rows[9].yawRateGainPerS`. */
  path: string;
  baseline: number | null;
  variant: number | null;
  /** variant − baseline (null when either is missing). */
  change: number | null;
  /** Change relative to |baseline|, % (null when the baseline is 0 or missing). */
  changePct: number | null;
}

export interface BalanceComparison {
  baselineName: string | null;
  variantName: string | null;
  rows: ComparisonRow[];
  yawRateHistory: { baseline: { tS: number; yawRateDegPerS: number }[]; variant: { tS: number; yawRateDegPerS: number }[] };
}

const SKIP = new Set(['stepSteer.history', 'stepSteer.withRoll.history', 'sensitivity', 'caution', 'vehicleName']);

function flatten(value: unknown, path: string, out: Map<string, number | null>): void {
  if (SKIP.has(path)) return;
  if (typeof value === 'number') out.set(path, value);
  else if (value === null) out.set(path, null);
  else if (Array.isArray(value)) value.forEach((v, i) => flatten(v, `${path}[${i}]`, out));
  else if (typeof value === 'object') for (const [k, v] of Object.entries(value as Record<string, unknown>)) flatten(v, path ? `${path}.${k}` : k, out);
}

/** The headline outputs first, in this order; everything else after, in result order. */
const FIRST = ['rollGradientDegPerG', 'rollStiffnessNmPerDeg.', 'suspensionRollDegPerG.', 'lateralLoadTransfer.', 'understeerBudget.', 'characteristicSpeedKph', 'criticalSpeedKph', 'stepSteer.'];
const rank = (path: string) => {
  const i = FIRST.findIndex((p) => path === p || (p.endsWith('.') && path.startsWith(p)));
  return i === -1 ? FIRST.length : i;
};

export function compareBalance(baseline: BalanceResult, variant: BalanceResult): BalanceComparison {
  const a = new Map<string, number | null>();
  const b = new Map<string, number | null>();
  flatten(baseline, '', a);
  flatten(variant, '', b);
  const all = [...a.keys(), ...[...b.keys()].filter((k) => !a.has(k))];
  const paths = all.map((p, i) => ({ p, i, r: rank(p) })).sort((x, y) => x.r - y.r || x.i - y.i).map((x) => x.p);
  const rows = paths.map((path): ComparisonRow => {
    const x = a.get(path) ?? null;
    const y = b.get(path) ?? null;
    const change = x !== null && y !== null ? y - x : null;
    return { path, baseline: x, variant: y, change, changePct: change !== null && x !== 0 && x !== null ? (change / Math.abs(x)) * 100 : null };
  });
  const series = (r: BalanceResult) => r.stepSteer.history.map((h) => ({ tS: h.tS, yawRateDegPerS: h.yawRateDegPerS }));
  return { baselineName: baseline.vehicleName, variantName: variant.vehicleName, rows, yawRateHistory: { baseline: series(baseline), variant: series(variant) } };
}
