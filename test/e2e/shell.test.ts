/**
 * Browser test of the Angular shell against the real server and a fresh,
 * seeded database (issue 2, "How it is checked"): sign in as the demo
 * engineer, see the team's vehicles, switch team, sign out. The harness
 * blocks and records any request leaving 127.0.0.1 (proved first, with two
 * planted requests) and every console error; each page here must end with
 * none of either. Needs `npx ng build` first.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { consoleErrors, offsiteRequests, openBrowser, saveScreenshot, seriousA11yViolations, signIn, useE2eApp } from '../support/e2e.js';

type Browser = Awaited<ReturnType<typeof openBrowser>>;

const TALLOWMERE = 'Tallowmere University Racing';
const BRACKENFIELD = 'Brackenfield Road Programme';

/** A guarded page with animations off (Material honours reduced motion), so checks see settled states. */
async function newSettledPage(browser: Browser): Promise<Page> {
  const page = await browser.newPage();
  await page.emulateMedia({ reducedMotion: 'reduce' });
  return page;
}

async function switchTeam(page: Page, teamName: string): Promise<void> {
  await page.getByRole('button', { name: /Switch team$/ }).click();
  await page.getByRole('menuitemradio', { name: teamName }).click();
  await page.getByRole('heading', { name: `Vehicles · ${teamName}` }).waitFor();
}

interface Focused {
  tag: string;
  label: string;
  text: string;
  control: string;
  /** An outline ring, Material's focus ring, or (inputs) the form field's focused border. */
  focusShown: boolean;
}

/** Presses Tab until the focused element passes `wanted` (keyboard-only use). */
async function tabUntil(page: Page, wanted: (el: Focused) => boolean, maxTabs = 40): Promise<Focused> {
  for (let i = 0; i < maxTabs; i++) {
    await page.keyboard.press('Tab');
    const focused = await page.evaluate((): Focused => {
      const el = document.activeElement as HTMLElement;
      return {
        tag: el.tagName,
        label: el.getAttribute('aria-label') ?? '',
        text: el.textContent?.trim() ?? '',
        control: el.getAttribute('formcontrolname') ?? '',
        focusShown:
          getComputedStyle(el).outlineStyle !== 'none' ||
          // Material's strong focus indicator: a ring drawn by a child's ::before
          [el, el.querySelector(':scope > .mat-focus-indicator')].some((node) => {
            if (!node?.classList.contains('mat-focus-indicator')) return false;
            const ring = getComputedStyle(node, '::before');
            return ring.display !== 'none' && ring.borderStyle === 'solid';
          }) ||
          el.closest('mat-form-field')?.classList.contains('mat-focused') === true,
      };
    });
    if (wanted(focused)) return focused;
  }
  throw new Error(`Tab never reached the wanted element in ${maxTabs} presses`);
}

/** Presses ArrowDown in an open menu until the focused item reads `text`. */
async function arrowTo(page: Page, text: string, maxPresses = 10): Promise<void> {
  for (let i = 0; i < maxPresses; i++) {
    const current = await page.evaluate(() => document.activeElement?.textContent?.trim() ?? '');
    if (current.includes(text)) return;
    await page.keyboard.press('ArrowDown');
  }
  throw new Error(`No menu item "${text}" reached with the arrow keys`);
}

function vehicleLinks(page: Page): Promise<string[]> {
  return page.locator('a.vehicle-link').allTextContents().then((names) => names.map((n) => n.trim()).sort());
}

describe('Angular shell in Chromium', () => {
  const env = useE2eApp();

  it('the harness refuses and records a request that leaves 127.0.0.1 (a host name and an address)', async () => {
    // The checks every page here ends with (no request left 127.0.0.1, no console error) are only as good as this.
    const page = await env.browser.newPage();
    const tryBoth = () =>
      page.evaluate(async () => {
        const tryFetch = (url: string) => fetch(url, { mode: 'no-cors' }).then(() => 'answered', () => 'refused');
        return [await tryFetch('http://offsite.example/font.woff2'), await tryFetch('http://203.0.113.7/pixel.png')];
      });
    // A page without a content security policy: the requests reach the network and are refused there.
    await page.goto('about:blank');
    expect(await tryBoth()).toEqual(['refused', 'refused']);
    await expect.poll(() => offsiteRequests(page)).toEqual(['http://offsite.example/font.woff2', 'http://203.0.113.7/pixel.png']);
    // The app's own pages refuse them before the network (their policy allows 127.0.0.1 only): a console error each.
    await page.goto(`${env.app.baseUrl}/sign-in`);
    expect(await tryBoth()).toEqual(['refused', 'refused']);
    const refusedByPolicy = (host: string) => consoleErrors(page).some((e) => e.includes('Content Security Policy') && e.includes(host));
    await expect.poll(() => ['offsite.example', '203.0.113.7'].filter(refusedByPolicy)).toEqual(['offsite.example', '203.0.113.7']);
  });

  it('signs the demo engineer in, shows each team’s vehicles across a team switch, and signs out', async () => {
    const page = await newSettledPage(env.browser);

    // A first visit lands on the sign-in page, which meets WCAG 2.2 AA.
    await page.goto(env.app.baseUrl + '/');
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    expect(await seriousA11yViolations(page)).toEqual([]);

    await signIn(page, env.app.baseUrl, 'engineer@tallowmere.example');
    await page.getByRole('heading', { name: /^Vehicles/ }).waitFor();
    await expect(page.getByRole('button', { name: /Eli Marsh/ }).isVisible()).resolves.toBe(true);

    // Eli works in two teams; choose the student team first.
    await switchTeam(page, TALLOWMERE);
    await page.getByRole('link', { name: 'TUR-26 Ember' }).waitFor();
    expect(await vehicleLinks(page)).toEqual(['TUR-25 Cinder', 'TUR-26 Ember']);
    // An engineer holds vehicle:manage: the commands are there; members:manage is not.
    await expect(page.getByRole('button', { name: 'New vehicle' }).isVisible()).resolves.toBe(true);
    await expect(page.getByRole('button', { name: 'Rename TUR-26 Ember' }).isVisible()).resolves.toBe(true);
    await expect(page.getByRole('link', { name: 'Members' }).count()).resolves.toBe(0);
    expect(await seriousA11yViolations(page)).toEqual([]);
    await saveScreenshot(page, 'shell-dashboard-tallowmere');

    // The vehicle rows lead to the vehicle screens.
    const emberHref = await page.getByRole('link', { name: 'TUR-26 Ember' }).getAttribute('href');
    expect(emberHref).toMatch(/^\/teams\/[^/]+\/vehicles\/[^/]+$/);

    await switchTeam(page, BRACKENFIELD);
    await page.getByRole('link', { name: 'Brackenfield B3 hatchback' }).waitFor();
    expect(await vehicleLinks(page)).toEqual(['Brackenfield B3 hatchback', 'Brackenfield B5 estate']);
    await saveScreenshot(page, 'shell-dashboard-brackenfield');

    // The chosen team is remembered across a reload.
    await page.goto(env.app.baseUrl + '/');
    await page.getByRole('heading', { name: `Vehicles · ${BRACKENFIELD}` }).waitFor();

    await page.getByRole('button', { name: /Account menu$/ }).click();
    await page.getByRole('menuitem', { name: 'Sign out' }).click();
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');

    // Signed out, a team address leads back to sign-in.
    await page.goto(env.app.baseUrl + '/teams');
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    expect(new URL(page.url()).searchParams.get('returnUrl')).toBe('/teams');

    expect(offsiteRequests(page)).toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
  });

  it('shows a viewer no vehicle commands and an owner the members page', async () => {
    const viewer = await newSettledPage(env.browser);
    await signIn(viewer, env.app.baseUrl, 'viewer@tallowmere.example');
    await viewer.getByRole('link', { name: 'TUR-26 Ember' }).waitFor();
    await expect(viewer.getByRole('button', { name: 'New vehicle' }).count()).resolves.toBe(0);
    await expect(viewer.getByRole('button', { name: /^(Rename|Archive) / }).count()).resolves.toBe(0);
    await expect(viewer.getByRole('link', { name: 'Members' }).count()).resolves.toBe(0);
    expect(offsiteRequests(viewer)).toEqual([]);
    expect(consoleErrors(viewer)).toEqual([]);

    const owner = await newSettledPage(env.browser);
    await signIn(owner, env.app.baseUrl, 'owner@tallowmere.example');
    await owner.getByRole('link', { name: 'Members' }).click();
    await owner.getByRole('heading', { name: `Members · ${TALLOWMERE}` }).waitFor();
    await owner.getByText('Vera Nyman').waitFor();
    expect(await seriousA11yViolations(owner)).toEqual([]);
    await saveScreenshot(owner, 'shell-members');
    expect(offsiteRequests(owner)).toEqual([]);
    expect(consoleErrors(owner)).toEqual([]);
  });

  it('can be used from the keyboard alone, with the focus always visible', async () => {
    const page = await newSettledPage(env.browser);
    await page.goto(env.app.baseUrl + '/sign-in');
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();

    const email = await tabUntil(page, (el) => el.control === 'email');
    expect(email.focusShown).toBe(true);
    await page.keyboard.type('engineer@tallowmere.example');
    await tabUntil(page, (el) => el.control === 'password');
    await page.keyboard.type('demo-pass-2026');
    await page.keyboard.press('Enter');
    await page.getByRole('heading', { name: /^Vehicles · / }).waitFor();

    const switcher = await tabUntil(page, (el) => el.label.endsWith('Switch team'));
    expect(switcher.focusShown).toBe(true);
    await page.keyboard.press('Enter');
    await page.getByRole('menu', { name: 'Switch team' }).waitFor();
    await arrowTo(page, TALLOWMERE);
    await page.keyboard.press('Enter');
    await page.getByRole('link', { name: 'TUR-26 Ember' }).waitFor();

    // A vehicle command opens its dialog and Escape closes it again.
    const archive = await tabUntil(page, (el) => el.label === 'Archive TUR-25 Cinder');
    expect(archive.focusShown).toBe(true);
    await page.keyboard.press('Enter');
    await page.getByRole('dialog', { name: 'Archive vehicle?' }).waitFor();
    await page.keyboard.press('Escape');
    await page.getByRole('dialog').waitFor({ state: 'detached' });
    expect(await vehicleLinks(page)).toEqual(['TUR-25 Cinder', 'TUR-26 Ember']);

    await tabUntil(page, (el) => el.label.endsWith('Account menu'));
    await page.keyboard.press('Enter');
    await page.getByRole('menu', { name: 'Account' }).waitFor();
    await arrowTo(page, 'Sign out');
    await page.keyboard.press('Enter');
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();

    expect(offsiteRequests(page)).toEqual([]);
    expect(consoleErrors(page)).toEqual([]);
  });
});
