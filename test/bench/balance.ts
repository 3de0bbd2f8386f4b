/**
 * Balance benchmark (issue 4): one full evaluation = understeer budget,
 * sensitivity ranking (±10 % of every input), gains at 20 speeds, the
 * load-sensitive steer curve at 20 lateral accelerations and a 3 s step
 * response (2-DOF, plus 3-DOF where the vehicle has roll inertia and
 * damping). Target: median ≤ 10 ms.
 */
import { exampleVehicles } from '../../shared/balance/examples.js';
import { DEFAULT_SPEEDS_KPH, evaluateBalance } from '../../shared/balance/index.js';
import { performance } from 'node:perf_hooks';
import { median, round, timeRuns } from './stats.js';

export async function run(): Promise<Record<string, number>> {
  const options = { speedsKph: DEFAULT_SPEEDS_KPH, steerCurvePoints: 20, stepDurationS: 3, sensitivity: true };
  // The first call includes module JIT warm-up: reported separately, then the
  // steady state a long-lived worker sees (30 untimed warm-up runs).
  const t0 = performance.now();
  evaluateBalance(exampleVehicles.tur26Ember, options);
  const firstRunMs = performance.now() - t0;
  const full = timeRuns(() => evaluateBalance(exampleVehicles.brackenfieldB3, options), 60, 30);
  const noRoll = { ...exampleVehicles.brackenfieldB3 };
  delete noRoll.rollInertiaKgM2;
  const twoDofOnly = timeRuns(() => evaluateBalance(noRoll, options), 60, 30);
  console.log('  target balance.full.medianMs ≤ 10');
  return {
    'balance.full.medianMs': round(median(full)),
    'balance.full.firstRunMs': round(firstRunMs),
    'balance.full.p90Ms': round([...full].sort((a, b) => a - b)[Math.floor(full.length * 0.9)]!),
    'balance.full2dof.medianMs': round(median(twoDofOnly)),
  };
}
