import { failureWords } from './failure-words';

describe('failureWords', () => {
  it('says where the linkage stopped and which link, without point keys or unrounded figures', () => {
    const text = failureWords({
      code: 'unreachable_pose',
      message: 'Pose unreachable at travel 82.123456 mm, rack 0 mm: the pushrod/pullrod (rodOuter–rodRocker) cannot reach its lever',
      details: { travelMm: 82.123456, rackMm: 0, side: 'left', link: 'pushrod/pullrod (rodOuter–rodRocker)', field: 'spring.rodOuter' },
    }, 'si');
    expect(text).toBe('The linkage cannot reach 82.12 mm of bump: the pushrod/pullrod cannot reach.');
  });

  it('names droop, the rack and a travel range the user can narrow', () => {
    const text = failureWords({
      code: 'unreachable_pose',
      message: 'x. set trackProfile.travelMm to the corner’s travel',
      details: { travelMm: -60, rackMm: 12.5, link: 'wheel-centre height (travel beyond the linkage’s reach)', field: 'trackProfile.travelMm', travelRangeMm: [-100, 100] },
    }, 'si');
    // Figures as the one formatter (formatNum) writes them, the minus sign included.
    expect(text).toBe('The linkage cannot reach 60 mm of droop with the rack at 12.5 mm: the travel is beyond what the links allow. Narrow the travel range (now -100 to 100 mm) to what the corner can reach.');
    expect(text).not.toContain('trackProfile');
  });

  it('drops a field-path prefix and rounds long decimals in other messages', () => {
    expect(failureWords({ code: 'invalid_input', message: 'Invalid intent: target.understeerChangeDegPerG: the vehicle has no roll at 0.123456789 deg' }, 'si')).toBe(
      'the vehicle has no roll at 0.1235 deg',
    );
  });

  it('writes lengths in inches for an inch/pound user (1 in = 25.4 mm exactly)', () => {
    const failure = {
      code: 'unreachable_pose',
      message: 'x',
      details: { travelMm: -50.8, rackMm: 12.7, link: 'tie rod (tieRodInner–tieRodOuter)', travelRangeMm: [-101.6, 101.6] },
    };
    expect(failureWords(failure, 'imperial')).toBe('The linkage cannot reach 2 in of droop with the rack at 0.5 in: the tie rod cannot reach. Narrow the travel range (now -4 to 4 in) to what the corner can reach.');
    expect(failureWords({ code: 'invalid_input', message: 'the bump of 25.4 mm is beyond the travel' }, 'imperial')).toBe('the bump of 1 in is beyond the travel');
  });

  it('writes every figure with a unit inside a message in the user\'s units, ranges and non-length quantities included', () => {
    // 1 in = 25.4 mm, 1 lbf = 4.4482216152605 N, 1 mi = 1.609344 km exactly (NIST SP 811); 4 significant figures, the app's length and force precision.
    const message = 'Pose unreachable at travel −50.8 mm, rack 12.7 mm: the spring force of 444.82216152605 N is outside 0 to 254 mm of stroke at 100 km/h (link1, 0.5 deg/deg)';
    expect(failureWords({ code: 'engine_error', message }, 'imperial')).toBe(
      'Pose unreachable at travel -2 in, rack 0.5 in: the spring force of 100 lbf is outside 0 to 10 in of stroke at 62.14 mph (link1, 0.5 deg/deg)',
    );
    // The same message for an SI user keeps its units, with the unrounded force to 4 significant figures.
    expect(failureWords({ code: 'engine_error', message }, 'si')).toBe(
      'Pose unreachable at travel −50.8 mm, rack 12.7 mm: the spring force of 444.8 N is outside 0 to 254 mm of stroke at 100 km/h (link1, 0.5 deg/deg)',
    );
  });

  it('states the structured failure in the unit system it is given, not SI by default', () => {
    const failure = { code: 'no_convergence', message: 'x', details: { travelMm: 25.4, rackMm: 0 } };
    expect(failureWords(failure, 'si')).toBe('The linkage cannot reach 25.4 mm of bump: the travel is beyond what the links allow.');
    expect(failureWords(failure, 'imperial')).toBe('The linkage cannot reach 1 in of bump: the travel is beyond what the links allow.');
  });
});
