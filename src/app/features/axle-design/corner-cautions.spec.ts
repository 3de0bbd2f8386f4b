import { exampleCorners } from '../../../../shared/kinematics/examples';
import { cautionsForCorner } from '../../../../shared/cautions/corner-cautions';
import type { Caution } from '../../../../shared/cautions/cautions';
import { trackProfiles, type TrackProfileId } from '../../../../shared/tracks/profiles';
import { formatNum } from '../../core/format/num';
import { CAUTION_GROUPS, CornerCautions } from './corner-cautions';
import { renderComponent } from '../../../testing/render';
import { TrackProfileSelect } from './track-profile-select';

/** Real cautions of the example front wishbone from the shared engine, with thresholds low enough that each bump rule fires. */
function realCautions(): Caution[] {
  return cautionsForCorner(exampleCorners.fsFrontWishbone, {
    axle: 'front',
    trackProfile: 'smooth-circuit',
    thresholds: { 'bump-toe-change': { warning: 1e-6 }, 'bump-lateral-scrub': { critical: 1e-6 }, 'front-roll-steer-feel': { info: 0 } },
  });
}

function render(cautions: readonly Caution[], group: 'bump' | 'roll') {
  return renderComponent(CornerCautions, { cautions, group, title: group === 'bump' ? 'Bump-steer cautions' : 'Roll-steer cautions' }).nativeElement as HTMLElement;
}

describe('CornerCautions', () => {
  it('shows the bump cautions beside the bump-steer fits with level, message, value, threshold and basis', () => {
    const cautions = realCautions();
    const el = render(cautions, 'bump');
    const items = Array.from(el.querySelectorAll<HTMLElement>('li.rw-caution'));
    const codes = items.map((li) => li.dataset['code']);
    expect(codes).toContain('bump-toe-change');
    expect(codes).toContain('bump-lateral-scrub');
    for (const code of codes) expect(CAUTION_GROUPS.bump).toContain(code);
    const toe = cautions.find((c) => c.code === 'bump-toe-change')!;
    const li = items.find((x) => x.dataset['code'] === 'bump-toe-change')!;
    expect(li.classList).toContain('rw-caution-warning');
    expect(li.textContent).toContain('Warning');
    expect(li.textContent).toContain(toe.message);
    // To 3 significant figures through the app's one formatter (trailing zeros dropped).
    expect(li.textContent).toContain(`Value ${formatNum(toe.value, { sig: 3 })} deg`);
    expect(li.textContent).toContain(`threshold ${formatNum(toe.threshold, { sig: 3 })} deg`);
    expect(li.textContent).toContain(`Basis: ${toe.basis}`);
    expect(items.find((x) => x.dataset['code'] === 'bump-lateral-scrub')!.classList).toContain('rw-caution-critical');
  });

  it('shows the roll-steer cautions in their own group and never repeats the safety notice', () => {
    const el = render(realCautions(), 'roll');
    const codes = Array.from(el.querySelectorAll<HTMLElement>('li.rw-caution')).map((li) => li.dataset['code']);
    expect(codes).toContain('front-roll-steer-feel');
    expect(codes).not.toContain('bump-toe-change');
    expect(codes).not.toContain('safety-notice');
  });

  it('says so when no caution of the group applies', () => {
    const el = render(realCautions().filter((c) => c.code === 'safety-notice'), 'bump');
    expect(el.querySelector('li.rw-caution')).toBeNull();
    expect(el.textContent).toContain('None on this profile.');
  });
});

describe('TrackProfileSelect', () => {
  it('offers the four profiles with their bump heights, shows the chosen one and emits a new choice', async () => {
    const fixture = renderComponent(TrackProfileSelect, { value: 'smooth-circuit' });
    const picked: TrackProfileId[] = [];
    fixture.componentInstance.changed.subscribe((id) => picked.push(id));
    // The Material select shows its value once its options are initialised (a microtask after the first check).
    await fixture.whenStable();
    fixture.detectChanges();
    const el = fixture.nativeElement as HTMLElement;
    expect(el.querySelector('mat-label')!.textContent).toContain('Track profile for the cautions');
    expect(el.querySelector('.mat-mdc-select-value')!.textContent).toContain(trackProfiles['smooth-circuit'].label);
    // The Material select opens its options in the overlay; choosing one emits it.
    el.querySelector<HTMLElement>('.mat-mdc-select-trigger')!.click();
    fixture.detectChanges();
    const options = Array.from(document.querySelectorAll<HTMLElement>('mat-option'));
    expect(options.map((o) => o.textContent.trim().split(' (')[0])).toEqual(
      ['smooth-circuit', 'bumpy-circuit', 'rough-road', 'off-road'].map((id) => trackProfiles[id as TrackProfileId].label),
    );
    expect(options[1]!.textContent).toContain('25 mm bump');
    options[1]!.click();
    expect(picked).toEqual(['bumpy-circuit']);
  });
});
