/**
 * Browser-test harness: the real server (on a fresh copy of the run's demo database template)
 * serving the production build, and a Chromium of the file's own (Debian's headless build when
 * installed) driven in-process by playwright-core, a new context for every page.
 * Every page fails its test on a request that leaves 127.0.0.1, and records console errors
 * and uncaught page errors. Build the app first (`npx ng build`); npm test does.
 */
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium, type Browser, type BrowserContext, type Download, type Locator, type Page } from 'playwright-core';
import { AxeBuilder } from '@axe-core/playwright';
import { afterAll, beforeAll, expect } from 'vitest';
import { defaultChromiumPath } from '../../server/config.js';
import { demoDatabaseUrl } from './db.js';
import { freePort } from '../../server/tools/pg.js';

const root = resolve(import.meta.dirname, '..', '..');
export const DEMO_PASSWORD = 'demo-pass-2026';
const staticDir = join(root, 'dist', 'rollwise', 'browser');

export interface E2eApp {
  baseUrl: string;
  databaseUrl: string;
  stop(): Promise<void>;
}

export async function startE2eApp(): Promise<E2eApp> {
  if (!existsSync(join(staticDir, 'index.html'))) {
    throw new Error(`No built app in ${staticDir}: run \`npx ng build\` first (npm test does).`);
  }
  const databaseUrl = demoDatabaseUrl('e2e');
  const { startServer } = await import('../../server/main.js');
  // A known port up front, so links in mail (built from publicUrl) point at this server.
  const port = await freePort();
  const server = await startServer({
    databaseUrl,
    host: '127.0.0.1',
    port,
    publicUrl: `http://127.0.0.1:${port}`,
    seedDemo: true,
    staticDir,
    logLevel: 'silent',
    production: false,
    fakeSmtp: true,
    // No browser test is about the 10 s compute limit: a loaded CI machine must not turn a slow
    // configuration analysis into a missing result (the server tests of the limit set their own).
    computeTimeLimitMs: 60_000,
  });
  return { baseUrl: server.url, databaseUrl, stop: () => server.close() };
}

/**
 * The app and the browser for one describe block: the server and a Chromium started before its
 * tests and stopped after them.
 * Read `env.app` and `env.browser` inside the tests.
 */
export function useE2eApp(): { readonly app: E2eApp; readonly browser: E2eBrowser } {
  let app: E2eApp | undefined;
  let browser: E2eBrowser | undefined;
  beforeAll(async () => {
    app = await startE2eApp();
    browser = await openBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });
  const started = <T>(v: T | undefined, what: string): T => {
    if (v === undefined) throw new Error(`the e2e ${what} is not started yet: read env.${what} inside a test`);
    return v;
  };
  return {
    get app() {
      return started(app, 'app');
    },
    get browser() {
      return started(browser, 'browser');
    },
  };
}

interface PageRecord {
  consoleErrors: string[];
  offsite: string[];
}
const records = new WeakMap<Page, PageRecord>();

export interface E2eBrowser {
  browser: Browser;
  /** A page in a new context (its own cookies and storage), guarded and recorded. */
  newPage(): Promise<Page>;
  /** Closes the contexts and the browser. */
  close(): Promise<void>;
}

/**
 * A loopback port nothing listens on (port 9, discard, is not served on these machines): the
 * pages' proxy, so that a request leaving 127.0.0.1 is refused at once.
 */
const CLOSED_PORT = 9;

/**
 * Starts a Chromium for one file, driven in-process. (One browser per run, connected to over
 * playwright's websocket, sent every message through the vitest main process as well: about
 * 11 CPU-s in 45 s of browser tests. A start costs about 0.3 CPU-s.)
 */
export async function openBrowser(): Promise<E2eBrowser> {
  const home = mkdtempSync(join(tmpdir(), 'rollwise-chromium-'));
  const browser = await chromium.launch({
    executablePath: process.env['CHROMIUM_PATH'] || defaultChromiumPath(),
    headless: true,
    // Without the background-networking flags Chromium tries to reach Google's hosts at start.
    args: ['--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    env: { ...process.env, HOME: home, XDG_CONFIG_HOME: join(home, 'config'), XDG_CACHE_HOME: join(home, 'cache') },
  });
  const contexts: BrowserContext[] = [];
  return {
    browser,
    async newPage() {
      // Every request that would leave 127.0.0.1 goes to a proxy at a closed loopback port, so it
      // fails at once (the app's own address bypasses it), and its failure is recorded.
      // Watching failures instead of routing every request keeps Chromium's cache on and spares
      // each request a round trip to this process (a route on all requests did both).
      const context = await browser.newContext({ viewport: { width: 1366, height: 900 }, proxy: { server: `http://127.0.0.1:${CLOSED_PORT}`, bypass: '127.0.0.1' } });
      contexts.push(context);
      const page = await context.newPage();
      const rec: PageRecord = { consoleErrors: [], offsite: [] };
      records.set(page, rec);
      context.on('requestfailed', (request) => {
        const url = new URL(request.url());
        const local = url.hostname === '127.0.0.1' || url.protocol === 'data:' || url.protocol === 'blob:';
        if (!local) rec.offsite.push(url.href);
      });
      page.on('console', (msg) => {
        if (msg.type() === 'error') rec.consoleErrors.push(msg.text());
      });
      page.on('pageerror', (err) => rec.consoleErrors.push(`uncaught: ${err.message}`));
      return page;
    },
    async close() {
      for (const c of contexts) await c.close().catch(() => undefined);
      await browser.close();
      rmSync(home, { recursive: true, force: true });
    },
  };
}

/** Console errors and uncaught exceptions seen on the page so far. */
export function consoleErrors(page: Page): string[] {
  return records.get(page)?.consoleErrors ?? [];
}

/** Requests the page tried to send anywhere but 127.0.0.1 (all were blocked). */
export function offsiteRequests(page: Page): string[] {
  return records.get(page)?.offsite ?? [];
}

export async function saveScreenshot(page: Page, name: string): Promise<string> {
  const dir = join(root, 'test-results');
  mkdirSync(dir, { recursive: true });
  const file = join(dir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/** The text of a finished download (read through playwright, wherever it keeps the file). */
export async function downloadedText(download: Download): Promise<string> {
  const stream = await download.createReadStream();
  const chunks: Buffer[] = [];
  for await (const chunk of stream) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString('utf8');
}

/**
 * Pairs of text elements that overlap on screen (by more than half a pixel), as Chromium lays them out,
 * within each svg that `svgSelector` matches: "first text / second text". Empty when no two overlap.
 */
export async function overlappingTexts(page: Page, svgSelector: string): Promise<string[]> {
  return page.evaluate((selector) => {
    const found: string[] = [];
    for (const svg of document.querySelectorAll(selector)) {
      const texts = [...svg.querySelectorAll('text')].filter((t) => t.textContent.trim() !== '');
      const boxes = texts.map((t) => t.getBoundingClientRect());
      for (let i = 0; i < boxes.length; i++)
        for (let j = i + 1; j < boxes.length; j++) {
          const a = boxes[i]!;
          const b = boxes[j]!;
          if (a.left < b.right - 0.5 && b.left < a.right - 0.5 && a.top < b.bottom - 0.5 && b.top < a.bottom - 0.5) found.push(`${texts[i]!.textContent} / ${texts[j]!.textContent}`);
        }
    }
    return found;
  }, svgSelector);
}

/**
 * Where `locator` sits on screen once it has stopped moving: the box read after two animation frames
 * equals the one read before them. For a point drawn on a canvas (a label anchored to it) that a test
 * clicks by position, where Playwright's own "stable" check does not apply; a resize or a late redraw
 * would otherwise move the target between reading its box and clicking.
 */
export async function settledBox(page: Page, locator: Locator, timeoutMs = 15_000): Promise<{ x: number; y: number; width: number; height: number }> {
  const until = Date.now() + timeoutMs;
  let last = await locator.boundingBox();
  for (;;) {
    await page.evaluate(() => new Promise<void>((done) => requestAnimationFrame(() => requestAnimationFrame(() => done()))));
    const now = await locator.boundingBox();
    if (now && last && now.x === last.x && now.y === last.y && now.width === last.width && now.height === last.height) return now;
    if (Date.now() > until) throw new Error(`still moving after ${timeoutMs} ms: ${JSON.stringify(last)} then ${JSON.stringify(now)}`);
    last = now;
  }
}

/** Picks `option` in the Material select named `name`, as a user does: opens its list, clicks the option, waits for the list to close. */
export async function chooseOption(page: Page, name: string, option: string | RegExp): Promise<void> {
  await page.getByRole('combobox', { name, exact: true }).click();
  await page.getByRole('option', { name: option, exact: typeof option === 'string' }).click();
  await page.getByRole('listbox').waitFor({ state: 'detached' });
}

/** The API's JSON answer to a GET of `url` (or a PATCH with `patch`), as the person signed in on `page`. */
export async function apiJson<T>(page: Page, url: string, patch?: unknown): Promise<T> {
  const headers = { 'X-Rollwise-Request': '1' };
  const r = patch === undefined ? await page.request.get(url, { headers }) : await page.request.patch(url, { headers, data: patch });
  if (!r.ok()) throw new Error(`${patch === undefined ? 'GET' : 'PATCH'} ${url}: ${r.status()} ${await r.text()}`);
  return (await r.json()) as T;
}

/** The item of `list` with this name (a team, vehicle, design, configuration); fails naming the ones there are. */
export function named<T extends { name: string }>(list: readonly T[], name: string): T {
  const found = list.find((x) => x.name === name);
  if (!found) throw new Error(`no "${name}" among ${list.map((x) => x.name).join(', ')}`);
  return found;
}

/** Signs in through the sign-in page and waits until the app has left it. */
export async function signIn(page: Page, baseUrl: string, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: false }).first().fill(password);
  await page.getByRole('button', { name: /sign in/i }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'), { timeout: 15_000 });
}

/**
 * Serious and critical accessibility findings on the page under WCAG 2.2 AA
 * rules (issue 6 quality bar), judged on the settled page: no indeterminate (loading) progress bar left.
 */
export async function seriousA11yViolations(page: Page): Promise<string[]> {
  await page.locator('mat-progress-bar[mode="indeterminate"], .rw-busy-bar').waitFor({ state: 'detached' });
  // The page as its reader sees it: until the shipped icon font has loaded, an icon shows its ligature's name
  // as plain text (the top bar's mark read as the text "360" and failed the contrast rule at load 15).
  await page.evaluate(() => document.fonts.ready.then(() => undefined));
  // Legacy mode: axe runs in the page and its same-origin frames (the review record's) and gathers their results
  // there, instead of opening a blank page to merge per-frame results, which is for cross-origin frames (the app
  // has none). The same rules on the same nodes; the blank page cost about 3 s per check on the editor page.
  const result = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa']).setLegacyMode().analyze();
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(', ')})`);
}

/**
 * A new axle design, a copy of a demo design's corner, made through the API as the person
 * signed in on `page` (its context's cookies): a test that edits and saves works on its own
 * design, so no test depends on what another one saved, and any test runs alone or in any
 * order. `edit` changes the copied corner first (a moved point). Returns the design's path in
 * the app (`/teams/…/vehicles/…/axle-designs/…`).
 */
export async function copyOfDemoDesign(
  page: Page,
  baseUrl: string,
  from: { team: string; vehicle: string; design: string },
  name: string,
  edit?: (corner: { points: Record<string, [number, number, number]> }) => void,
): Promise<string> {
  const api = async <T>(path: string, body?: unknown): Promise<T> => {
    const headers = { 'X-Rollwise-Request': '1' };
    const r = body === undefined ? await page.request.get(baseUrl + path, { headers }) : await page.request.post(baseUrl + path, { headers, data: body });
    if (!r.ok()) throw new Error(`${body === undefined ? 'GET' : 'POST'} ${path}: ${r.status()} ${await r.text()}`);
    return (await r.json()) as T;
  };
  const byName = <T extends { name: string }>(list: T[], n: string, what: string): T => {
    const found = list.find((x) => x.name === n);
    if (!found) throw new Error(`no ${what} "${n}" among ${list.map((x) => x.name).join(', ')}`);
    return found;
  };
  const team = byName(await api<{ id: string; name: string }[]>('/api/teams'), from.team, 'team');
  const vehicle = byName(await api<{ id: string; name: string }[]>(`/api/teams/${team.id}/vehicles`), from.vehicle, 'vehicle');
  const designs = await api<{ id: string; name: string; axle: string }[]>(`/api/teams/${team.id}/vehicles/${vehicle.id}/axle-designs`);
  const source = await api<{ axle: string; corner: unknown }>(`/api/teams/${team.id}/axle-designs/${byName(designs, from.design, 'axle design').id}`);
  edit?.(source.corner as { points: Record<string, [number, number, number]> });
  const created = await api<{ id: string }>(`/api/teams/${team.id}/vehicles/${vehicle.id}/axle-designs`, { axle: source.axle, name, corner: source.corner });
  return `/teams/${team.id}/vehicles/${vehicle.id}/axle-designs/${created.id}`;
}

/** The captured mail with this subject to this address, refreshing until the outbox has sent it. */
export async function waitForMail(page: Page, subject: string, to: string): Promise<Locator> {
  const mail = page
    .locator('li.mail')
    .filter({ has: page.getByRole('heading', { name: subject }) })
    .filter({ hasText: to });
  // The outbox sends within a poll or two of the queue worker: press Refresh, as the person would, until the mail is listed.
  await expect
    .poll(
      async () => {
        if ((await mail.count()) === 0) {
          // Refresh empties the list and reads the inbox again: count once that answer is shown,
          // not while the old list may still be on screen (a count then, and the list gone after).
          const read = page.waitForResponse((r) => new URL(r.url()).pathname === '/api/dev/mail' && r.request().method() === 'GET');
          await page.getByRole('button', { name: 'Refresh' }).click();
          await read;
          await page.getByText('Loading captured mail…').waitFor({ state: 'detached' });
        }
        return mail.count();
      },
      { timeout: 40_000, interval: 250, message: `mail "${subject}" to ${to} on the development mail page` },
    )
    .toBeGreaterThan(0);
  return mail.first();
}
