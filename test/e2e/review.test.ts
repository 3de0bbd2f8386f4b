/**
 * Browser test of configurations under review (issue 7, "How it is
 * checked"): the demo designer makes a configuration of TUR-26 Ember and
 * submits it; the reviewer, in another browser context, comments on the
 * understeer budget and requests changes; the designer revises it (the rear
 * design with the toe link lowered) and submits again; the reviewer signs it
 * off, which the gate refuses until the Critical rear roll oversteer has a
 * written reason, releases it, and sees the approval snapshot beside its recompute; the
 * reviewer and the designer each find their review mails in their own
 * development mailbox, and the team owner finds none of them. Every page
 * ends without console errors or requests leaving 127.0.0.1, and passes the
 * harness's accessibility check. Needs `npx ng build` first.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { chooseOption, consoleErrors, copyOfDemoDesign, offsiteRequests, openBrowser, saveScreenshot, seriousA11yViolations, signIn, useE2eApp, waitForMail } from '../support/e2e.js';

type Browser = Awaited<ReturnType<typeof openBrowser>>;

const NAME = 'Ember review walk';
/** The designer's new rear design: the toe link's inner end 6 mm lower, which steers the rear axle out of the turn as the body rolls. */
const LOWERED = 'Rear, toe link inner 6 mm lower';
const COMMENT = 'The car pushes mid-corner on the bumpy tracks; the rear roll-steer term of the budget could free it.';

/** Waits until the results and the cautions of the configuration page are in. */
async function settled(page: Page): Promise<void> {
  await page.getByTestId('key-figures').waitFor({ timeout: 60_000 });
  await page.locator('.rw-axle-cautions[data-axle="rear"]').waitFor({ timeout: 60_000 });
  await page.locator('mat-progress-bar[mode="indeterminate"], .rw-busy-bar').waitFor({ state: 'detached' });
}

async function status(page: Page): Promise<string> {
  return (await page.locator('rw-status-chip .rw-status-label').first().innerText()).trim();
}

async function expectStatus(page: Page, label: string): Promise<void> {
  await page.locator('rw-status-chip').first().getByText(label, { exact: true }).waitFor();
  expect(await status(page)).toBe(label);
}

function clean(page: Page): void {
  expect(offsiteRequests(page)).toEqual([]);
  expect(consoleErrors(page)).toEqual([]);
}

describe('Configuration review in Chromium', () => {
  const env = useE2eApp();

  it('designer submits, reviewer comments on the budget and requests changes, designer revises, reviewer approves and releases, each reads their own mail', async () => {
    // The designer makes the configuration from the team dashboard and submits it.
    const designer = await env.browser.newPage();
    await signIn(designer, env.app.baseUrl, 'designer@tallowmere.example');
    await copyOfDemoDesign(designer, env.app.baseUrl, { team: 'Tallowmere University Racing', vehicle: 'TUR-26 Ember', design: 'Rear baseline' }, LOWERED, (c) => {
      c.points['tieRodInner']![2] -= 6;
    });
    await designer.goto(env.app.baseUrl + '/teams');
    await designer.getByRole('link', { name: /Tallowmere/ }).first().click();
    await designer.getByRole('link', { name: 'Configurations and review' }).click();
    await designer.getByRole('heading', { name: /^Configurations/ }).waitFor();
    // The demo configurations are listed with their state.
    await designer.getByRole('link', { name: 'Ember baseline' }).waitFor();
    expect(await designer.getByTestId('configurations').innerText()).toContain('In review');
    const teamId = new URL(designer.url()).pathname.split('/')[2]!;

    await designer.getByRole('button', { name: 'New configuration' }).click();
    await designer.getByLabel('Name', { exact: true }).fill(NAME);
    await chooseOption(designer, 'Vehicle', 'TUR-26 Ember');
    await chooseOption(designer, 'Front axle design', 'Front baseline');
    await chooseOption(designer, 'Rear axle design', 'Rear baseline');
    await chooseOption(designer, 'Track profile', /^Bumpy circuit/);
    await designer.getByLabel('Message (optional)').fill('Baseline on the bumpy profile');
    await designer.getByRole('button', { name: 'Create configuration' }).click();
    await designer.waitForURL((url) => /\/configurations\/[0-9a-f-]{36}$/.test(url.pathname));
    const configurationPath = new URL(designer.url()).pathname;
    await designer.getByRole('heading', { name: NAME }).waitFor();
    await settled(designer);
    await expectStatus(designer, 'Draft');
    expect(await designer.getByTestId('inputs').innerText()).toContain('Bumpy circuit');
    // The designer may submit, never decide.
    expect(await designer.getByRole('button', { name: 'Sign off' }).count()).toBe(0);
    await designer.getByLabel(/Message with the review step/).fill('Please look at the rear');
    await designer.getByRole('button', { name: 'Submit for review' }).click();
    await expectStatus(designer, 'In review');
    expect(await seriousA11yViolations(designer)).toEqual([]);
    await saveScreenshot(designer, 'review-1-designer-submitted');

    // The reviewer, in another context, comments on the budget and requests changes.
    const reviewer = await env.browser.newPage();
    await signIn(reviewer, env.app.baseUrl, 'reviewer@tallowmere.example');
    await reviewer.goto(env.app.baseUrl + configurationPath);
    await settled(reviewer);
    await expectStatus(reviewer, 'In review');
    expect(await reviewer.getByRole('button', { name: 'Submit for review' }).count()).toBe(0);
    await reviewer.getByRole('button', { name: 'Comment on the budget' }).click();
    const commentBox = reviewer.getByLabel('Comment', { exact: true });
    await expect.poll(() => commentBox.evaluate((el) => el === document.activeElement)).toBe(true);
    expect((await reviewer.getByRole('combobox', { name: /^Points at/ }).innerText()).trim()).toBe('Understeer budget');
    await reviewer.keyboard.type(COMMENT);
    await reviewer.getByRole('button', { name: 'Post comment' }).click();
    const thread = reviewer.locator('.rw-thread').filter({ hasText: COMMENT });
    await thread.waitFor();
    expect(await thread.innerText()).toContain('On: Understeer budget');
    // A change request needs words; with them it goes through.
    await reviewer.getByRole('button', { name: 'Return for rework' }).click();
    await reviewer.getByText('Say what needs rework').waitFor();
    await reviewer.getByLabel(/Message with the review step/).fill('Lower the rear toe link');
    await reviewer.getByRole('button', { name: 'Return for rework' }).click();
    await expectStatus(reviewer, 'Returned for rework');
    expect(await seriousA11yViolations(reviewer)).toEqual([]);
    await saveScreenshot(reviewer, 'review-2-reviewer-changes-requested');

    // The designer reads the comment, replies, and makes a new revision with the raised toe link.
    await designer.reload();
    await settled(designer);
    await expectStatus(designer, 'Returned for rework');
    const designerThread = designer.locator('.rw-thread').filter({ hasText: COMMENT });
    await designerThread.getByLabel('Reply', { exact: true }).fill('Lowered the rear toe link inner point by 6 mm.');
    await designerThread.getByRole('button', { name: 'Reply' }).click();
    await designerThread.getByText('Lowered the rear toe link inner point by 6 mm.', { exact: true }).waitFor();
    await designer.getByRole('button', { name: 'Make a new revision' }).click();
    await designer.getByRole('combobox', { name: /^Rear axle design/ }).click();
    await designer.getByRole('option', { name: `${LOWERED} (now revision 1)` }).click();
    await designer.getByLabel('Message (what changed)').fill('Rear toe link inner 6 mm lower');
    await designer.getByRole('button', { name: 'Save new revision' }).click();
    await designer.getByText('Saved as revision 2; the configuration is a draft again.').waitFor();
    await expectStatus(designer, 'Draft');
    await settled(designer);
    expect(await designer.getByTestId('inputs').innerText()).toContain(`${LOWERED}, revision 1`);
    // Compare the first revision with the new one: the toe link's inner height changed, and the roll-steer term with it.
    await designer.getByRole('button', { name: 'Compare revision 1 with the current one' }).click();
    const comparison = designer.getByTestId('comparison');
    await comparison.waitFor();
    expect(await comparison.innerText()).toContain('Rear corner · tie rod inner · z');
    expect(await comparison.innerText()).not.toMatch(/[a-z]+\.[a-z]+[A-Z]/);
    expect(await comparison.innerText()).toContain('Understeer-gradient change from roll steer');
    await designer.getByRole('button', { name: 'Submit for review' }).click();
    await expectStatus(designer, 'In review');
    clean(designer);

    // The reviewer approves the new revision and releases it; the snapshot agrees with a recompute.
    await reviewer.reload();
    await settled(reviewer);
    await expectStatus(reviewer, 'In review');
    await reviewer.getByLabel(/Message with the review step/).fill('Rear roll steer as asked');
    await reviewer.getByRole('button', { name: 'Sign off' }).click();
    // The sign-off gate: a written reason for each Critical caution the server measured, in the dialog. The lowered
    // rear toe link is rear roll oversteer (common practice: it lowers stability as cornering builds), a Critical caution.
    const gate = reviewer.getByRole('dialog');
    await gate.getByRole('heading', { name: /^Sign off / }).waitFor();
    await gate.locator('.rw-gate-item[data-axle="rear"][data-code="rear-roll-oversteer"]').waitFor();
    // Refused while a reason is missing: the dialog's Sign off stays inactive.
    expect(await gate.getByRole('button', { name: 'Sign off' }).isDisabled()).toBe(true);
    const reasons = gate.getByRole('textbox');
    for (let i = 0; i < (await reasons.count()); i++) await reasons.nth(i).fill('Accepted for the bumpy tracks; step-steer check on the skid pad before release');
    await gate.getByRole('button', { name: 'Sign off' }).click();
    await expectStatus(reviewer, 'Signed off');
    const approval = reviewer.getByTestId('approval');
    await approval.getByText('gives the same figures').waitFor();
    expect(await approval.innerText()).toContain('Revision 2 signed off by Ravi Osei');
    await reviewer.getByRole('button', { name: 'Release to build' }).click();
    await expectStatus(reviewer, 'Released to build');
    await reviewer.locator('.rw-history li').filter({ hasText: 'Signed off → Released to build' }).waitFor();
    await reviewer.locator('.rw-thread').filter({ hasText: COMMENT }).getByRole('button', { name: 'Close remark' }).click();
    await reviewer.locator('.rw-thread').filter({ hasText: COMMENT }).locator('.rw-thread-state').getByText('Closed').waitFor();
    expect(await seriousA11yViolations(reviewer)).toEqual([]);
    await saveScreenshot(reviewer, 'review-3-reviewer-released');
    clean(reviewer);

    // Each reader finds their own review mail in their own development mailbox, reached from the account menu.
    const openOwnMail = async (page: Page, who: string) => {
      await page.getByRole('button', { name: new RegExp(`^Signed in as ${who}`) }).click();
      await page.getByRole('menuitem', { name: 'Dev mail' }).click();
      await page.waitForURL((url) => url.pathname === '/dev-mail');
      await page.getByRole('heading', { name: 'Your development mail' }).waitFor();
    };
    await openOwnMail(reviewer, 'Ravi Osei');
    const asked = await waitForMail(reviewer, `Review requested: ${NAME} (revision 1)`, 'reviewer@tallowmere.example');
    expect(await asked.innerText()).toContain('Please look at the rear');
    await waitForMail(reviewer, `Review requested: ${NAME} (revision 2)`, 'reviewer@tallowmere.example');
    await openOwnMail(designer, 'Dana Quist');
    await waitForMail(designer, `${NAME} (revision 1): returned for rework`, 'designer@tallowmere.example');
    const approved = await waitForMail(designer, `${NAME} (revision 2): signed off`, 'designer@tallowmere.example');
    // The mailed link opens the configuration page on this server.
    expect(await approved.getByRole('link').first().getAttribute('href')).toBe(env.app.baseUrl + configurationPath);
    // Nobody reads another's mail: the designer's mailbox holds none of the reviewer's, and the owner's none of either.
    expect(await designer.locator('li.mail').filter({ hasText: 'Review requested' }).count()).toBe(0);
    expect(await seriousA11yViolations(designer)).toEqual([]);
    await saveScreenshot(designer, 'review-4-designer-dev-mail');
    const owner = await env.browser.newPage();
    await signIn(owner, env.app.baseUrl, 'owner@tallowmere.example');
    await owner.goto(`${env.app.baseUrl}/dev-mail`);
    await owner.getByRole('heading', { name: 'Your development mail' }).waitFor();
    await owner.locator('li.mail').or(owner.getByText('No mail captured yet.')).first().waitFor();
    expect(await owner.locator('li.mail').filter({ hasText: NAME }).count()).toBe(0);
    for (const page of [reviewer, designer, owner]) clean(page);
  });
});
