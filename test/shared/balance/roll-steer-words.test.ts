import { describe, expect, it } from 'vitest';
import { rollSteerWords } from '../../../shared/balance/roll-steer-words.js';

// Sign convention of shared/docs/domain.md: ε = −dδ̄/dφ; positive ε at the
// front is roll understeer, at the rear roll oversteer; "rear roll
// understeer of 0.06" means ε_r = −0.06 (Gillespie's sign of roll steer, from memory).
describe('rollSteerWords', () => {
  it('follows the domain sign convention on both axles', () => {
    expect(rollSteerWords(0.05, 'front')).toBe('roll understeer');
    expect(rollSteerWords(-0.05, 'front')).toBe('roll oversteer');
    expect(rollSteerWords(0.05, 'rear')).toBe('roll oversteer');
    expect(rollSteerWords(-0.06, 'rear')).toBe('roll understeer');
  });

  it('calls a negligible coefficient what it is', () => {
    expect(rollSteerWords(0.0001, 'rear')).toBe('practically no roll steer');
  });
});
