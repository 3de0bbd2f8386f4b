/**
 * CSV downloads in the browser. The CSV text itself comes from the one shared
 * writer (shared/io/csv.ts: RFC 4180 quoting, spreadsheet formulas escaped),
 * the same the server's exports use.
 */
export { toCsv } from '../../../shared/io/csv';

/** File name from a title: lower case, words joined by hyphens. */
export function fileNameFor(title: string, extension: string): string {
  const base = title
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
  return `${base || 'rollwise'}.${extension}`;
}

/** Offers `text` as a file download in the browser. */
export function downloadText(text: string, fileName: string, mimeType = 'text/csv'): void {
  const blob = new Blob([text], { type: `${mimeType};charset=utf-8` });
  const url = URL.createObjectURL(blob);
  const anchor = document.createElement('a');
  anchor.href = url;
  anchor.download = fileName;
  anchor.style.display = 'none';
  document.body.appendChild(anchor);
  anchor.click();
  anchor.remove();
  setTimeout(() => URL.revokeObjectURL(url), 0);
}
