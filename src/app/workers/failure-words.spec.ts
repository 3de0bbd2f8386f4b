import { failureWords } from './failure-words';

describe('failureWords', () => {
  it('says where the linkage stopped and which link, without point keys or unrounded figures', () => {
    const text = failureWords({
      code: 'unreachable_pose',
      message: 'Pose unreachable at travel 82.123456 mm, rack 0 mm: the pushrod/pullrod (rodOuter–rodRocker) cannot reach its lever',
      details: { travelMm: 82.123456, rackMm: 0, side: 'left', link: 'pushrod/pullrod (rodOuter–rodRocker)', field: 'spring.rodOuter' },
    });
    expect(text).toBe('The linkage cannot reach 82.12 mm of bump: the pushrod/pullrod cannot reach.');
  });

  it('names droop, the rack and a travel range the user can narrow', () => {
    const text = failureWords({
      code: 'unreachable_pose',
      message: 'x. set trackProfile.travelMm to the corner’s travel',
      details: { travelMm: -60, rackMm: 12.5, link: 'wheel-centre height (travel beyond the linkage’s reach)', field: 'trackProfile.travelMm', travelRangeMm: [-100, 100] },
    });
    expect(text).toBe('The linkage cannot reach 60 mm of droop with the rack at 12.5 mm: the travel is beyond what the links allow. Narrow the travel range (now −100 to 100 mm) to what the corner can reach.');
    expect(text).not.toContain('trackProfile');
  });

  it('drops a field-path prefix and rounds long decimals in other messages', () => {
    expect(failureWords({ code: 'invalid_input', message: 'Invalid intent: target.understeerChangeDegPerG: the vehicle has no roll at 0.123456789 deg' })).toBe(
      'the vehicle has no roll at 0.1235 deg',
    );
  });

  it('writes lengths in inches for an inch/pound user (1 in = 25.4 mm exactly)', () => {
    const failure = {
      code: 'unreachable_pose',
      message: 'x',
      details: { travelMm: -50.8, rackMm: 12.7, link: 'tie rod (tieRodInner–tieRodOuter)', travelRangeMm: [-101.6, 101.6] },
    };
    expect(failureWords(failure, 'imperial')).toBe('The linkage cannot reach 2 in of droop with the rack at 0.5 in: the tie rod cannot reach. Narrow the travel range (now −4 to 4 in) to what the corner can reach.');
    expect(failureWords({ code: 'invalid_input', message: 'the bump of 25.4 mm is beyond the travel' }, 'imperial')).toBe('the bump of 1 in is beyond the travel');
  });
});
