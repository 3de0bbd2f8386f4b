/** CSV text of a table (RFC 4180 quoting), and a browser download of it. */

function csvCell(value: string | number): string {
  const text = typeof value === 'number' ? (Number.isFinite(value) ? String(value) : '') : value;
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** Lines starting with `#` carry context (units, sign convention) before the header row. */
export function toCsv(
  header: readonly string[],
  rows: readonly (readonly (string | number)[])[],
  commentLines: readonly string[] = [],
): string {
  const lines = [
    ...commentLines.map((c) => `# ${c}`),
    header.map(csvCell).join(','),
    ...rows.map((r) => r.map(csvCell).join(',')),
  ];
  return lines.join('\r\n') + '\r\n';
}

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
