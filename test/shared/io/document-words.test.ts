/**
 * Document paths in words carry their unit, also for keys whose unit is not in
 * their name (the tyre's Cα = a·Fz − b·Fz²), so the review record and the
 * "use the latest revisions" preview write them in the reader's units.
 * Factor: NIST SP 811 (2008), Appendix B, 1 lbf = 4.4482216152605 N.
 */
import { describe, expect, it } from 'vitest';
import { inputWords } from '../../../shared/io/result-words.js';
import { formatNum } from '../../../shared/units/format.js';
import { unitLabel } from '../../../shared/units/quantities.js';

describe('inputWords', () => {
  it('gives the tyre load sensitivity b its quantity, shown per pound-force to an inch/pound reader', () => {
    const b = inputWords('vehicle.rear.tyre.loadSensitivity.b');
    expect(b.label).toBe('Vehicle · rear · tyre · load sensitivity · b');
    expect(b.kind).toBe('loadSensitivityB');
    if (!b.kind) throw new Error('no kind');
    expect(unitLabel(b.kind, 'imperial')).toBe('1/(deg·lbf)');
    expect(unitLabel(b.kind, 'si')).toBe('1/(deg·N)');
    // 0.00022 per N × 4.4482216152605 N/lbf = 0.000978609 per lbf.
    expect(formatNum(0.00022, { kind: b.kind, sig: 6 }, 'imperial')).toBe('0.000978609');
    // a (1/deg) is the same number in both systems: its unit, no conversion.
    const a = inputWords('vehicle.rear.tyre.loadSensitivity.a');
    expect(a.kind).toBeUndefined();
    expect(a.unit).toBe('1/deg');
  });

  it('gives the wheel radius and the rack stroke their length, so they follow the reader\'s units', () => {
    expect(inputWords('frontCorner.wheel.radius')).toMatchObject({ label: 'Front corner · wheel · radius', kind: 'length' });
    expect(inputWords('frontCorner.steering.rackStroke[1]')).toMatchObject({ label: 'Front corner · steering · rack stroke · #2', kind: 'length' });
    expect(inputWords('frontCorner.steering.angularStrokeDeg[0]').kind).toBe('angle');
    // A direction has no unit.
    expect(inputWords('frontCorner.steering.rackAxis[1]').kind).toBeUndefined();
  });
});
