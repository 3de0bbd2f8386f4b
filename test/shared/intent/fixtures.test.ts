/**
 * The example intents in test/fixtures/intents stay valid and solvable as the
 * schemas evolve; each meets its own target when feasible (issue 5: verified
 * within 0.002 deg/deg), and the infeasible example stays infeasible.
 */
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { computeSolve } from '../../../shared/intent/api.js';
import { rollSteerCoefficient } from '../../../shared/kinematics/index.js';

const dir = join(import.meta.dirname, '..', '..', 'fixtures', 'intents');
const files = readdirSync(dir).filter((f) => f.endsWith('.json'));

describe('example intents', () => {
  it('there are examples of every target kind', () => {
    const kinds = new Set(files.map((f) => Object.keys(JSON.parse(readFileSync(join(dir, f), 'utf8')).target)[0]));
    expect([...kinds].sort()).toEqual(['rollSteerCoefficient', 'understeerChangeDegPerG', 'zeroBumpSteer']);
  });
  for (const f of files) {
    it(`${f} solves`, () => {
      const input = JSON.parse(readFileSync(join(dir, f), 'utf8'));
      const r = computeSolve(input);
      expect(r.feasible).toBe(!f.includes('infeasible'));
      if (r.feasible) {
        expect(Math.abs(rollSteerCoefficient(r.corner) - r.target.rollSteerCoefficient)).toBeLessThan(0.002);
      } else {
        expect(r.limitingBound).not.toBeNull();
      }
    });
  }
});
