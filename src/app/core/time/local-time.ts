/**
 * Times arrive from the API in UTC (ISO 8601 with `Z`); screens show them in
 * the browser's own time zone and say which zone that is.
 */

/** The IANA time zone of this browser (e.g. "Europe/Lisbon"); UTC when it cannot tell. */
export function browserTimeZone(): string {
  try {
    return Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
  } catch {
    return 'UTC';
  }
}

/** "2 Dec 2026, 14:03:27" in `timeZone`; the ISO text unchanged when it is not a time. */
export function formatLocalTime(iso: string, timeZone: string = browserTimeZone(), seconds = false): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return new Intl.DateTimeFormat('en-GB', {
    timeZone,
    year: 'numeric',
    month: 'short',
    day: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    ...(seconds ? { second: '2-digit' } : {}),
    hourCycle: 'h23',
  }).format(d);
}
