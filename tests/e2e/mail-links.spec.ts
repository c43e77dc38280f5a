import type { Browser, BrowserContext, Page, TestInfo } from '@playwright/test';
import { test, expect, isPhone, mailUrl, readMail, shot, signIn, DEMO_USERS } from './fixtures';

/** A suffix that keeps addresses unique across projects and repeated runs against the same seeded database. */
function unique(info: TestInfo): string {
  return `${info.project.name}-${Date.now().toString(36)}`;
}

/** A second browser for the person the mail is for, on the same app and the same size as the test's own page. */
async function recipientContext(browser: Browser, page: Page, info: TestInfo): Promise<BrowserContext> {
  return browser.newContext({
    baseURL: new URL(page.url()).origin,
    viewport: page.viewportSize() ?? undefined,
    isMobile: isPhone(info),
    hasTouch: isPhone(info),
    locale: 'en-GB',
    timezoneId: 'Europe/London',
  });
}

/**
 * Opens the mail to `to` on the mail catcher's own page, as a developer reads caught mail, and leaves `inbox` on it.
 * The list is read only once the mail has arrived (sending happens after the request has been answered).
 */
async function openCaughtMail(inbox: Page, to: string, subject: RegExp): Promise<void> {
  await readMail(to, { subject });
  await inbox.goto(mailUrl());
  await expect(inbox.getByRole('heading', { name: 'Local mail catcher' })).toBeVisible();
  await inbox.getByRole('row').filter({ hasText: to }).getByRole('link', { name: subject }).first().click();
  await expect(inbox.getByText(to).first()).toBeVisible();
}

/** Follows the link in the open mail whose address contains `path`; the catcher opens links in a new tab. */
async function followLink(inbox: Page, path: string): Promise<Page> {
  const link = inbox.getByRole('link', { name: new RegExp(`${path.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&')}\\?token=`) });
  const [opened] = await Promise.all([inbox.waitForEvent('popup'), link.click()]);
  await opened.waitForLoadState();
  return opened;
}

test.describe('e-mailed links', () => {
  test('the owner invites someone, who joins from the e-mail once and then signs in with their own password', async ({ page, browser }, info) => {
    test.setTimeout(60_000);
    const tag = unique(info);
    const email = `tamsin.rook-${tag}@example.org`;
    const password = 'Flint-and-lime-7';

    await signIn(page, DEMO_USERS.owner.email, DEMO_USERS.owner.password);
    await page.goto('/people');
    await expect(page.getByRole('heading', { level: 1, name: 'People' })).toBeVisible();
    await page.getByRole('button', { name: 'Invite someone' }).click();
    const dialog = page.getByRole('dialog', { name: 'Invite someone' });
    await dialog.getByLabel('Name').fill('Tamsin Rook');
    await dialog.getByLabel('Email').fill(email);
    await dialog.getByRole('button', { name: 'Send invitation' }).click();
    await expect(dialog).toBeHidden();
    const row = page.getByRole('row').filter({ hasText: email });
    await expect(row).toContainText('Invite sent');

    const invitee = await recipientContext(browser, page, info);
    try {
      const inbox = await invitee.newPage();
      await openCaughtMail(inbox, email, /^You are invited to /);
      await shot(inbox, 'mail-invite');
      const join = await followLink(inbox, '/accept-invite');
      await expect(join.getByRole('heading', { level: 1, name: 'Join your firm' })).toBeVisible();
      await join.getByRole('button', { name: 'Join firm' }).click();
      await expect(join.getByText('Use at least 10 characters')).toBeVisible();
      await join.getByLabel('Your name').fill('Tamsin Rook-Hale');
      await join.getByLabel('Password', { exact: true }).fill(password);
      await shot(join, 'invite-accept');
      await join.getByRole('button', { name: 'Join firm' }).click();
      // An operative arrives on their own days.
      await expect(join.getByRole('heading', { level: 1, name: 'Your days' })).toBeVisible();

      // Signed out again, the same link is refused: an invitation works once. The joined tab is closed first, so
      // it cannot renew the session the cleared cookies end while the link is followed again.
      await join.close();
      await invitee.clearCookies();
      const again = await followLink(inbox, '/accept-invite');
      await again.getByLabel('Your name').fill('Someone Else');
      await again.getByLabel('Password', { exact: true }).fill('Another-pass-99');
      await again.getByRole('button', { name: 'Join firm' }).click();
      await expect(again.getByRole('alert')).toContainText('not valid');
      await shot(again, 'invite-used');

      await again.goto('/sign-in');
      await signIn(again, email, password);
      await expect(again.getByRole('heading', { level: 1, name: 'Your days' })).toBeVisible();
    } finally {
      await invitee.close();
    }

    await page.reload();
    await expect(row).toContainText('Tamsin Rook-Hale');
    await expect(row).not.toContainText('Invite sent');
    await shot(page, 'people-joined');
  });

  test('a forgotten password is reset from the e-mail once, and only the new one signs in', async ({ page, request }, info) => {
    test.setTimeout(60_000);
    const tag = unique(info);
    const email = `owner-${tag}@kestrel-walling.example.org`;
    const oldPassword = 'Old-coping-stone-1';
    const newPassword = 'New-coping-stone-2';
    const signedUp = await request.post('/api/auth/sign-up', {
      data: { firmName: `Kestrel Walling ${tag}`, ownerName: 'Idris Kestrel', email, password: oldPassword },
    });
    expect(signedUp.status(), await signedUp.text()).toBe(201);

    await page.goto('/sign-in');
    await page.getByRole('link', { name: 'Forgotten your password?' }).click();
    await expect(page.getByRole('heading', { level: 1, name: 'Forgotten password' })).toBeVisible();
    await page.getByLabel('Email', { exact: true }).fill(email);
    await page.getByRole('button', { name: 'Send reset link' }).click();
    await expect(page.getByText(`If an account uses ${email}, a reset link is on its way`)).toBeVisible();

    const inbox = await page.context().newPage();
    await openCaughtMail(inbox, email, /^Reset your Hodboard password$/);
    await shot(inbox, 'mail-reset');
    const reset = await followLink(inbox, '/reset-password');
    await expect(reset.getByRole('heading', { level: 1, name: 'Choose a new password' })).toBeVisible();
    await reset.getByLabel('New password', { exact: true }).fill(newPassword);
    await reset.getByLabel('Repeat new password').fill('Not-the-same-pass-3');
    await reset.getByRole('button', { name: 'Save new password' }).click();
    await expect(reset.getByText('The two passwords do not match')).toBeVisible();
    await reset.getByLabel('Repeat new password').fill(newPassword);
    await reset.getByRole('button', { name: 'Save new password' }).click();
    await expect(reset.getByText('Your password has been changed')).toBeVisible();
    await shot(reset, 'reset-done');

    // The same link a second time is refused: a reset link works once.
    const again = await followLink(inbox, '/reset-password');
    await again.getByLabel('New password', { exact: true }).fill('Third-coping-stone-4');
    await again.getByLabel('Repeat new password').fill('Third-coping-stone-4');
    await again.getByRole('button', { name: 'Save new password' }).click();
    await expect(again.getByRole('alert')).toContainText('not valid');
    await shot(again, 'reset-used');

    await again.getByRole('link', { name: 'Back to sign in' }).click();
    await again.getByLabel('Email', { exact: true }).fill(email);
    await again.getByLabel('Password', { exact: true }).fill(oldPassword);
    await again.getByRole('button', { name: 'Sign in', exact: true }).click();
    await expect(again.getByRole('alert')).toContainText('do not match an account');
    await signIn(again, email, newPassword);
    await expect(again.getByRole('heading', { level: 1, name: 'Board' })).toBeVisible();
  });
});
