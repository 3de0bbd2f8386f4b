/**
 * Browser test of the links Rollwise mails (issue 7, "E-mail"; issue 12 §2):
 * a demo user asks for a password reset on the sign-in page; the team owner,
 * in another browser context, does not see that mail in their development
 * mailbox; the user, still signed in on another device (a third context),
 * finds it in their own mailbox; the link opened back where the reset was
 * asked for sets the new password, and the user signs in with it.
 * The harness runs the local fake SMTP server and fails on any request that
 * leaves 127.0.0.1; every page must end without console errors.
 * Needs `npx ng build` first.
 */
import { describe, expect, it } from 'vitest';
import { consoleErrors, offsiteRequests, openBrowser, saveScreenshot, signIn, useE2eApp, waitForMail } from '../support/e2e.js';

type Browser = Awaited<ReturnType<typeof openBrowser>>;

const DESIGNER = 'designer@tallowmere.example';
const OWNER = 'owner@tallowmere.example';
const NEW_PASSWORD = 'quist-fresh-pass-27';
const SAME_ANSWER = /^If an account uses \S+, a link to choose a new password is on its way\./;


describe('account links in mail', () => {
  const env = useE2eApp();

  it('resets a password through the mailed link, found in the addressee’s own development mailbox and nobody else’s', async () => {
    // The demo designer forgot the password: the sign-in page leads to the request.
    const user = await env.browser.newPage();
    await user.goto(`${env.app.baseUrl}/sign-in`);
    await user.getByLabel('E-mail').fill(DESIGNER);
    await user.getByRole('link', { name: 'Forgot your password?' }).click();
    await user.waitForURL((url) => url.pathname === '/forgot-password');
    expect(await user.getByLabel('E-mail').inputValue()).toBe(DESIGNER);
    await user.getByRole('button', { name: 'Send reset link' }).click();
    const answer = user.getByRole('status');
    await answer.waitFor();
    const known = (await answer.innerText()).trim();
    expect(known).toMatch(SAME_ANSWER);

    // An address without an account gets the same answer (nothing is disclosed).
    await user.getByRole('button', { name: 'Ask again' }).click();
    await user.getByLabel('E-mail').fill('nobody@tallowmere.example');
    await user.getByRole('button', { name: 'Send reset link' }).click();
    await user.getByRole('status').waitFor();
    const unknown = (await user.getByRole('status').innerText()).trim();
    expect(unknown).toBe(known.replace(DESIGNER, 'nobody@tallowmere.example'));

    // The team owner, in another context, does not see the designer's mail: each mailbox is its owner's alone.
    const owner = await env.browser.newPage();
    await signIn(owner, env.app.baseUrl, OWNER);
    await owner.getByRole('button', { name: /^Signed in as Ana Ferreira/ }).click();
    await owner.getByRole('menuitem', { name: 'Dev mail' }).click();
    await owner.waitForURL((url) => url.pathname === '/dev-mail');
    await owner.getByRole('heading', { name: 'Your development mail' }).waitFor();
    await owner.locator('li.mail').or(owner.getByText('No mail captured yet.')).first().waitFor();

    // The designer, still signed in on another device, reads the mail there.
    const device = await env.browser.newPage();
    await signIn(device, env.app.baseUrl, DESIGNER);
    await device.goto(`${env.app.baseUrl}/dev-mail`);
    await device.getByRole('heading', { name: 'Your development mail' }).waitFor();
    const mail = await waitForMail(device, 'Reset your Rollwise password', DESIGNER);
    const link = mail.locator('pre a');
    await expect.poll(() => link.count()).toBe(1);
    const href = new URL((await link.getAttribute('href'))!);
    expect(href.pathname).toMatch(/^\/reset-password\/[A-Za-z0-9_-]{20,}$/);
    expect(await link.innerText()).toBe(href.href);
    await saveScreenshot(device, 'account-links-dev-mail');
    // By now the mail was delivered: the owner's mailbox still holds no reset link.
    await owner.getByRole('button', { name: 'Refresh' }).click();
    await owner.locator('li.mail').or(owner.getByText('No mail captured yet.')).first().waitFor();
    expect(await owner.locator('li.mail').filter({ hasText: '/reset-password/' }).count()).toBe(0);

    // The link is built from the server's PUBLIC_URL, which the harness leaves at
    // its default port while the test server listens on another: open the same
    // path on the test server.
    // The designer opens it back on the signed-out browser where the reset was asked for (the page is open to everyone).
    await user.goto(new URL(href.pathname, env.app.baseUrl).href);
    await user.getByRole('heading', { name: 'Choose a new password' }).waitFor();
    await user.getByLabel('New password', { exact: true }).fill(NEW_PASSWORD);
    await user.getByLabel('Repeat new password').fill(NEW_PASSWORD);
    await user.getByRole('button', { name: 'Set new password' }).click();
    await user.getByRole('status').filter({ hasText: 'Your password is changed' }).waitFor();
    await saveScreenshot(user, 'account-links-password-reset');

    // The designer signs in with the new password and reaches the team.
    await signIn(user, env.app.baseUrl, DESIGNER, NEW_PASSWORD);
    await user.getByRole('heading', { name: 'Vehicles · Tallowmere University Racing' }).waitFor();

    for (const page of [user, owner, device]) {
      expect(consoleErrors(page), page.url()).toEqual([]);
      expect(offsiteRequests(page)).toEqual([]);
    }
  });
});
