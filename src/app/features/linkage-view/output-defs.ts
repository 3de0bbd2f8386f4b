import type { OutputCurveAxis, OutputCurveRow } from '../../../../shared/kinematics/output-curves';
import type { AxisSpec } from '../../charts/chart-types';
import type { AxleName } from '../../../../shared/schema/axle';

/** A per-pose output the curves panel can draw. */
export interface OutputDef {
  readonly key: keyof OutputCurveRow & string;
  readonly title: string;
  readonly y: AxisSpec;
  readonly group: 'Wheel angles' | 'Steering axis' | 'Wheel path' | 'Roll centre' | 'Ratios' | 'Anti features' | 'Steering';
  /** Only meaningful along this axis (Ackermann: rack travel). */
  readonly onlyAxis?: OutputCurveAxis;
}

/** Every output, in the order the picker lists them. Words and sign notes are ours; units those of the engine (mm, deg). */
export function outputDefs(axle: AxleName): readonly OutputDef[] {
  return [
    { key: 'toeDeg', title: 'Toe', y: { label: 'Toe, + in', unit: 'deg' }, group: 'Wheel angles' },
    { key: 'camberDeg', title: 'Camber', y: { label: 'Camber to the body, + top outboard', unit: 'deg' }, group: 'Wheel angles' },
    { key: 'steerDeg', title: 'Steer angle', y: { label: 'Steer angle, + left', unit: 'deg' }, group: 'Wheel angles' },
    { key: 'casterDeg', title: 'Caster', y: { label: 'Caster, + top rearward', unit: 'deg' }, group: 'Steering axis' },
    { key: 'kingpinInclinationDeg', title: 'Kingpin inclination', y: { label: 'Kingpin inclination, + top inboard', unit: 'deg' }, group: 'Steering axis' },
    { key: 'scrubRadiusMm', title: 'Scrub radius', y: { label: 'Scrub radius, + axis meets ground inboard', unit: 'mm' }, group: 'Steering axis' },
    { key: 'mechanicalTrailMm', title: 'Mechanical trail', y: { label: 'Mechanical trail, + axis meets ground ahead', unit: 'mm' }, group: 'Steering axis' },
    { key: 'halfTrackChangeMm', title: 'Half-track change', y: { label: 'Contact patch lateral move, + outboard', unit: 'mm' }, group: 'Wheel path' },
    { key: 'wheelbaseChangeMm', title: 'Wheelbase change', y: { label: 'Wheel centre fore-aft move, + forward', unit: 'mm' }, group: 'Wheel path' },
    { key: 'rollCentreHeightMm', title: 'Roll centre height', y: { label: 'Roll centre above the ground', unit: 'mm' }, group: 'Roll centre' },
    { key: 'rollCentreYMm', title: 'Roll centre lateral migration', y: { label: 'Roll centre from the centreline, + left', unit: 'mm' }, group: 'Roll centre' },
    { key: 'springMotionRatio', title: 'Spring motion ratio', y: { label: 'Spring compression per wheel bump', unit: 'mm/mm' }, group: 'Ratios' },
    { key: 'barMotionRatio', title: 'Anti-roll bar motion ratio', y: { label: 'Bar lever travel per wheel travel', unit: 'mm/mm' }, group: 'Ratios' },
    axle === 'front'
      ? { key: 'antiBrakePercent', title: 'Anti-dive', y: { label: 'Anti-dive in braking', unit: '%' }, group: 'Anti features' }
      : { key: 'antiBrakePercent', title: 'Anti-lift in braking', y: { label: 'Anti-lift in braking', unit: '%' }, group: 'Anti features' },
    axle === 'front'
      ? { key: 'antiDrivePercent', title: 'Anti-lift in drive', y: { label: 'Anti-lift under drive', unit: '%' }, group: 'Anti features' }
      : { key: 'antiDrivePercent', title: 'Anti-squat', y: { label: 'Anti-squat under drive', unit: '%' }, group: 'Anti features' },
    { key: 'ackermannPercent', title: 'Ackermann', y: { label: 'Ackermann, 100 = ideal, 0 = parallel', unit: '%' }, group: 'Steering', onlyAxis: 'steer' },
  ];
}

/** The sweep axes as the x axis of every chart. */
export const SWEEP_AXES: Readonly<Record<OutputCurveAxis, { readonly name: string; readonly x: AxisSpec }>> = {
  travel: { name: 'Wheel travel', x: { label: 'Wheel travel, both wheels, + bump', unit: 'mm' } },
  steer: { name: 'Rack travel', x: { label: 'Rack travel, + toward the left', unit: 'mm' } },
  roll: { name: 'Body roll', x: { label: 'Body roll, + right side down', unit: 'deg' } },
};

export const DEFAULT_OUTPUTS: readonly string[] = ['toeDeg', 'camberDeg', 'rollCentreHeightMm'];
