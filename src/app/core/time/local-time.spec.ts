import { browserTimeZone, formatLocalTime } from './local-time';

describe('local time', () => {
  it('shows a UTC instant in the given zone (Lisbon is UTC+0 in December, UTC+1 in July; Tokyo UTC+9 all year, from memory)', () => {
    expect(formatLocalTime('2026-12-02T13:05:09.000Z', 'Europe/Lisbon', true)).toBe('2 Dec 2026, 13:05:09');
    expect(formatLocalTime('2026-07-02T13:05:09.000Z', 'Europe/Lisbon')).toBe('2 Jul 2026, 14:05');
    expect(formatLocalTime('2026-12-02T20:30:00.000Z', 'Asia/Tokyo')).toBe('3 Dec 2026, 05:30');
  });

  it('leaves text that is not a time alone and names a zone for this browser', () => {
    expect(formatLocalTime('not a time', 'UTC')).toBe('not a time');
    expect(browserTimeZone()).toMatch(/^[A-Za-z_]+(\/[A-Za-z_+-]+)*$/);
  });
});
