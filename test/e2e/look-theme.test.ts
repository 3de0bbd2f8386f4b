/**
 * Browser test of the look (issue 15 §5): the caution palette is our own and
 * readable (each text colour on its background at least 4.5:1, WCAG 2.x
 * AA for body text), every caution level carries its word and its own icon
 * (never colour alone), and each person lands on the page their role
 * starts from (an instructor on the programmes, anyone else on their last
 * team). Needs `npx ng build` first.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { consoleErrors, offsiteRequests, saveScreenshot, signIn, useE2eApp } from '../support/e2e.js';

/** The colour a CSS colour expression resolves to on this page, as [r, g, b] in 0–255. */
async function resolveColour(page: Page, expression: string): Promise<[number, number, number]> {
  return page.evaluate((expr) => {
    const probe = document.createElement('span');
    probe.style.color = expr;
    document.body.append(probe);
    // Canvas normalises any colour syntax (oklch, light-dark results, hex) to sRGB bytes.
    const ctx = document.createElement('canvas').getContext('2d')!;
    ctx.fillStyle = getComputedStyle(probe).color;
    ctx.fillRect(0, 0, 1, 1);
    const [r, g, b] = ctx.getImageData(0, 0, 1, 1).data;
    probe.remove();
    return [r!, g!, b!] as [number, number, number];
  }, expression);
}

/** WCAG 2.x relative luminance and contrast ratio (the formula of WCAG 2.1 §1.4.3's definitions). */
function luminance([r, g, b]: [number, number, number]): number {
  const lin = (c: number) => {
    const s = c / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

function contrast(a: [number, number, number], b: [number, number, number]): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x) as [number, number];
  return (hi + 0.05) / (lo + 0.05);
}

describe('The look in Chromium', () => {
  const env = useE2eApp();

  it('caution colours are our own, in one place, readable at 4.5:1, and every level has its word and icon', async () => {
    const page = await env.browser.newPage();
    await signIn(page, env.app.baseUrl, 'engineer@tallowmere.example');
    const colour = (name: string) => resolveColour(page, `var(${name})`);

    const pairs: [string, string][] = [
      ['--rw-on-caution-critical-container', '--rw-caution-critical-container'],
      ['--rw-on-caution-warning-container', '--rw-caution-warning-container'],
      ['--rw-on-caution-note-container', '--rw-caution-note-container'],
      ['--rw-caution-critical', '--mat-sys-surface'],
      ['--rw-caution-warning', '--mat-sys-surface'],
      ['--rw-caution-note', '--mat-sys-surface'],
    ];
    for (const [text, background] of pairs) {
      const ratio = contrast(await colour(text), await colour(background));
      expect(ratio, `${text} on ${background}`).toBeGreaterThanOrEqual(4.5);
    }
    // Not the design system's stock error colours (Material 3's baseline error #ba1a1a on #ffdad6, from its published baseline scheme).
    expect(await colour('--rw-caution-critical')).not.toEqual([0xba, 0x1a, 0x1a]);
    expect(await colour('--rw-caution-critical-container')).not.toEqual([0xff, 0xda, 0xd6]);
    // The theme's error token is the same colour as our critical caution (one palette).
    expect(await colour('--mat-sys-error')).toEqual(await colour('--rw-caution-critical'));
    // Critical and warning differ in lightness, not only in hue (greyscale print, colour-blind readers).
    const lightness = async (name: string) => luminance(await colour(name));
    expect(Math.abs((await lightness('--rw-caution-critical-container')) - (await lightness('--rw-caution-warning-container')))).toBeGreaterThan(0.02);

    // The configuration page's cautions: each shows its level in words, with the level's own icon before it.
    const teams = (await (await page.request.get(`${env.app.baseUrl}/api/teams`)).json()) as { id: string; name: string }[];
    const team = teams.find((t) => t.name === 'Tallowmere University Racing')!;
    const configurations = (await (await page.request.get(`${env.app.baseUrl}/api/teams/${team.id}/configurations`)).json()) as { id: string; name: string }[];
    const ember = configurations.find((c) => c.name === 'Ember baseline')!;
    await page.goto(`${env.app.baseUrl}/teams/${team.id}/configurations/${ember.id}`);
    await page.locator('.rw-axle-cautions[data-axle="rear"]').waitFor({ timeout: 60_000 });
    const levels = await page.locator('.rw-caution').evaluateAll((items) =>
      items.map((li) => {
        const level = li.querySelector('.rw-caution-level')!;
        const before = getComputedStyle(level, '::before');
        return { className: li.className, word: level.textContent.trim(), icon: before.content, font: before.fontFamily };
      }),
    );
    expect(levels.length).toBeGreaterThan(0);
    const iconOf: Record<string, string> = { info: 'info', warning: 'warning', critical: 'report' };
    const wordOf: Record<string, string> = { info: 'Note', warning: 'Warning', critical: 'Critical' };
    for (const l of levels) {
      const level = /rw-caution-(info|warning|critical)/.exec(l.className)![1]!;
      expect(l.word).toBe(wordOf[level]);
      expect(l.icon).toContain(`"${iconOf[level]}"`);
      expect(l.font).toContain('Material Symbols Outlined');
    }
    await saveScreenshot(page, 'look-theme-cautions');
    expect(offsiteRequests(page)).toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
  });

  it('an instructor lands on the programmes; a team member lands on the team they last worked in', async () => {
    const instructor = await env.browser.newPage();
    await signIn(instructor, env.app.baseUrl, 'instructor@programme.example');
    expect(new URL(instructor.url()).pathname).toBe('/programmes');
    await instructor.goto(env.app.baseUrl + '/');
    await instructor.waitForURL((u) => u.pathname === '/programmes');

    // Eli is in two teams: after working in the second one, the start page is that team.
    const engineer = await env.browser.newPage();
    await signIn(engineer, env.app.baseUrl, 'engineer@tallowmere.example');
    const teams = (await (await engineer.request.get(`${env.app.baseUrl}/api/teams`)).json()) as { id: string; name: string }[];
    const first = new URL(engineer.url()).pathname;
    const other = teams.find((t) => `/teams/${t.id}` !== first)!;
    expect(first).toMatch(/^\/teams\/[^/]+$/);
    await engineer.goto(`${env.app.baseUrl}/teams/${other.id}`);
    await engineer.getByRole('heading', { level: 1 }).first().waitFor();
    await engineer.goto(env.app.baseUrl + '/');
    await engineer.waitForURL((u) => u.pathname === `/teams/${other.id}`);
    for (const p of [instructor, engineer]) {
      expect(offsiteRequests(p)).toEqual([]);
      expect(consoleErrors(p)).toEqual([]);
    }
  });
});
