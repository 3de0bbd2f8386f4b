import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { DisplayUnits } from '../../core/api-types';
import { DISPLAY_UNITS } from '../../core/format/num-pipe';
import type { Corner } from '../../../../shared/schema/corner';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import { chooseOption, matSelect, optionTexts } from '../../../testing/material';
import { settle } from '../../../testing/settle';
import { AxleDesignStore } from './axle-design-store';
import { CornerMounts } from './corner-mounts';
import { withSetting } from './corner-settings-model';

/** The panel as the editor page binds it: the store's corner in, each change into the store's one edit path. */
@Component({
  selector: 'rw-corner-mounts-host',
  imports: [CornerMounts],
  template: `@if (store.corner(); as c) {
    <rw-corner-mounts [corner]="c" [editable]="editable()" (settingEdited)="store.editSetting($event.path, $event.index, $event.value)" />
  }`,
  providers: [AxleDesignStore],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
class Host {
  readonly store = inject(AxleDesignStore);
  readonly editable = signal(true);
}

function setUp(corner: Corner, units: DisplayUnits = 'si', editable = true) {
  TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), { provide: DISPLAY_UNITS, useValue: signal(units) }] });
  const fixture = TestBed.createComponent(Host);
  const store = fixture.componentInstance.store;
  // The store as after loading a design (its history starts at the loaded corner).
  store.history.reset(corner);
  fixture.componentInstance.editable.set(editable);
  fixture.detectChanges();
  const el = fixture.nativeElement as HTMLElement;
  const tick = () => {
    TestBed.tick();
    fixture.detectChanges();
  };
  const at = (selector: string) => {
    const found = el.querySelector<HTMLElement>(selector);
    if (!found) throw new Error(`nothing at ${selector}`);
    return found;
  };
  const options = (setting: string) => optionTexts(matSelect(el, `[data-setting="${setting}"] mat-select`));
  const choose = (setting: string, label: string) => {
    chooseOption(matSelect(el, `[data-setting="${setting}"] mat-select`), label);
    tick();
  };
  const box = (selector: string) => at(`${selector} input[type="checkbox"]`) as HTMLInputElement;
  const toggle = (selector: string) => {
    box(selector).click();
    tick();
  };
  const rateInput = (id: string) => at(`mat-form-field[data-rate="${id}"] input`) as HTMLInputElement;
  const commitText = (input: HTMLInputElement, text: string) => {
    input.value = text;
    input.dispatchEvent(new Event('change'));
    tick();
  };
  const type = (id: string, text: string) => commitText(rateInput(id), text);
  const error = (key: string) =>
    el.querySelector(`[data-error="${key}"]`)?.textContent.trim() ??
    el.querySelector(`mat-form-field[data-rate="${key}"] mat-error, mat-form-field[data-draft="${key}"] mat-error`)?.textContent.trim();
  const undo = () => {
    store.undo();
    tick();
  };
  const draftInput = (id: string) => at(`mat-form-field[data-draft="${id}"] input`) as HTMLInputElement;
  const draft = (id: string, text: string) => commitText(draftInput(id), text);
  const click = (action: string) => {
    at(`button[data-action="${action}"]`).click();
    tick();
  };
  const apply = () => click('apply-steering');
  const cancel = () => click('cancel-steering');
  return { fixture, el, store, at, options, box, choose, toggle, type, rateInput, error, undo, tick, draft, draftInput, apply, cancel };
}

describe('CornerMounts', () => {
  it('offers every attachment a double wishbone allows; a choice goes into the store as one undo step', () => {
    const { store, options, choose, undo } = setUp(exampleCorners.fsFrontWishbone);
    expect(options('spring.rodOuterOn')).toEqual(['Upright', 'Lower arm', 'Upper arm']);
    expect(options('antiRollBar.dropLinkOuterOn')).toEqual(['Upright', 'Lower arm', 'Upper arm']);
    choose('spring.rodOuterOn', 'Upper arm');
    const c = store.corner()!;
    expect(c.spring?.kind === 'rocker' && c.spring.rodOuterOn).toBe('upperArm');
    choose('antiRollBar.dropLinkOuterOn', 'Upright');
    expect(store.corner()!.antiRollBar?.dropLinkOuterOn).toBe('upright');
    undo();
    expect(store.corner()!.antiRollBar?.dropLinkOuterOn).toBe('lowerArm');
    undo();
    expect(store.corner()).toEqual(exampleCorners.fsFrontWishbone);
  });

  it('offers a strut no upper arm and a five-link corner only the upright (the corner rules: neither has an upper arm, a five-link no arm)', () => {
    const strut = setUp(exampleCorners.roadFrontStrut);
    expect(strut.options('spring.springOuterOn')).toEqual(['Upright', 'Lower arm']);
    strut.choose('spring.springOuterOn', 'Lower arm');
    const c = strut.store.corner()!;
    expect(c.spring?.kind === 'direct' && c.spring.springOuterOn).toBe('lowerArm');
    TestBed.resetTestingModule();
    const fiveLink = setUp(exampleCorners.roadRearFiveLink);
    expect(fiveLink.options('spring.springOuterOn')).toEqual(['Upright']);
  });

  it('picks the toe link of a five-link corner, and undoes it', () => {
    const { store, options, choose, undo, el } = setUp(exampleCorners.roadRearFiveLink);
    expect(options('toeLink')).toEqual(['Link 1', 'Link 2', 'Link 3', 'Link 4', 'Link 5']);
    expect(el.querySelector('[data-group="steering"]')!.textContent).toContain('Link 5 is a fixed toe link');
    choose('toeLink', 'Link 3');
    const c = store.corner()!;
    expect(c.type === 'five-link' && c.toeLink).toBe(3);
    expect(el.querySelector('[data-group="steering"]')!.textContent).toContain('Link 3 is a fixed toe link');
    undo();
    const back = store.corner()!;
    expect(back.type === 'five-link' && back.toeLink).toBe(5);
  });

  it('refuses a toe link the steering arm cannot move, in the corner rules\' words, and keeps the one chosen', () => {
    // A steered five-link corner on a steering-box arm whose axis runs through link 3's body end (invented for the rule).
    const five = exampleCorners.roadRearFiveLink;
    const onArm: Corner = { ...five, steered: true, steering: { kind: 'arm', armAxisPoint: five.points.link3Inner, armAxisDirection: [0, 0, 1], angularStrokeDeg: [-30, 30] } };
    const { store, choose, error, el, at } = setUp(onArm);
    choose('toeLink', 'Link 3');
    expect(store.canUndo()).toBe(false);
    expect(error('toeLink')).toBe('Toe link: Link 3, body end lies on the steering arm\'s pivot axis: the arm has no length.');
    expect(el.querySelector('[data-setting="toeLink"] mat-select')!.textContent.trim()).toBe('Link 5');
    // The refused choice is shown as Material shows a field in error: outlined, described by its message.
    const toeField = at('mat-form-field[data-setting="toeLink"]');
    expect(toeField.classList).toContain('mat-form-field-invalid');
    expect(at('[data-setting="toeLink"] mat-select').getAttribute('aria-invalid')).toBe('true');
    expect(at('[data-setting="toeLink"] mat-select').getAttribute('aria-describedby')).toContain(toeField.querySelector('mat-error')!.id);
    choose('toeLink', 'Link 4');
    const c = store.corner()!;
    expect(c.type === 'five-link' && c.toeLink).toBe(4);
    expect(error('toeLink')).toBeUndefined();
    expect(at('mat-form-field[data-setting="toeLink"]').classList).not.toContain('mat-form-field-invalid');
  });

  it('turns steering off and on through the store; the rack stays defined while the corner is not steered', () => {
    const front = setUp(exampleCorners.fsFrontWishbone);
    front.toggle('[data-setting="steered"]');
    expect(front.store.corner()!.steered).toBe(false);
    // The rack stays defined, so steering on again is the same corner.
    front.toggle('[data-setting="steered"]');
    expect(front.store.corner()).toEqual(exampleCorners.fsFrontWishbone);
    front.undo();
    expect(front.store.corner()!.steered).toBe(false);
  });

  it('steers a corner without steering only once a rack and its stroke are given, as one undo step (mm)', () => {
    const rear = exampleCorners.fsRearWishbone;
    const { store, el, toggle, choose, options, draft, draftInput, apply, error, undo, box } = setUp(rear);
    toggle('[data-setting="steered"]');
    // Nothing made up: the corner is unchanged, and the panel asks which steering.
    expect(store.corner()).toEqual(rear);
    expect(box('[data-setting="steered"]').checked).toBe(true);
    expect(options('steering.kind')).toEqual(['Steering rack', 'Steering-box arm']);
    expect(el.querySelector('[data-group="steering-draft"]')!.textContent).toContain('Choose a steering rack or a steering-box arm');
    choose('steering.kind', 'Steering rack');
    // The rack's direction is the format's default, shown and editable; the stroke is asked for.
    expect(['steering.rackAxis[0]', 'steering.rackAxis[1]', 'steering.rackAxis[2]'].map((id) => draftInput(id).value)).toEqual(['0', '1', '0']);
    expect(draftInput('steering.rackStroke[0]').value).toBe('');
    apply();
    expect(error('steering.rackStroke[0]')).toBe('Stroke toward the right (−y): enter a value in mm.');
    expect(error('steering.rackStroke[1]')).toBe('Stroke toward the left (+y): enter a value in mm.');
    draft('steering.rackStroke[0]', 'forty');
    expect(error('steering.rackStroke[0]')).toBe('Stroke toward the right (−y): "forty" is not a number of mm.');
    draft('steering.rackStroke[0]', '10');
    draft('steering.rackStroke[1]', '45');
    apply();
    // A stroke that misses straight ahead is refused beside the stroke, and nothing is sent.
    expect(error('steering.rackStroke')).toBe('Stroke: the stroke must run from one end to the other through straight ahead: the first end at or below 0, the second at or above 0.');
    expect(store.canUndo()).toBe(false);
    draft('steering.rackStroke[0]', '-40');
    apply();
    expect(store.corner()).toEqual({ ...rear, steered: true, steering: { kind: 'rack', rackAxis: [0, 1, 0], rackStroke: [-40, 45] } });
    expect(el.querySelector('[data-group="steering-draft"]')).toBeNull();
    expect(el.querySelector('[data-setting="steering.kind"] mat-select')!.textContent.trim()).toBe('Steering rack');
    undo();
    expect(store.corner()).toEqual(rear);
    expect(store.canUndo()).toBe(false);
  });

  it('takes a new rack\'s stroke in inches for an inch-pound user, storing mm (1 in = 25.4 mm exactly; NIST SP 811)', () => {
    const rear = exampleCorners.fsRearWishbone;
    const { store, toggle, choose, draft, apply, error, undo } = setUp(rear, 'imperial');
    toggle('[data-setting="steered"]');
    choose('steering.kind', 'Steering rack');
    draft('steering.rackStroke[0]', '-1.5');
    // The possible range, shared/schema/ranges.ts: −500 to 500 mm, written in inches.
    draft('steering.rackStroke[1]', '25');
    expect(error('steering.rackStroke[1]')).toBe('Stroke toward the left (+y): 25 is outside −19.69 to 19.69 in.');
    draft('steering.rackStroke[1]', '1.75');
    apply();
    const st = store.corner()!.steering;
    expect(st?.kind === 'rack' && st.rackStroke[0]).toBeCloseTo(-38.1, 9);
    expect(st?.kind === 'rack' && st.rackStroke[1]).toBeCloseTo(44.45, 9);
    expect(store.corner()!.steered).toBe(true);
    undo();
    expect(store.corner()).toEqual(rear);
  });

  it('steers with a steering-box arm whose pivot point and axis the user types; an arm that cannot move the tie rod is refused in words', () => {
    const rear = exampleCorners.fsRearWishbone;
    const { store, toggle, choose, draft, apply, error, undo, el } = setUp(rear);
    toggle('[data-setting="steered"]');
    choose('steering.kind', 'Steering-box arm');
    // No pivot point or axis is offered: the user gives them.
    expect([...el.querySelectorAll('[data-draft] input')].map((i) => (i as HTMLInputElement).value)).toEqual(Array(8).fill(''));
    draft('steering.angularStrokeDeg[0]', '-30');
    draft('steering.angularStrokeDeg[1]', '30');
    // The pivot axis through the tie rod's inner end (invented for the rule): the arm has no length.
    rear.points.tieRodInner.forEach((v, i) => draft(`steering.armAxisPoint[${i}]`, String(v)));
    ['0', '0', '0'].forEach((v, i) => draft(`steering.armAxisDirection[${i}]`, v));
    apply();
    expect(error('steering.armAxisDirection')).toBe('Arm axis: an axis needs a direction: x, y and z cannot all be 0.');
    draft('steering.armAxisDirection[2]', '1');
    apply();
    expect(error('steering.armAxisPoint')).toMatch(/^Arm pivot point: Tie rod, inner end \(steering-box arm\) lies on the steering arm's pivot axis: the arm has no length\.$/);
    expect(store.canUndo()).toBe(false);
    draft('steering.armAxisPoint[1]', '150');
    apply();
    expect(store.corner()).toEqual({
      ...rear,
      steered: true,
      steering: { kind: 'arm', armAxisPoint: [-1640, 150, 161.5], armAxisDirection: [0, 0, 1], angularStrokeDeg: [-30, 30] },
    });
    undo();
    expect(store.corner()).toEqual(rear);
  });

  it('switches a rack to an arm only once the arm\'s values are given (inches), keeps the rack on cancel, and undoes the switch', async () => {
    const front = exampleCorners.fsFrontWishbone;
    const { store, choose, draft, draftInput, apply, cancel, undo, el } = setUp(front, 'imperial');
    // The select shows its value once its options are there.
    await settle();
    expect(el.querySelector('[data-setting="steering.kind"] mat-select')!.textContent.trim()).toBe('Steering rack');
    choose('steering.kind', 'Steering-box arm');
    expect(draftInput('steering.armAxisPoint[0]').closest('mat-form-field')!.textContent).toContain('in');
    cancel();
    expect(el.querySelector('[data-group="steering-draft"]')).toBeNull();
    expect(el.querySelector('[data-setting="steering.kind"] mat-select')!.textContent.trim()).toBe('Steering rack');
    expect(store.canUndo()).toBe(false);
    choose('steering.kind', 'Steering-box arm');
    draft('steering.angularStrokeDeg[0]', '-35');
    draft('steering.angularStrokeDeg[1]', '35');
    ['-4', '4', '5'].forEach((v, i) => draft(`steering.armAxisPoint[${i}]`, v));
    ['0', '0', '1'].forEach((v, i) => draft(`steering.armAxisDirection[${i}]`, v));
    apply();
    const st = store.corner()!.steering;
    expect(st?.kind).toBe('arm');
    if (st?.kind !== 'arm') return;
    // 4 in = 101.6 mm, 5 in = 127 mm (exact).
    expect(st.armAxisPoint.map((v) => +v.toFixed(9))).toEqual([-101.6, 101.6, 127]);
    expect(st.angularStrokeDeg).toEqual([-35, 35]);
    undo();
    expect(store.corner()).toEqual(front);
  });

  it('unticking Steered, or Cancel, while a steering is being chosen drops it and sends nothing', () => {
    const rear = exampleCorners.fsRearWishbone;
    const { store, toggle, choose, draft, box, el, cancel } = setUp(rear);
    toggle('[data-setting="steered"]');
    cancel();
    expect(box('[data-setting="steered"]').checked).toBe(false);
    expect(el.querySelector('[data-group="steering-draft"]')).toBeNull();
    toggle('[data-setting="steered"]');
    choose('steering.kind', 'Steering rack');
    draft('steering.rackStroke[0]', '-30');
    toggle('[data-setting="steered"]');
    expect(box('[data-setting="steered"]').checked).toBe(false);
    expect(el.querySelector('[data-group="steering-draft"], [data-setting="steering.kind"]')).toBeNull();
    expect(store.corner()).toEqual(rear);
    expect(store.canUndo()).toBe(false);
  });

  it('refuses a fixed toe link while the steering has a rate, in words, and sends nothing', () => {
    const { store, toggle, error } = setUp(withSetting(exampleCorners.fsFrontWishbone, 'steeringStiffnessNPerMm', null, 900));
    toggle('[data-setting="steered"]');
    expect(store.corner()!.steered).toBe(true);
    expect(error('steered')).toBe(
      'Steered: The steering rate applies to a steered corner only (this corner has a fixed toe link: set the steering rate back to rigid first, and give the toe link its rate as a link rate or a bushing).',
    );
    expect(error('steered')).not.toMatch(/NPerMm|steered is/);
  });

  it('makes a rigid bushing compliant once both its rates are typed, as one undo step, and rigid again', () => {
    const { store, el, toggle, type, undo, rateInput } = setUp(exampleCorners.fsFrontWishbone);
    const mount = '[data-mount="bushings.lowerFront"]';
    expect(el.querySelector(mount)!.textContent).toContain('Lower arm, front pivot');
    expect(el.querySelector(`${mount} .rw-rigid`)!.textContent.trim()).toBe('Rigid');
    expect(el.querySelector(`${mount} mat-form-field`)).toBeNull();
    toggle(mount);
    expect(rateInput('bushings.lowerFront.radialNPerMm').value).toBe('');
    type('bushings.lowerFront.radialNPerMm', '2000');
    // One rate is not a bushing yet: nothing sent, and the panel says what it waits for.
    expect(store.corner()!.bushings).toBeUndefined();
    expect(el.querySelector(mount)!.textContent).toContain('Enter both rates; until then the mount stays rigid.');
    type('bushings.lowerFront.axialNPerMm', '500');
    expect(store.corner()!.bushings).toEqual({ lowerFront: { radialNPerMm: 2000, axialNPerMm: 500 } });
    expect(el.querySelector(`${mount} .rw-rigid`)).toBeNull();
    expect((el.querySelector(`${mount} input[type="checkbox"]`) as HTMLInputElement).checked).toBe(true);
    // An edit of one rate of a compliant bushing.
    type('bushings.lowerFront.axialNPerMm', '650');
    expect(store.corner()!.bushings).toEqual({ lowerFront: { radialNPerMm: 2000, axialNPerMm: 650 } });
    undo();
    expect(store.corner()!.bushings).toEqual({ lowerFront: { radialNPerMm: 2000, axialNPerMm: 500 } });
    // Back to rigid: the key leaves the corner (the document's "rigid").
    toggle(mount);
    expect(store.corner()).toEqual(exampleCorners.fsFrontWishbone);
    expect(el.querySelector(`${mount} .rw-rigid`)!.textContent.trim()).toBe('Rigid');
    undo();
    undo();
    expect(store.corner()!.bushings).toBeUndefined();
    expect(store.canUndo()).toBe(false);
  });

  it('takes and shows rates in lbf/in for an inch-pound user, storing N/mm (1 lbf = 4.4482216152605 N, 1 in = 25.4 mm; NIST SP 811)', () => {
    const start = withSetting(exampleCorners.fsFrontWishbone, 'linkAxialNPerMm.tieRod', null, 17_512.6835);
    const { store, el, toggle, type, rateInput, undo } = setUp(start, 'imperial');
    expect(el.querySelector('[data-group="compliance"]')!.textContent).toContain('Rates in lbf/in');
    // 17 512.6835 N/mm is 100 000 lbf/in to the 8 figures shown.
    expect(rateInput('linkAxialNPerMm.tieRod').value).toBe('100000');
    type('linkAxialNPerMm.tieRod', '50000');
    expect(store.corner()!.linkAxialNPerMm?.['tieRod']).toBeCloseTo((50_000 * 4.4482216152605) / 25.4, 6);
    undo();
    expect(store.corner()!.linkAxialNPerMm?.['tieRod']).toBe(17_512.6835);
    // The steering rate of a steered corner: one number.
    toggle('[data-mount="steeringStiffnessNPerMm"]');
    type('steeringStiffnessNPerMm', '1000');
    expect(store.corner()!.steeringStiffnessNPerMm).toBeCloseTo((1000 * 4.4482216152605) / 25.4, 6);
    toggle('[data-mount="steeringStiffnessNPerMm"]');
    expect(store.corner()!.steeringStiffnessNPerMm).toBeUndefined();
    expect(Object.keys(store.corner()!)).not.toContain('steeringStiffnessNPerMm');
  });

  it('refuses a rate that is not a number or not possible beside its field, in the user\'s unit, and sends nothing', () => {
    const { store, toggle, type, error } = setUp(exampleCorners.fsFrontWishbone, 'imperial');
    toggle('[data-mount="linkAxialNPerMm.tieRod"]');
    type('linkAxialNPerMm.tieRod', 'stiff');
    expect(error('linkAxialNPerMm.tieRod')).toBe('Tie rod, axial: "stiff" is not a number of lbf/in.');
    // The possible range, shared/schema/ranges.ts: more than 0 and at most 1e7 N/mm = 5.71e7 lbf/in.
    type('linkAxialNPerMm.tieRod', '0');
    expect(error('linkAxialNPerMm.tieRod')).toBe('Tie rod, axial: 0 is outside the possible range, more than 0 and at most 5.71e+7 lbf/in.');
    expect(store.canUndo()).toBe(false);
    type('linkAxialNPerMm.tieRod', '20000');
    expect(error('linkAxialNPerMm.tieRod')).toBeUndefined();
    expect(store.canUndo()).toBe(true);
  });

  it('lists the mounts each corner type has: a fixed toe link has no steering rate, a five-link corner five link rates', () => {
    const rear = setUp(exampleCorners.fsRearWishbone);
    const mounts = () => [...rear.el.querySelectorAll('[data-mount]')].map((m) => m.getAttribute('data-mount'));
    expect(mounts()).toEqual([
      'bushings.lowerFront', 'bushings.lowerRear', 'bushings.upperFront', 'bushings.upperRear', 'bushings.tieRodInner',
      'bushings.lowerOuter', 'bushings.upperOuter', 'bushings.tieRodOuter', 'linkAxialNPerMm.tieRod',
    ]);
    expect(rear.el.querySelector('[data-mount="linkAxialNPerMm.tieRod"]')!.textContent).toContain('Toe link, axial');
    TestBed.resetTestingModule();
    const five = setUp(exampleCorners.roadRearFiveLink);
    expect([...five.el.querySelectorAll('[data-mount^="linkAxialNPerMm."]')].map((m) => m.querySelector('.rw-mount-name')!.textContent.trim())).toEqual([
      'Link 1, axial', 'Link 2, axial', 'Link 3, axial', 'Link 4, axial', 'Link 5 (toe link), axial',
    ]);
  });

  it('gives a read-only user the choices and rates as text, "rigid" where a rate is absent', () => {
    const { el } = setUp(withSetting(exampleCorners.fsFrontWishbone, 'bushings.lowerRear', null, { radialNPerMm: 3000, axialNPerMm: 800 }), 'si', false);
    expect(el.querySelector('mat-checkbox, mat-select, input')).toBeNull();
    expect(el.querySelector('[data-setting="steered"]')!.textContent.trim()).toBe('Steered');
    expect(el.querySelector('[data-setting="steering.kind"]')!.textContent.trim()).toBe('Steered by: Steering rack');
    expect(el.querySelector('[data-setting="spring.rodOuterOn"]')!.textContent.trim()).toBe('Push/pull rod, outer end rides on: Lower arm');
    expect(el.querySelector('[data-setting="antiRollBar.dropLinkOuterOn"]')!.textContent.trim()).toBe('Anti-roll bar drop link, suspension end rides on: Lower arm');
    expect(el.querySelector('[data-mount="bushings.lowerFront"] .rw-rigid')!.textContent.trim()).toBe('Rigid');
    expect(el.querySelector('[data-mount="bushings.lowerRear"]')!.textContent).toContain('radial 3000 N/mm, axial 800 N/mm');
  });
});
