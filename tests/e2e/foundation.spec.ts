import type { Page, TestInfo } from '@playwright/test';
import { test, expect, isPhone, signIn, shot, DEMO_USERS } from './fixtures';

/** A suffix that keeps names unique across projects and repeated runs against the same seeded database. */
function unique(info: TestInfo): string {
  return `${info.project.name}-${Date.now().toString(36)}`;
}

/** Goes to a page through the visible navigation; on a phone the less-used pages sit behind "More". */
async function openPage(page: Page, info: TestInfo, label: string): Promise<void> {
  const nav = page.getByRole('navigation', { name: 'Main' });
  const link = nav.getByRole('link', { name: label, exact: true });
  if (isPhone(info) && !(await link.isVisible())) {
    await nav.getByRole('button', { name: 'More' }).click();
    await page.getByRole('navigation', { name: 'More pages' }).getByRole('link', { name: label, exact: true }).click();
  } else {
    await link.click();
  }
  await expect(page.getByRole('heading', { level: 1, name: label })).toBeVisible();
}

/** The overview's heading greets the person, so it is opened from the nav without the heading check. */
async function openOverview(page: Page, info: TestInfo): Promise<void> {
  const nav = page.getByRole('navigation', { name: 'Main' });
  const link = nav.getByRole('link', { name: 'Overview', exact: true });
  if (isPhone(info) && !(await link.isVisible())) {
    await nav.getByRole('button', { name: 'More' }).click();
    await page.getByRole('navigation', { name: 'More pages' }).getByRole('link', { name: 'Overview', exact: true }).click();
  } else {
    await link.click();
  }
}

async function navLabels(page: Page, info: TestInfo): Promise<string[]> {
  const labels = await page.getByRole('navigation', { name: 'Main' }).getByRole('link').allInnerTexts();
  if (isPhone(info)) {
    await page.getByRole('navigation', { name: 'Main' }).getByRole('button', { name: 'More' }).click();
    // The sheet's code loads on first open: wait for the sheet before asking whether it lists more pages.
    await expect(page.getByRole('dialog').filter({ hasText: 'Sign out' })).toBeVisible();
    const more = page.getByRole('navigation', { name: 'More pages' });
    if (await more.isVisible()) labels.push(...(await more.getByRole('link').allInnerTexts()));
    await page.keyboard.press('Escape');
  }
  return labels.map((label) => label.trim());
}

async function signOut(page: Page, info: TestInfo): Promise<void> {
  if (isPhone(info)) await page.getByRole('navigation', { name: 'Main' }).getByRole('button', { name: 'More' }).click();
  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect(page.getByRole('button', { name: 'Sign in', exact: true })).toBeVisible();
}

async function choose(page: Page, comboboxName: string, option: string | RegExp, scope = page.getByRole('dialog')): Promise<void> {
  // A list still fading out from the previous pick can sit over this combobox and take the tap.
  await expect(page.getByRole('listbox')).toBeHidden();
  const combobox = scope.getByRole('combobox', { name: comboboxName });
  const choice = page.getByRole('option', { name: option }).first();
  // PrimeVue's multi-select keeps its combobox as a visually hidden input under its label, and its
  // keyboard handling is off on Android, so tap where the combobox sits: the control around it opens.
  // A tap during the list's opening can miss, so try again until the pick is ticked, never tapping a
  // ticked option (that would untick it). A single select closes on a pick, so there is nothing to see.
  await expect(async () => {
    if (!(await choice.isVisible())) await combobox.click({ force: true });
    if ((await choice.getAttribute('aria-selected', { timeout: 2_000 })) !== 'true') await choice.click({ timeout: 2_000 });
    if (await choice.isVisible()) expect(await choice.getAttribute('aria-selected')).toBe('true');
  }).toPass({ timeout: 15_000 });
}

test.describe('foundation', () => {
  test('the office adds a crew and a client with a site, and finds them again after a reload', async ({ page }, info) => {
    // One long journey through four pages; the default budget is sized for short tests.
    test.setTimeout(90_000);
    const tag = unique(info);
    const crewName = `Gable crew ${tag}`;
    const clientName = `Ashworth Mill Trust ${tag}`;
    const address = `${Math.floor(Math.random() * 900) + 10} Kilnyard Lane`;

    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    // The office lands on the board; the overview is one step away.
    await expect(page.getByRole('heading', { level: 1, name: 'Board' })).toBeVisible();
    await openOverview(page, info);
    await expect(page.getByRole('heading', { level: 1, name: /^(Morning|Afternoon|Evening), Dev$/ })).toBeVisible();
    await expect(page.getByRole('heading', { name: 'Job pipeline' })).toBeVisible();
    await shot(page, 'office-overview');

    await openPage(page, info, 'Crews');
    await expect(page.getByRole('row', { name: /Stack crew/ })).toBeVisible();
    await page.getByRole('button', { name: 'New crew' }).click();
    const crewDialog = page.getByRole('dialog', { name: 'New crew' });
    await crewDialog.getByRole('button', { name: 'Add crew' }).click();
    await expect(crewDialog.getByText('Crew name is required')).toBeVisible();
    await crewDialog.getByLabel('Crew name').fill(crewName);
    await crewDialog.getByRole('button', { name: 'Moss' }).click();
    await choose(page, 'Crew lead', /Marek Sowinski/);
    await choose(page, 'Members', /Josh Telford/);
    // A multi-select stays open after a pick. Close it by tapping the dialog's title: Escape, if the panel had
    // already gone, would close the whole dialog.
    await crewDialog.getByText('New crew', { exact: true }).click();
    await expect(page.getByRole('listbox')).toBeHidden();
    await expect(crewDialog.getByText(/Josh Telford/).first()).toBeVisible();
    await shot(page, 'crew-dialog');
    await crewDialog.getByRole('button', { name: 'Add crew' }).click();
    await expect(crewDialog).toBeHidden();
    await expect(page.getByRole('row', { name: new RegExp(crewName) })).toBeVisible();

    await openPage(page, info, 'Clients');
    await page.getByRole('button', { name: 'New client' }).click();
    const clientDialog = page.getByRole('dialog', { name: 'New client' });
    await clientDialog.getByLabel('Client name').fill(clientName);
    const mainContact = clientDialog.getByRole('group', { name: 'Main contact' });
    await mainContact.getByLabel('Name').fill('Wren Ashworth');
    await mainContact.getByLabel('Email').fill('not-an-address');
    await clientDialog.getByRole('button', { name: 'Add contact' }).click();
    const second = clientDialog.getByRole('group', { name: 'Contact 2' });
    await second.getByLabel('Name').fill('Orla Ashworth');
    await second.getByLabel('Role').fill('Trustee');
    await second.getByLabel('Phone').fill('07700 900614');
    await clientDialog.getByRole('button', { name: 'Add client' }).click();
    await expect(mainContact.getByText('Enter a valid e-mail address')).toBeVisible();
    await mainContact.getByLabel('Email').fill('wren@ashworth-trust.example.org');
    await clientDialog.getByRole('button', { name: 'Add client' }).click();
    await expect(clientDialog).toBeHidden();

    const sites = page.getByRole('region', { name: `Sites for ${clientName}` });
    await expect(sites.getByText('No sites yet for this client.')).toBeVisible();
    await sites.getByRole('button', { name: 'Add site', exact: true }).click();
    const siteDialog = page.getByRole('dialog', { name: 'New site' });
    await expect(siteDialog.getByText(clientName)).toBeVisible();
    await siteDialog.getByLabel('Address', { exact: true }).fill(address);
    await siteDialog.getByLabel('Town').fill('Callowmere');
    await siteDialog.getByLabel('Postcode').fill('12345');
    await siteDialog.getByLabel('Access notes').fill('Gate on the canal side; key from the trust office.');
    await siteDialog.getByLabel('Hazards').fill('Towpath below the gable; fence it off.');
    await siteDialog.getByRole('button', { name: 'Add site' }).click();
    await expect(siteDialog.getByText('Enter a UK postcode like LS6 2AB')).toBeVisible();
    await siteDialog.getByLabel('Postcode').fill('cm3 9kl');
    await shot(page, 'site-dialog');
    await siteDialog.getByRole('button', { name: 'Add site' }).click();
    await expect(siteDialog).toBeHidden();
    await expect(sites.getByText(address)).toBeVisible();
    await expect(sites.getByText('Callowmere · CM3 9KL')).toBeVisible();
    await shot(page, 'clients-with-site');

    await page.reload();
    await expect(page.getByRole('heading', { level: 1, name: 'Clients' })).toBeVisible();
    await page.getByRole('textbox', { name: 'Search clients' }).fill(tag);
    const clientRow = page.getByRole('row', { name: new RegExp(clientName) });
    await expect(clientRow).toBeVisible();
    await expect(clientRow).toContainText('2 contacts · Wren Ashworth · Orla Ashworth');
    await expect(page.getByRole('row')).toHaveCount(2);
    await clientRow.getByRole('button', { name: 'Show sites' }).click();
    await expect(sites.getByText(address)).toBeVisible();

    await openPage(page, info, 'Sites');
    await page.getByRole('textbox', { name: 'Search sites' }).fill(address);
    const siteRow = page.getByRole('row', { name: new RegExp(address) });
    await expect(siteRow).toBeVisible();
    await expect(siteRow).toContainText('CM3 9KL');
    await expect(siteRow).toContainText(clientName);
    await expect(page.getByRole('row')).toHaveCount(2);
    await shot(page, 'sites');

    await openPage(page, info, 'Crews');
    await page.reload();
    await page.getByRole('textbox', { name: 'Search crews' }).fill(tag);
    const crewRow = page.getByRole('row', { name: new RegExp(crewName) });
    await expect(crewRow).toBeVisible();
    await expect(crewRow).toContainText('Marek Sowinski');
    await expect(crewRow).toContainText('Josh Telford');
    await expect(page.getByRole('row')).toHaveCount(2);
    await shot(page, 'crews');
  });

  test('an operative sees only their own pages, and admin addresses are refused', async ({ page }, info) => {
    await signIn(page, DEMO_USERS.operative.email, DEMO_USERS.operative.password);
    // People on site land on their own days; the overview is one tap away in the menu.
    await expect(page.getByRole('heading', { level: 1, name: 'Your days' })).toBeVisible();
    await shot(page, 'operative-overview');

    const labels = await navLabels(page, info);
    expect(labels).toEqual(expect.arrayContaining(['Overview', 'Jobs', 'Crews']));
    for (const hidden of ['People', 'Clients', 'Sites', 'Firm settings']) expect(labels).not.toContain(hidden);

    for (const path of ['/people', '/clients', '/sites', '/firm']) {
      await page.goto(path);
      await expect(page.getByRole('heading', { level: 1, name: 'Not available for your role' })).toBeVisible();
    }
    await shot(page, 'operative-denied');

    await openPage(page, info, 'Crews');
    await expect(page.getByRole('row', { name: /Stack crew/ })).toBeVisible();
    await expect(page.getByRole('button', { name: 'New crew' })).toHaveCount(0);
    await expect(page.getByRole('button', { name: /^Edit / })).toHaveCount(0);
  });

  test('a wrong password is refused on the form without leaving the page', async ({ page }) => {
    await page.goto('/sign-in');
    await page.getByLabel('Email', { exact: true }).fill(DEMO_USERS.office.email);
    await page.getByLabel('Password', { exact: true }).fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in', exact: true }).click();
    await expect(page.getByRole('alert')).toContainText('do not match an account');
    await expect(page).toHaveURL(/\/sign-in/);
    await shot(page, 'sign-in-refused');
  });

  test('a new firm signs up, lands on its own overview, and can sign in again', async ({ page }, info) => {
    const tag = unique(info);
    const firmName = `Corbel & Quoin Builders ${tag}`;
    const email = `owner-${tag}@corbel-quoin.example.org`;
    const password = 'Lime-and-sand-1';

    await page.goto('/sign-in');
    await page.getByRole('link', { name: 'Set up your firm' }).click();
    await expect(page.getByRole('heading', { level: 1, name: 'Set up your firm' })).toBeVisible();
    await page.getByRole('button', { name: 'Create firm' }).click();
    await expect(page.getByText('Firm name is required')).toBeVisible();
    await expect(page.getByText('Use at least 10 characters')).toBeVisible();
    await shot(page, 'sign-up-errors');

    await page.getByLabel('Firm name').fill(firmName);
    await page.getByLabel('Your name').fill('Esme Corbel');
    await page.getByLabel('Email', { exact: true }).fill(email);
    await page.getByLabel('Password', { exact: true }).fill(password);
    await page.getByRole('button', { name: 'Create firm' }).click();

    await expect(page.getByRole('heading', { level: 1, name: 'Board' })).toBeVisible();
    await openOverview(page, info);
    await expect(page.getByRole('heading', { level: 1, name: /^(Morning|Afternoon|Evening), Esme$/ })).toBeVisible();
    await expect(page.getByText(firmName).filter({ visible: true }).first()).toBeVisible();
    const labels = await navLabels(page, info);
    expect(labels).toEqual(expect.arrayContaining(['People', 'Clients', 'Sites', 'Firm settings']));
    await shot(page, 'new-firm-overview');

    await openPage(page, info, 'Crews');
    await expect(page.getByText('No crews yet.')).toBeVisible();

    await signOut(page, info);
    await signIn(page, email, password);
    await expect(page.getByRole('heading', { level: 1, name: 'Board' })).toBeVisible();
    await expect(page.getByText(firmName).filter({ visible: true }).first()).toBeVisible();
  });
});
