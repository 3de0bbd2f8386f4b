/**
 * UI figures (issue 6) from a real server, a seeded throwaway database and
 * headless Chromium, on the production build (`npx ng build` first):
 *  - ui.editToRedraw.medianMs: committed hardpoint edit (change event) to the
 *    toe chart's path updated, measured after the next animation frame;
 *    median of 20 edits.
 *  - ui.signInJs.compressedKb: JavaScript the sign-in page loads, gzip-compressed
 *    as the server sends it.
 *  - ui.initialJs.compressedKb: the same for a fresh load of the axle editor,
 *    with its lazy chunks and the Web Worker.
 */
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { tmpdir } from 'node:os';
import { gzipSync } from 'node:zlib';
import { chromium, type BrowserContext } from 'playwright-core';
import { startThrowawayCluster } from '../../server/tools/pg.js';
import { median, round } from './stats.js';
import type { BenchFigures } from './run.js';

const root = resolve(import.meta.dirname, '..', '..');
// UI_BENCH_STATIC_DIR: another build's browser/ folder (default: the one `npx ng build` writes).
const staticDir = process.env['UI_BENCH_STATIC_DIR'] ? resolve(process.env['UI_BENCH_STATIC_DIR']) : join(root, 'dist', 'rollwise', 'browser');
const TIE_ROD_INNER_Z = 'Tie rod, inner end (rack), z in mm';

/** Sums the compressed size of every script (page and workers) the context fetched. */
function trackScripts(context: BrowserContext): { bytes: () => Promise<number> } {
  const urls = new Set<string>();
  context.on('response', (r) => {
    const type = r.request().resourceType();
    if (type === 'script' || r.url().endsWith('.js')) urls.add(r.url());
  });
  return {
    async bytes() {
      let total = 0;
      const sizes: [string, number][] = [];
      for (const url of urls) {
        // The server gzips with compression's default level 6, as zlib does here.
        const body = new Uint8Array(await (await fetch(url)).arrayBuffer());
        const gz = gzipSync(body).length;
        sizes.push([new URL(url).pathname, gz]);
        total += gz;
      }
      if (process.env['UI_BENCH_VERBOSE']) {
        for (const [path, gz] of sizes.sort((a, b) => b[1] - a[1])) console.log(`    ${(gz / 1024).toFixed(1).padStart(7)} kB  ${path}`);
      }
      return total;
    },
  };
}

export async function run(): Promise<BenchFigures> {
  if (!existsSync(join(staticDir, 'index.html'))) {
    console.log('  (no built app: run `npx ng build` first; ui figures skipped)');
    return {};
  }
  const cluster = await startThrowawayCluster('rollwise_bench');
  const { startServer } = await import('../../server/main.js');
  const server = await startServer({ databaseUrl: cluster.url, port: 0, seedDemo: true, staticDir, logLevel: 'silent', production: false });
  const home = mkdtempSync(join(tmpdir(), 'rollwise-bench-chromium-'));
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: ['--disable-gpu', '--disable-quic', '--disable-background-networking'],
    env: { ...process.env, HOME: home, XDG_CONFIG_HOME: join(home, 'c'), XDG_CACHE_HOME: join(home, 'k') },
  });
  try {
    // Sign-in page JavaScript.
    const signInCtx = await browser.newContext();
    const signInJs = trackScripts(signInCtx);
    const p1 = await signInCtx.newPage();
    await p1.goto(`${server.url}/sign-in`, { waitUntil: 'networkidle' });
    const signInKb = (await signInJs.bytes()) / 1024;

    // Sign in, find the editor URL.
    await p1.getByLabel('E-mail').fill('designer@tallowmere.example');
    await p1.getByLabel('Password').first().fill('demo-pass-2026');
    await p1.getByRole('button', { name: /sign in/i }).click();
    await p1.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
    await p1.getByRole('link', { name: 'TUR-26 Ember' }).click();
    await p1.getByRole('link', { name: 'Front baseline' }).click();
    await p1.locator('[data-testid="toe-chart"] path.rw-series-line').first().waitFor();
    const editorUrl = p1.url();
    await p1.close();

    // Fresh page on the editor URL (same signed-in context): every script it
    // needs, worker included, whether or not the browser had cached it.
    const edJs = trackScripts(signInCtx);
    const page = await signInCtx.newPage();
    await page.goto(editorUrl, { waitUntil: 'networkidle' });
    await page.locator('[data-testid="toe-chart"] path.rw-series-line').first().waitFor({ timeout: 10_000 }).catch(async (e: unknown) => {
      await page.screenshot({ path: join(root, 'test-results', 'bench-ui-failure.png') });
      throw e;
    });
    const editorKb = (await edJs.bytes()) / 1024;

    // Edit → redraw, 20 committed edits alternating ±2 mm.
    const input = page.getByLabel(TIE_ROD_INNER_Z);
    const handle = await input.elementHandle();
    if (!handle) throw new Error('tie-rod inner z input not found');
    const z0 = Number(await input.inputValue());
    const times: number[] = [];
    for (let i = 0; i < 22; i++) {
      const value = z0 + (i % 2 === 0 ? 2 : 0) + i * 0.01;
      const ms = await handle.evaluate(
        (el, v) =>
          new Promise<number>((resolveTime, reject) => {
            const input = el as HTMLInputElement;
            const path = document.querySelector('[data-testid="toe-chart"] svg path.rw-series-line');
            if (!path) return reject(new Error('no toe path'));
            const chart = document.querySelector('[data-testid="toe-chart"]')!;
            const before = path.getAttribute('d');
            const t0 = performance.now();
            const obs = new MutationObserver(() => {
              const now = document.querySelector('[data-testid="toe-chart"] svg path.rw-series-line');
              if (now && now.getAttribute('d') !== before) {
                obs.disconnect();
                requestAnimationFrame(() => resolveTime(performance.now() - t0));
              }
            });
            obs.observe(chart, { subtree: true, attributes: true, childList: true });
            setTimeout(() => {
              obs.disconnect();
              reject(new Error('toe chart did not redraw within 5 s'));
            }, 5000);
            input.value = String(v);
            input.dispatchEvent(new Event('input', { bubbles: true }));
            input.dispatchEvent(new Event('change', { bubbles: true }));
          }),
        value,
      );
      if (i >= 2) times.push(ms);
    }
    const figures: BenchFigures = {
      'ui.editToRedraw.medianMs': round(median(times), 1),
      'ui.signInJs.compressedKb': round(signInKb, 1),
      'ui.initialJs.compressedKb': round(editorKb, 1),
    };
    console.log('  targets: edit→redraw ≤ 100 ms; sign-in JS ≤ 150 kB; editor JS ≤ 400 kB (gzip)');
    return figures;
  } finally {
    await browser.close();
    await server.close();
    cluster.remove();
    rmSync(home, { recursive: true, force: true });
  }
}
