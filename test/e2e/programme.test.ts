/**
 * Browser test of programmes, personal API tokens and the activity log
 * (issue 7, "How it is checked": an instructor's board lists two teams after
 * both accepted). The demo instructor creates a programme and invites both
 * demo teams; each team's owner, in a separate browser context, accepts on
 * the team's Programmes page; Tallowmere's owner creates a write token on
 * the account page, a script (Node's fetch, `Authorization: Bearer`) uses it
 * to add a configuration, and the token is revoked and refused; the
 * instructor's board then lists both teams, a snapshot is taken and its CSV
 * downloaded, and a configuration opened from the board offers her no
 * control that writes. Every page ends without console errors, off-site requests or
 * serious accessibility findings. Needs `npx ng build` first.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { consoleErrors, downloadedText, offsiteRequests, openBrowser, saveScreenshot, seriousA11yViolations, signIn, useE2eApp } from '../support/e2e.js';
import { DEMO_PROGRAMME } from '../../server/db/seed-programme.js';

type Browser = Awaited<ReturnType<typeof openBrowser>>;

const INSTRUCTOR = 'instructor@programme.example';
const TALLOWMERE_OWNER = 'owner@tallowmere.example';
const BRACKENFIELD_OWNER = 'owner@brackenfield.example';
const PROGRAMME = 'Ridge Valley roll-steer study';
const TALLOWMERE = 'Tallowmere University Racing';
const BRACKENFIELD = 'Brackenfield Road Programme';

async function settledPage(browser: Browser): Promise<Page> {
  const page = await browser.newPage();
  await page.emulateMedia({ reducedMotion: 'reduce' });
  return page;
}

/** The first team of the signed-in user, by its address. */
async function teamIdOf(page: Page, slug: string): Promise<string> {
  return page.evaluate(async (s) => {
    const r = await fetch('/api/teams');
    const teams = (await r.json()) as { id: string; slug: string }[];
    return teams.find((t) => t.slug === s)!.id;
  }, slug);
}

/** An owner accepts the programme on the team's Programmes page. */
async function acceptAsOwner(page: Page, teamName: string): Promise<void> {
  await page.getByRole('navigation', { name: 'Team sections' }).getByRole('link', { name: 'Programmes' }).click();
  await page.getByRole('heading', { name: `Programmes · ${teamName}` }).waitFor();
  await page.getByRole('button', { name: `Accept ${PROGRAMME}` }).click();
  const dialog = page.getByRole('dialog');
  await dialog.getByText('Iris Calder will be able to read').waitFor();
  await dialog.getByRole('button', { name: 'Accept' }).click();
  await page
    .locator('section[aria-labelledby="taking-heading"]')
    .getByText(PROGRAMME)
    .waitFor();
  await page.locator('mat-progress-bar[mode="indeterminate"], .rw-busy-bar').waitFor({ state: 'detached' });
}

describe('programmes, API tokens and the activity log', () => {
  const env = useE2eApp();

  it('an instructor’s board lists two teams after both owners accepted; a token works once and is revoked', async () => {
    // The instructor starts a programme and invites both teams by their address.
    const iris = await settledPage(env.browser);
    await signIn(iris, env.app.baseUrl, INSTRUCTOR);
    await iris.getByRole('navigation', { name: 'Instructor' }).getByRole('link', { name: 'My programmes' }).click();
    await iris.getByRole('heading', { name: 'Programmes', exact: true }).waitFor();
    await iris.getByLabel('Programme name').fill(PROGRAMME);
    await iris.getByRole('button', { name: 'Create programme' }).click();
    await iris.getByRole('heading', { name: PROGRAMME }).waitFor();
    for (const slug of ['tallowmere', 'brackenfield']) {
      await iris.getByLabel('Team address').fill(slug);
      await iris.getByRole('button', { name: 'Invite team' }).click();
      await iris.locator('table.teams').getByRole('cell', { name: slug, exact: true }).waitFor();
    }
    // (A wrong address is refused beside the form: the component spec checks it; here the
    // browser would log the 404 as a console error.)
    await iris.getByText('No team has accepted yet').waitFor();
    expect(await iris.locator('table.teams tbody tr').allInnerTexts()).toEqual([
      expect.stringContaining('Invited, waiting for the owner'),
      expect.stringContaining('Invited, waiting for the owner'),
    ]);

    // Each owner accepts in a separate browser context.
    const ana = await settledPage(env.browser);
    await signIn(ana, env.app.baseUrl, TALLOWMERE_OWNER);
    await acceptAsOwner(ana, TALLOWMERE);
    // The demo programme, accepted by the seed, is listed beside it.
    await ana.locator('section[aria-labelledby="taking-heading"]').getByText(DEMO_PROGRAMME.name).waitFor();
    expect(await seriousA11yViolations(ana)).toEqual([]);
    await saveScreenshot(ana, 'programme-team-accepted');

    const bo = await settledPage(env.browser);
    await signIn(bo, env.app.baseUrl, BRACKENFIELD_OWNER);
    await acceptAsOwner(bo, BRACKENFIELD);
    // Brackenfield has yet to answer the demo programme.
    await bo.getByRole('button', { name: `Accept ${DEMO_PROGRAMME.name}` }).waitFor();

    // Tallowmere's owner creates a write token on the account page; the secret is shown once.
    await ana.getByRole('button', { name: /Account menu$/ }).click();
    await ana.getByRole('menuitem', { name: 'API tokens' }).click();
    await ana.getByRole('heading', { name: 'API tokens' }).waitFor();
    await ana.getByLabel('Token name').fill('Batch study script');
    await ana.getByRole('radio', { name: 'Write (also changes)' }).check();
    await ana.getByRole('button', { name: 'Create token' }).click();
    const secretBox = ana.locator('.secret');
    await secretBox.getByText('This is the only time Rollwise shows it').waitFor();
    const secret = await secretBox.locator('input').inputValue();
    expect(secret).toMatch(/^rw_[A-Za-z0-9_-]{43}$/);
    await secretBox.getByRole('button', { name: 'Copy token' }).click();
    await secretBox.getByRole('button', { name: 'Copied' }).waitFor();
    expect(await seriousA11yViolations(ana)).toEqual([]);
    await saveScreenshot(ana, 'programme-api-token-created');
    await secretBox.getByRole('button', { name: 'I have stored it' }).click();
    await secretBox.waitFor({ state: 'detached' });
    expect(await ana.locator('body').innerText()).not.toContain(secret);

    // A script uses the token: no cookie, no CSRF header.
    const tallowmereId = await teamIdOf(ana, 'tallowmere');
    const bearer = { Authorization: `Bearer ${secret}` };
    const team = `${env.app.baseUrl}/api/teams/${tallowmereId}`;
    const vehicles = (await (await fetch(`${team}/vehicles`, { headers: bearer })).json()) as { id: string; name: string }[];
    const ember = vehicles.find((v) => v.name === 'TUR-26 Ember')!;
    const designs = (await (await fetch(`${team}/vehicles/${ember.id}/axle-designs`, { headers: bearer })).json()) as { id: string; axle: string; name: string }[];
    const created = await fetch(`${team}/configurations`, {
      method: 'POST',
      headers: { ...bearer, 'Content-Type': 'application/json' },
      body: JSON.stringify({
        name: 'Ember, toe link +6 mm',
        vehicleId: ember.id,
        frontDesignId: designs.find((d) => d.name === 'Front baseline')!.id,
        rearDesignId: designs.find((d) => d.name === 'Rear, toe link inner +6 mm')!.id,
        trackProfile: 'smooth-circuit',
      }),
    });
    expect(created.status, await created.clone().text()).toBe(201);

    // Revoked on the account page (after confirming), the token is refused at once.
    await ana.reload();
    const tokenRow = ana.locator('.tokens li').filter({ hasText: 'Batch study script' });
    await tokenRow.filter({ hasText: /last used \w/ }).waitFor(); // a date in the browser's own format (en-US: "Dec 4, 2026, …")
    await tokenRow.getByRole('button', { name: 'Revoke token Batch study script' }).click();
    await ana.getByRole('dialog').getByRole('button', { name: 'Revoke token' }).click();
    await tokenRow.filter({ hasText: /Revoked \w/ }).waitFor(); // a date in the browser's own format
    expect(await tokenRow.getByRole('button').count()).toBe(0);
    const refused = await fetch(`${team}/vehicles`, { headers: bearer });
    expect(refused.status).toBe(401);
    expect(((await refused.json()) as { error: { code: string } }).error.code).toBe('invalid_token');

    // Brackenfield's owner adds a configuration from the app's own origin.
    const brackenfieldId = await teamIdOf(bo, 'brackenfield');
    const status = await bo.evaluate(async (teamId) => {
      const base = `/api/teams/${teamId}`;
      const v = ((await (await fetch(`${base}/vehicles`)).json()) as { id: string; name: string }[]).find((x) => x.name === 'Brackenfield B3 hatchback')!;
      const ds = (await (await fetch(`${base}/vehicles/${v.id}/axle-designs`)).json()) as { id: string; axle: string }[];
      const r = await fetch(`${base}/configurations`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', 'X-Rollwise-Request': '1' },
        body: JSON.stringify({ name: 'B3 baseline', vehicleId: v.id, frontDesignId: ds.find((d) => d.axle === 'front')!.id, rearDesignId: ds.find((d) => d.axle === 'rear')!.id, trackProfile: 'rough-road' }),
      });
      return r.status;
    }, brackenfieldId);
    expect(status).toBe(201);

    // The instructor's board lists both teams, with the safety caution.
    await iris.getByRole('button', { name: 'Refresh board' }).click();
    const groups = iris.locator('rw-board-table tbody.config');
    await groups.nth(1).waitFor({ timeout: 60_000 });
    const names = (await iris.locator('rw-board-table .config-name').allInnerTexts()).map((n) => n.replace(/\s+/g, ' ').trim());
    // Sorted by team, then configuration; the demo teams may hold other configurations too.
    expect(names).toContain(`B3 baseline ${BRACKENFIELD}`);
    expect(names).toContain(`Ember, toe link +6 mm ${TALLOWMERE}`);
    expect(names.map((n) => (n.endsWith(TALLOWMERE) ? 'T' : n.endsWith(BRACKENFIELD) ? 'B' : '?')).join('')).toMatch(/^B+T+$/);
    for (const name of ['B3 baseline', 'Ember, toe link +6 mm']) {
      const group = groups.filter({ has: iris.getByText(name, { exact: true }) });
      expect(await group.count()).toBe(1);
      const latest = await group.locator('tr.latest td.num').allInnerTexts();
      expect(latest).toHaveLength(6);
      for (const cell of latest) expect(cell).toMatch(/^−?\d+\.\d+$/);
      expect(await group.locator('.status').innerText()).toBe('Draft');
      expect(await group.locator('tr.approved').innerText()).toContain('No approval yet');
    }
    await iris.getByRole('note').filter({ hasText: 'Design estimates from an idealised rigid-link model' }).waitFor();
    // Nothing on the board edits a team's data.
    expect(await iris.locator('rw-board-table').locator('button, input, select, textarea').count()).toBe(0);
    await iris.locator('table.teams').getByText('Accepted').nth(1).waitFor();
    expect(await seriousA11yViolations(iris)).toEqual([]);
    await saveScreenshot(iris, 'programme-board');

    // A snapshot, listed, viewed and downloaded as CSV.
    await iris.getByLabel('Label (optional)').fill('Deadline week 6');
    await iris.getByRole('button', { name: 'Take snapshot' }).click();
    const snapshotLink = iris.locator('.snapshots').getByRole('link', { name: 'Deadline week 6', exact: true });
    await snapshotLink.waitFor({ timeout: 60_000 });
    const [download] = await Promise.all([
      iris.waitForEvent('download'),
      iris.getByRole('link', { name: 'Download CSV of Deadline week 6' }).click(),
    ]);
    const csv = await downloadedText(download);
    const lines = csv.trim().split(/\r?\n/);
    expect(lines[0]).toMatch(/^team,configuration,status,latest_revision,latest_rollSteerFront,/);
    // One line per configuration on the board when the snapshot was taken.
    expect(lines).toHaveLength(names.length + 1);
    expect(new Set(lines.slice(1).map((l) => l.split(',')[0]))).toEqual(new Set([BRACKENFIELD, TALLOWMERE]));
    expect(lines.some((l) => l.startsWith(`${TALLOWMERE},"Ember, toe link +6 mm",draft,1,`))).toBe(true);
    await snapshotLink.click();
    await iris.waitForURL((url) => /^\/programmes\/[^/]+\/snapshots\/[^/]+$/.test(url.pathname));
    await iris.getByRole('heading', { name: 'Deadline week 6' }).waitFor();
    await iris.locator('rw-board-table tbody.config').nth(1).waitFor();
    expect(await seriousA11yViolations(iris)).toEqual([]);
    await saveScreenshot(iris, 'programme-snapshot');

    // From the board the instructor opens a configuration in its team: read only, no step,
    // revision, archive or comment controls (she holds no permission in the team).
    await iris.locator('rw-board-table a.config-link', { hasText: 'Ember, toe link +6 mm' }).click();
    await iris.getByRole('heading', { level: 1, name: 'Ember, toe link +6 mm' }).waitFor();
    // The page and its results have loaded (every loading bar gone).
    await expect.poll(() => iris.locator('mat-progress-bar[mode="indeterminate"], .rw-busy-bar').count(), { timeout: 60_000 }).toBe(0);
    expect(await iris.locator('button[data-action], textarea, .rw-comment-on').count()).toBe(0);
    for (const name of ['Make a new revision', 'Archive configuration', 'Comment on the budget']) {
      expect(await iris.getByRole('button', { name }).count(), name).toBe(0);
    }
    await saveScreenshot(iris, 'programme-instructor-reads-configuration');

    // The team's activity log shows the script's change, in the browser's (named) time zone:
    // this browser is put in Tokyo (UTC+9 all year, no daylight saving; from memory).
    const cdp = await ana.context().newCDPSession(ana);
    await cdp.send('Emulation.setTimezoneOverride', { timezoneId: 'Asia/Tokyo' });
    await ana.getByRole('navigation', { name: 'Team sections' }).getByRole('link', { name: 'Activity' }).click();
    await ana.getByRole('heading', { name: `Activity · ${TALLOWMERE}` }).waitFor();
    const first = ana.locator('table.activity tbody tr').first();
    await first.getByText('Ana Ferreira').waitFor();
    expect(await first.innerText()).toContain('configuration.create');
    expect(await ana.locator('table.activity thead th').first().innerText()).toBe('When (Asia/Tokyo)');
    const utc = new Date((await first.locator('time').getAttribute('datetime'))!);
    // The hour as shown, in the browser's own format: 24-hour ("…, 19:05:12") or 12-hour ("…, 07:05:12 PM").
    const shown = /(\d{1,2}):\d\d:\d\d(?:\s*([AP])\.?\s*M\.?)?$/i.exec((await first.locator('time').innerText()).trim())!;
    const shownHour = shown[2] ? (Number(shown[1]) % 12) + (shown[2].toUpperCase() === 'P' ? 12 : 0) : Number(shown[1]);
    expect(shownHour).toBe((utc.getUTCHours() + 9) % 24);
    const [log] = await Promise.all([ana.waitForEvent('download'), ana.getByRole('link', { name: 'Download CSV' }).click()]);
    const logCsv = await downloadedText(log);
    expect(logCsv.split(/\r?\n/)[0]).toBe('at_utc,at_local (Asia/Tokyo),actor,action,subject_type,subject_id,summary');
    expect(logCsv).toContain('Created configuration ""Ember, toe link +6 mm""');
    expect(await seriousA11yViolations(ana)).toEqual([]);
    await saveScreenshot(ana, 'programme-activity');

    for (const page of [iris, ana, bo]) {
      expect(consoleErrors(page)).toEqual([]);
      expect(offsiteRequests(page)).toEqual([]);
    }
  });
});
