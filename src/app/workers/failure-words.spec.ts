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
});
