import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import type { Corner } from '../../../../shared/schema/corner';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { CornerSettings, type SettingEdit } from './corner-settings';
import { renderComponent } from '../../../testing/render';
import { changedSettings, settingRow, withSetting, withSettingsFrom } from './corner-settings-model';

function setUp(editable: boolean, corner: Corner = exampleCorners.fsFrontWishbone) {
  const fixture = renderComponent(CornerSettings, { corner, editable });
  const edits: SettingEdit[] = [];
  fixture.componentInstance.settingEdited.subscribe((e) => edits.push(e));
  const el = fixture.nativeElement as HTMLElement;
  const input = (id: string) => el.querySelector<HTMLInputElement>(`mat-form-field[data-setting="${id}"] input`)!;
  const error = (id: string) => el.querySelector(`mat-form-field[data-setting="${id}"] mat-error`)?.textContent?.trim();
  const type = (id: string, text: string) => {
    input(id).value = text;
    input(id).dispatchEvent(new Event('change'));
    fixture.detectChanges();
  };
  return { fixture, el, edits, input, error, type };
}

describe('CornerSettings', () => {
  it('offers the wheel radius, the rack stroke and axis, the rocker axis and the bar axis of the corner, each editable', () => {
    const { el, input, edits, type } = setUp(true);
    const c = exampleCorners.fsFrontWishbone;
    if (c.steering?.kind !== 'rack' || c.spring?.kind !== 'rocker' || !c.antiRollBar) throw new Error('example changed');
    expect([...el.querySelectorAll('legend')].map((l) => l.textContent.trim())).toEqual(['Wheel', 'Steering rack', 'Rocker', 'Anti-roll bar']);
    expect(Number(input('wheel.radius').value)).toBe(c.wheel.radius);
    expect(Number(input('steering.rackStroke[0]').value)).toBe(c.steering.rackStroke[0]);
    expect(Number(input('steering.rackStroke[1]').value)).toBe(c.steering.rackStroke[1]);
    expect(Number(input('spring.rockerAxis[0]').value)).toBe(c.spring.rockerAxis[0]);
    expect(Number(input('antiRollBar.barAxisDirection[1]').value)).toBe(c.antiRollBar.barAxisDirection[1]);
    type('wheel.radius', '262,5');
    type('steering.rackStroke[1]', '35');
    type('spring.rockerAxis[2]', '0.2');
    expect(edits).toEqual([
      { path: 'wheel.radius', index: null, value: 262.5 },
      { path: 'steering.rackStroke', index: 1, value: 35 },
      { path: 'spring.rockerAxis', index: 2, value: 0.2 },
    ]);
  });

  it('an unsteered corner has no steering settings', () => {
    const { el } = setUp(true, exampleCorners.fsRearWishbone);
    expect([...el.querySelectorAll('legend')].map((l) => l.textContent.trim())).not.toContain('Steering rack');
    expect(el.querySelector('mat-form-field[data-setting="wheel.radius"]')).not.toBeNull();
  });

  it('refuses beside the field, in words, what the corner cannot take, and sends nothing', () => {
    const { edits, error, input, type } = setUp(true);
    type('wheel.radius', 'big');
    expect(error('wheel.radius')).toBe('Loaded radius: "big" is not a number of mm.');
    expect(input('wheel.radius').getAttribute('aria-invalid')).toBe('true');
    // Possible range: shared/schema/ranges.ts (a wheel radius above 0 and at most 2000 mm).
    type('wheel.radius', '0');
    expect(error('wheel.radius')).toBe('Loaded radius: 0 is outside the possible range, more than 0 and at most 2000 mm.');
    // A rack stroke must include straight ahead (domain: a rack has a stroke [min, max] through 0).
    type('steering.rackStroke[0]', '5');
    expect(error('steering.rackStroke[0]')).toContain('through straight ahead');
    // An axis of no direction.
    type('antiRollBar.barAxisDirection[1]', '0');
    expect(error('antiRollBar.barAxisDirection[1]')).toBe('Bar axis y: an axis needs a direction: x, y and z cannot all be 0.');
    expect(edits).toEqual([]);
    // Corrected, the message goes and the value is sent.
    type('wheel.radius', '250');
    expect(error('wheel.radius')).toBeUndefined();
    expect(edits).toEqual([{ path: 'wheel.radius', index: null, value: 250 }]);
  });

  it('shows and takes lengths in inches for an inch-pound user, storing mm (1 in = 25.4 mm exactly, NIST SP 811)', () => {
    TestBed.overrideProvider(DISPLAY_UNITS, { useValue: signal<DisplayUnits>('imperial') });
    const { el, edits, input, error, type } = setUp(true);
    const field = el.querySelector('mat-form-field[data-setting="wheel.radius"]')!;
    expect(field.textContent).toContain('in');
    expect(Number(input('wheel.radius').value)).toBeCloseTo(exampleCorners.fsFrontWishbone.wheel.radius / 25.4, 6);
    type('wheel.radius', '10');
    expect(edits[0]!.value).toBeCloseTo(254, 9);
    // The possible range is said in inches too: at most 2000 mm = 78.74 in.
    type('steering.rackStroke[1]', '30');
    expect(error('steering.rackStroke[1]')).toBe('Stroke toward the left (+y): 30 is outside −19.69 to 19.69 in.');
    // Axes have no unit: the same numbers in either system.
    expect(Number(input('spring.rockerAxis[0]').value)).toBe(1);
  });

  it('notes a possible but unusual wheel radius in the user\'s units, without refusing it', () => {
    TestBed.overrideProvider(DISPLAY_UNITS, { useValue: signal<DisplayUnits>('imperial') });
    // 600 mm against the typical 200 to 450 mm (shared/schema/ranges.ts; common practice, from memory); 1 in = 25.4 mm.
    const { el } = setUp(true, withSetting(exampleCorners.fsFrontWishbone, 'wheel.radius', null, 600));
    expect(el.querySelector('[data-group="wheel"] .rw-unusual')!.textContent.trim()).toBe('Unusual: 23.62 in is unusual for a wheel radius (typical 7.874 to 17.72 in)');
  });

  it('offers to restore the saved values once a setting differs from them', () => {
    const saved = exampleCorners.fsFrontWishbone;
    const { fixture, el } = setUp(true, saved);
    fixture.componentRef.setInput('saved', saved);
    fixture.detectChanges();
    const button = () => [...el.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent.trim() === 'Restore the saved values')!;
    expect(button().disabled).toBe(true);
    let restored = 0;
    fixture.componentInstance.restored.subscribe(() => restored++);
    fixture.componentRef.setInput('corner', withSetting(saved, 'wheel.radius', null, 262));
    fixture.detectChanges();
    expect(button().disabled).toBe(false);
    button().click();
    expect(restored).toBe(1);
  });

  it('gives a read-only user the values as text', () => {
    const { el } = setUp(false);
    expect(el.querySelector('input')).toBeNull();
    expect(el.querySelector('button')).toBeNull();
    expect(el.querySelector('[data-setting="wheel.radius"]')!.textContent).toContain('Loaded radius: 255 mm');
  });

  it('knows which settings differ between two corners, and changes a copy only', () => {
    const c = exampleCorners.fsFrontWishbone;
    const moved = withSetting(withSetting(c, 'wheel.radius', null, 260), 'steering.rackAxis', 0, 0.1);
    expect(changedSettings(moved, c)).toEqual(['wheel.radius', 'steering.rackAxis']);
    expect(c.wheel.radius).toBe(255);
    expect(changedSettings(c, structuredClone(c))).toEqual([]);
  });

  it('counts the choices and the rates among the settings, and restores them from the saved revision (a rate it lacks is rigid again)', () => {
    const c = exampleCorners.fsFrontWishbone;
    const stroked = withSetting(c, 'steering.rackStroke', 1, 35);
    const edited = withSetting(
      withSetting(withSetting(stroked, 'steered', null, false), 'bushings.lowerFront', null, { radialNPerMm: 2000, axialNPerMm: 500 }),
      'antiRollBar.dropLinkOuterOn',
      null,
      'upright',
    );
    // The stroke changed before the corner stopped being steered still differs from the saved one.
    expect(changedSettings(edited, c).sort()).toEqual(['antiRollBar.dropLinkOuterOn', 'bushings.lowerFront', 'steered', 'steering.rackStroke']);
    expect(withSettingsFrom(edited, c)).toEqual(c);
    expect(settingRow(edited, 'bushings.lowerFront')).toEqual({ name: 'Bushings, Lower arm, front pivot (radial, axial)', kind: 'rate', value: [2000, 500] });
    expect(settingRow(c, 'bushings.lowerFront').value).toBeUndefined();
    expect(settingRow(edited, 'steered').value).toBe('fixed toe link');
    // A steering setting keeps its name in a version that is not steered (the other side of a save conflict).
    expect(settingRow(edited, 'steering.rackStroke')).toEqual({ name: 'Steering rack, stroke (right, left)', kind: 'length', value: [-30, 35] });
    expect(settingRow(exampleCorners.fsRearWishbone, 'steeringStiffnessNPerMm')).toEqual({ name: 'Steering, Steering at the rack, along its travel', kind: 'rate', value: undefined });
    expect(settingRow(edited, 'antiRollBar.dropLinkOuterOn')).toEqual({ name: 'Anti-roll bar drop link, suspension end rides on', kind: 'choice', value: 'upright' });
    // The last rate of a container gone, the container goes too: the document is as it was.
    expect(withSetting(withSetting(c, 'linkAxialNPerMm.tieRod', null, 9000), 'linkAxialNPerMm.tieRod', null, undefined)).toEqual(c);
    expect(c.bushings).toBeUndefined();
  });

  it('counts a steering of the other kind, or a new one, as a change, and restores the saved steering whole', () => {
    const front = exampleCorners.fsFrontWishbone;
    const arm = { kind: 'arm', armAxisPoint: [-40, 150, 140], armAxisDirection: [0, 0, 1], angularStrokeDeg: [-30, 30] } as const;
    const switched = withSetting(front, 'steering', null, { ...arm, armAxisPoint: [...arm.armAxisPoint], armAxisDirection: [...arm.armAxisDirection], angularStrokeDeg: [...arm.angularStrokeDeg] });
    expect(changedSettings(switched, front)).toContain('steering.kind');
    expect(settingRow(switched, 'steering.kind')).toEqual({ name: 'Steering, kind', kind: 'choice', value: 'steering-box arm' });
    expect(settingRow(front, 'steering.kind').value).toBe('steering rack');
    // The rack comes back whole, not the arm with a rack's stroke put into it.
    expect(withSettingsFrom(switched, front)).toEqual(front);
    // A rear corner given a rack (steered with it in one change) goes back to having none.
    const rear = exampleCorners.fsRearWishbone;
    const steered = withSetting(rear, 'steering', null, { kind: 'rack', rackAxis: [0, 1, 0], rackStroke: [-20, 20] });
    expect(steered.steered).toBe(true);
    expect(changedSettings(steered, rear).sort()).toEqual(['steered', 'steering.kind', 'steering.rackAxis', 'steering.rackStroke']);
    expect(withSettingsFrom(steered, rear)).toEqual(rear);
  });
});
