import { TestBed } from '@angular/core/testing';
import { browserLocale, browserTimeZone, formatLocalTime, LocalTimePipe } from './local-time';

describe('local time', () => {
  it('shows a UTC instant in the given zone (Lisbon is UTC+0 in December, UTC+1 in July; Tokyo UTC+9 all year, from memory)', () => {
    expect(formatLocalTime('2026-12-02T13:05:09.000Z', 'Europe/Lisbon', true, 'en-GB')).toBe('2 Dec 2026, 13:05:09');
    expect(formatLocalTime('2026-07-02T13:05:09.000Z', 'Europe/Lisbon', false, 'en-GB')).toBe('2 Jul 2026, 14:05');
    expect(formatLocalTime('2026-12-02T20:30:00.000Z', 'Asia/Tokyo', false, 'en-GB')).toBe('3 Dec 2026, 05:30');
  });

  it("writes the same instant in the user's language: month first and a 12-hour clock in US English, day first in German", () => {
    expect(formatLocalTime('2026-12-02T13:05:00.000Z', 'UTC', false, 'en-US')).toBe('Dec 2, 2026, 01:05 PM');
    expect(formatLocalTime('2026-12-02T13:05:00.000Z', 'UTC', false, 'de-DE')).toMatch(/^2\. Dez\. 2026, 13:05$/);
  });

  it('leaves text that is not a time alone and names a zone and a language for this browser', () => {
    expect(formatLocalTime('not a time', 'UTC')).toBe('not a time');
    expect(browserTimeZone()).toMatch(/^[A-Za-z_]+(\/[A-Za-z_+-]+)*$/);
    expect(browserLocale()).toMatch(/^[a-z]{2,3}(-[A-Za-z0-9]+)*$/);
  });

  it('the localTime pipe formats through the same function, in this browser’s language and zone', () => {
    const pipe = TestBed.runInInjectionContext(() => new LocalTimePipe());
    const iso = '2026-12-02T13:05:09.000Z';
    expect(pipe.transform(iso)).toBe(formatLocalTime(iso, browserTimeZone(), false, browserLocale()));
    expect(pipe.transform(iso, true)).toBe(formatLocalTime(iso, browserTimeZone(), true, browserLocale()));
    expect(pipe.transform(null)).toBe('');
  });
});
