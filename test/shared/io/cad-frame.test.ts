import { describe, expect, it } from 'vitest';
import { frameProblems, IDENTITY_FRAME, isRightHanded, mapCadPoint } from '../../../shared/io/cad-frame.js';

describe('CAD frame mapping', () => {
  it('leaves Rollwise points unchanged with the identity frame', () => {
    expect(mapCadPoint([-55, 210, 160], IDENTITY_FRAME)).toEqual([-55, 210, 160]);
  });

  it('maps a z-down, y-right frame in metres with an origin offset', () => {
    // CAD point 0.1 m ahead, 0.6 m to the right, 0.25 m below its origin; the
    // CAD origin sits 300 mm above Rollwise's ground origin.
    const p = mapCadPoint([0.1, 0.6, 0.25], { axes: ['+x', '-y', '-z'], unit: 'm', originMm: [0, 0, 300], side: 'left' });
    expect(p).toEqual([100, -600, 50]);
  });

  it('mirrors right-corner points to the left corner', () => {
    const p = mapCadPoint([0, -600, 255], { ...IDENTITY_FRAME, side: 'right' });
    expect(p).toEqual([0, 600, 255]);
  });

  it('converts inches at 25.4 mm each (exact by definition)', () => {
    expect(mapCadPoint([1, 10, 0], { ...IDENTITY_FRAME, unit: 'in' })).toEqual([25.4, 254, 0]);
  });

  it('refuses two CAD axes along the same Rollwise axis and flags a left-handed choice', () => {
    expect(frameProblems({ ...IDENTITY_FRAME, axes: ['+x', '-x', '+z'] })).toHaveLength(1);
    expect(frameProblems(IDENTITY_FRAME)).toEqual([]);
    expect(isRightHanded({ ...IDENTITY_FRAME, axes: ['-x', '-y', '+z'] })).toBe(true);
    expect(isRightHanded({ ...IDENTITY_FRAME, axes: ['+x', '-y', '+z'] })).toBe(false);
  });
});
