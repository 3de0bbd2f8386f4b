/**
 * Browser test of the charts' look (issue 15 §5): on the pages that draw
 * charts (configuration, axle-design editor, design report), no two text elements of a chart overlap (tick labels, bar
 * values, category names, axis titles, mark labels), and every chart draws
 * its text in the app's shipped font. Text boxes are compared as the
 * rectangles the browser lays out, turned with their text (a turned label's
 * axis-aligned box would overlap its neighbour's without the text doing so).
 * Needs `npx ng build` first.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { apiJson as api, consoleErrors, named, offsiteRequests, saveScreenshot, signIn, useE2eApp } from '../support/e2e.js';

interface ChartReport {
  chart: string;
  texts: number;
  overlaps: string[];
  fonts: string[];
}

/**
 * For every chart on the page: its text elements' boxes (getBBox in the
 * element's own coordinates, carried to the screen through its transform),
 * the pairs whose turned rectangles overlap by more than half a pixel
 * (sub-pixel rounding of glyph boxes that merely touch), and the font
 * families its texts are drawn in.
 */
async function chartTexts(page: Page): Promise<ChartReport[]> {
  return page.evaluate(() => {
    type P = { x: number; y: number };
    const corners = (el: SVGGraphicsElement): P[] => {
      const b = el.getBBox();
      const m = el.getScreenCTM()!;
      return [
        [b.x, b.y],
        [b.x + b.width, b.y],
        [b.x + b.width, b.y + b.height],
        [b.x, b.y + b.height],
      ].map(([x, y]) => ({ x: m.a * x! + m.c * y! + m.e, y: m.b * x! + m.d * y! + m.f }));
    };
    // Separating-axis test of two convex quadrilaterals: overlap depth along the least-overlapping axis.
    const depth = (a: P[], b: P[]): number => {
      let least = Infinity;
      for (const poly of [a, b]) {
        for (let i = 0; i < poly.length; i++) {
          const p = poly[i]!;
          const q = poly[(i + 1) % poly.length]!;
          const len = Math.hypot(q.x - p.x, q.y - p.y);
          if (len === 0) continue;
          const n = { x: -(q.y - p.y) / len, y: (q.x - p.x) / len };
          const proj = (s: P[]) => s.map((v) => v.x * n.x + v.y * n.y);
          const pa = proj(a);
          const pb = proj(b);
          const d = Math.min(Math.max(...pa), Math.max(...pb)) - Math.max(Math.min(...pa), Math.min(...pb));
          least = Math.min(least, d);
        }
      }
      return least;
    };
    return Array.from(document.querySelectorAll<SVGSVGElement>('figure.rw-chart svg.rw-chart-svg')).map((svg) => {
      const title = svg.closest('figure')!.querySelector('figcaption')?.textContent?.trim() ?? '(untitled)';
      const texts = Array.from(svg.querySelectorAll<SVGTextElement>('text')).filter((t) => (t.textContent ?? '').trim() !== '');
      const boxes = texts.map((t) => ({ text: t.textContent.trim(), quad: corners(t) }));
      const overlaps: string[] = [];
      for (let i = 0; i < boxes.length; i++) {
        for (let j = i + 1; j < boxes.length; j++) {
          const d = depth(boxes[i]!.quad, boxes[j]!.quad);
          if (d > 0.5) overlaps.push(`"${boxes[i]!.text}" and "${boxes[j]!.text}" overlap by ${d.toFixed(1)} px`);
        }
      }
      const fonts = [...new Set(texts.map((t) => getComputedStyle(t).fontFamily))];
      return { chart: title, texts: texts.length, overlaps, fonts };
    });
  });
}


describe('Charts in Chromium', () => {
  const env = useE2eApp();

  it('no two text elements of a chart overlap, and every chart draws in the shipped font', async () => {
    const page = await env.browser.newPage();
    const base = env.app.baseUrl;
    await signIn(page, base, 'engineer@tallowmere.example');
    const team = named(await api<{ id: string; name: string }[]>(page, `${base}/api/teams`), 'Tallowmere University Racing');
    const vehicles = await api<{ id: string; name: string }[]>(page, `${base}/api/teams/${team.id}/vehicles`);
    const vehicle = vehicles.find((v) => /Ember/.test(v.name)) ?? vehicles[0]!;
    const designs = await api<{ id: string; name: string }[]>(page, `${base}/api/teams/${team.id}/vehicles/${vehicle.id}/axle-designs`);
    const rear = named(designs, 'Rear baseline');
    const configurations = await api<{ id: string; name: string }[]>(page, `${base}/api/teams/${team.id}/configurations`);
    const configuration = named(configurations, 'Ember baseline');

    const pages: { name: string; path: string; charts: number }[] = [
      { name: 'configuration', path: `/teams/${team.id}/configurations/${configuration.id}`, charts: 2 },
      { name: 'editor', path: `/teams/${team.id}/vehicles/${vehicle.id}/axle-designs/${rear.id}`, charts: 1 },
      { name: 'report', path: `/teams/${team.id}/vehicles/${vehicle.id}/axle-designs/${rear.id}/report`, charts: 2 },
    ];
    for (const p of pages) {
      await page.goto(base + p.path);
      // Wait until at least the expected number of charts has drawn its data, and the page is idle.
      await expect
        .poll(() => page.locator('figure.rw-chart svg.rw-chart-svg :is(path.rw-series-line, rect.rw-bar)').count(), {
          timeout: 60_000,
          message: `charts drawn on the ${p.name} page`,
        })
        .toBeGreaterThanOrEqual(p.charts);
      await page.locator('mat-progress-bar[mode="indeterminate"], .rw-busy-bar').waitFor({ state: 'detached' });
      await page.evaluate(() => document.fonts.ready);

      const charts = await chartTexts(page);
      expect(charts.length, `charts on the ${p.name} page`).toBeGreaterThanOrEqual(p.charts);
      for (const c of charts) {
        expect(c.texts, `text elements of "${c.chart}" on the ${p.name} page`).toBeGreaterThan(3);
        expect(c.overlaps, `overlapping labels in "${c.chart}" on the ${p.name} page`).toEqual([]);
        expect(c.fonts, `fonts of "${c.chart}" on the ${p.name} page`).toEqual([expect.stringContaining('Source Sans 3')]);
      }
      // The shipped font is loaded, not a fallback drawn in its name.
      expect(await page.evaluate(() => document.fonts.check('12px "Source Sans 3"'))).toBe(true);
      await saveScreenshot(page, `look-charts-${p.name}`);
    }
    expect(offsiteRequests(page)).toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
  });
});
