import { Pipe, PipeTransform } from '@angular/core';

/**
 * The one date formatter of the app. Times arrive from the API in UTC
 * (ISO 8601 with `Z`); every screen shows them in one format (day, short
 * month, year, hours and minutes, seconds where a log needs them), in the
 * browser's own language and time zone. Templates use `{{ iso | localTime }}`;
 * code calls `formatLocalTime`. Never Angular's DatePipe or `toLocale*`.
 */

/** The IANA time zone of this browser (e.g. "Europe/Lisbon"); UTC when it cannot tell. */
export function browserTimeZone(): string {
  try {
    return Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
  } catch {
    return 'UTC';
  }
}

/** The browser's preferred language (e.g. "en-GB", "de-DE"); British English when it cannot tell. */
export function browserLocale(): string {
  const preferred = globalThis.navigator?.language;
  try {
    return preferred ? (Intl.DateTimeFormat.supportedLocalesOf([preferred])[0] ?? 'en-GB') : 'en-GB';
  } catch {
    return 'en-GB';
  }
}

/**
 * "2 Dec 2026, 14:03" (en-GB) or "Dec 2, 2026, 2:03 PM" (en-US) in `timeZone`;
 * the ISO text unchanged when it is not a time.
 */
export function formatLocalTime(
  iso: string,
  timeZone: string = browserTimeZone(),
  seconds = false,
  locale: string = browserLocale(),
): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return new Intl.DateTimeFormat(locale, {
    timeZone,
    year: 'numeric',
    month: 'short',
    day: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    ...(seconds ? { second: '2-digit' } : {}),
  }).format(d);
}

/**
 * `{{ revision.createdAt | localTime }}`, `{{ mail.receivedAt | localTime: true }}`
 * (with seconds): an API time in the user's language and zone; empty for none.
 */
@Pipe({ name: 'localTime' })
export class LocalTimePipe implements PipeTransform {
  private readonly timeZone = browserTimeZone();
  private readonly locale = browserLocale();

  transform(iso: string | Date | null | undefined, seconds = false): string {
    if (iso === null || iso === undefined || iso === '') return '';
    return formatLocalTime(iso instanceof Date ? iso.toISOString() : iso, this.timeZone, seconds, this.locale);
  }
}
