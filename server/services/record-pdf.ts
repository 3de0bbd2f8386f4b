/**
 * PDF of the review record: Debian's Chromium (through playwright-core)
 * prints the record's own HTML (review-record-html.ts) with its print
 * stylesheet, so the PDF is the page the app shows. One render at a time per
 * server process (a browser costs about 150 MB and a second of a core);
 * others wait in line, and past a short line the answer is 503 `busy`.
 * The page may load nothing: every request is refused, the document is
 * self-contained. Chromium's profile lives in a temporary folder that is
 * removed afterwards (stack-notes: never under the user's home).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { DomainError } from '../../shared/errors.js';

const MAX_WAITING = 4;
let line: Promise<unknown> = Promise.resolve();
let waiting = 0;

/** Runs `job` after every earlier one has finished (one at a time). */
function oneAtATime<T>(job: () => Promise<T>): Promise<T> {
  if (waiting >= MAX_WAITING) {
    return Promise.reject(new DomainError('unavailable', 'busy', 'Several review records are being printed right now; try again in a minute'));
  }
  waiting++;
  const run = line.then(job, job);
  line = run.then(
    () => undefined,
    () => undefined,
  );
  return run.finally(() => {
    waiting--;
  });
}

export interface PdfOptions {
  /** Shown in every page's footer beside the page count. */
  footerText: string;
  /** Chromium's path (config `chromiumPath`, CHROMIUM_PATH). */
  executablePath: string;
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

export function renderPdf(html: string, o: PdfOptions): Promise<Buffer> {
  return oneAtATime(async () => {
    let chromium: typeof import('playwright-core').chromium;
    try {
      ({ chromium } = await import('playwright-core'));
    } catch {
      throw new DomainError('unavailable', 'pdf_unavailable', 'PDF printing is not installed on this server; print the record page from the browser instead');
    }
    const home = mkdtempSync(join(tmpdir(), 'rollwise-record-'));
    try {
      const browser = await chromium
        .launch({
          executablePath: o.executablePath,
          headless: true,
          args: ['--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
          env: { ...process.env, HOME: home, XDG_CONFIG_HOME: join(home, 'config'), XDG_CACHE_HOME: join(home, 'cache') },
        })
        .catch(() => {
          throw new DomainError('unavailable', 'pdf_unavailable', 'The PDF printer (Chromium) could not start on this server; print the record page from the browser instead');
        });
      try {
        const context = await browser.newContext({ javaScriptEnabled: false, offline: true });
        await context.route('**/*', (route) => (route.request().url().startsWith('data:') ? route.continue() : route.abort('blockedbyclient')));
        const page = await context.newPage();
        await page.setContent(html, { waitUntil: 'load' });
        await page.emulateMedia({ media: 'print' });
        return await page.pdf({
          format: 'A4',
          printBackground: true,
          preferCSSPageSize: true,
          displayHeaderFooter: true,
          headerTemplate: '<span></span>',
          footerTemplate: `<div style="font-size:8px;width:100%;padding:0 12mm;display:flex;justify-content:space-between;font-family:sans-serif"><span>${escapeHtml(o.footerText)}</span><span>Page <span class="pageNumber"></span> of <span class="totalPages"></span></span></div>`,
        });
      } finally {
        await browser.close();
      }
    } finally {
      rmSync(home, { recursive: true, force: true });
    }
  });
}
