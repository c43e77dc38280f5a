import { readFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import path from 'node:path';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import type { APIRequestContext, Page } from '@playwright/test';
import { DEMO_USERS, expect, linkIn, readMail, shot, test } from './fixtures';

const standardFonts = `${path.dirname(createRequire(import.meta.url).resolve('pdfjs-dist/package.json'))}/standard_fonts/`;

async function pdfText(file: string): Promise<string> {
  const doc = await getDocument({ data: new Uint8Array(await readFile(file)), standardFontDataUrl: standardFonts, isEvalSupported: false }).promise;
  const parts: string[] = [];
  for (let n = 1; n <= doc.numPages; n += 1) {
    const content = await (await doc.getPage(n)).getTextContent();
    parts.push(content.items.map((item) => ('str' in item ? item.str : '')).join(' '));
  }
  await doc.destroy();
  return parts.join(' ').replace(/\s+/g, ' ');
}

async function apiToken(request: APIRequestContext): Promise<string> {
  const res = await request.post('/api/auth/sign-in', { data: DEMO_USERS.owner });
  expect(res.ok()).toBe(true);
  return ((await res.json()) as { accessToken: string }).accessToken;
}

/** An invented client with a leaning garden wall, entered as the office would before pricing it. */
async function gardenWallEnquiry(request: APIRequestContext, token: string, stamp: string) {
  const headers = { Authorization: `Bearer ${token}` };
  const email = `iris.penhallow.${stamp}@example.org`;
  const client = await (await request.post('/api/clients', { headers, data: { name: `Iris Penhallow ${stamp}`, contacts: [{ name: 'Iris Penhallow', email }] } })).json();
  const site = await (await request.post('/api/sites', {
    headers, data: { clientId: client.id, addressLine1: '3 Tanners Row', town: 'Greenhythe', postcode: 'GH2 7RW' },
  })).json();
  const job = await (await request.post('/api/jobs', {
    headers,
    data: { clientId: client.id, siteId: site.id, title: `Rebuild leaning garden wall ${stamp}`, workTypes: ['garden-wall'], estimatedWorkingDays: 3 },
  })).json();
  return { email, job: job as { id: string; reference: string; title: string } };
}

async function pick(page: Page, label: string, option: string | RegExp): Promise<void> {
  await page.getByRole('combobox', { name: label }).click();
  await page.getByRole('option', { name: option }).first().click();
}

test('a garden-wall quote goes from the brick calculator to an accepted, deposit-paid job in the tray', async ({ page, browser, request, signInPageAs }, testInfo) => {
  test.setTimeout(120_000);
  const stamp = `${testInfo.project.name}${Date.now().toString(36)}`;
  const token = await apiToken(request);
  const { email, job } = await gardenWallEnquiry(request, token, stamp);

  await signInPageAs('owner');
  await page.goto('/quotes');
  await page.getByRole('button', { name: 'New quote' }).click();
  await page.getByRole('combobox', { name: 'Job to price' }).click();
  await page.keyboard.type(job.reference);
  await page.getByRole('option', { name: new RegExp(job.reference) }).click();
  await page.getByRole('button', { name: 'Start quote' }).click();
  await expect(page.getByRole('heading', { level: 1, name: /Quote Q\d+/ })).toBeVisible();

  // 11 m² of half-brick wall at 60 bricks a m² is 660 bricks; 5 % waste makes 693 to order.
  await page.getByLabel('Wall face area (m²)').fill('11');
  await pick(page, 'Brick from the price list', 'Red multi facing brick');
  await expect(page.getByTestId('calc-answer')).toContainText('693 bricks');
  await expect(page.getByTestId('calc-answer')).toContainText('0.206 m³ of mortar');
  await page.getByRole('button', { name: 'Add bricks and mortar to the materials' }).click();
  await expect(page.getByRole('group', { name: 'Material line 1' }).getByLabel('Material')).toHaveValue('Red multi facing brick');
  await page.getByLabel('What the client gets, in plain words').fill('Take down the leaning garden wall and rebuild it in red multi brick on the old footing.');
  await page.getByLabel('Miles from the yard').fill('8');

  const gross = page.getByTestId('gross');
  await expect(gross).toHaveText(/^£[\d,]+\.\d\d$/);
  await page.getByRole('button', { name: 'Save draft' }).click();
  await expect(page.getByText('Draft saved')).toBeVisible();
  const shownTotal = (await gross.textContent())!.trim();
  const quoteId = page.url().split('/quotes/')[1]!;
  const saved = await (await request.get(`/api/quotes/${quoteId}`, { headers: { Authorization: `Bearer ${token}` } })).json();
  expect(`£${(saved.current.breakdown.totals.grossPence / 100).toLocaleString('en-GB', { minimumFractionDigits: 2 })}`).toBe(shownTotal);
  await shot(page, 'quote-editor');

  await page.getByRole('button', { name: 'Preview PDF' }).click();
  const preview = page.getByRole('dialog', { name: 'Quote PDF' });
  await expect(preview.locator('iframe[title="Quote PDF preview"]')).toBeVisible();
  const [download] = await Promise.all([page.waitForEvent('download'), preview.getByRole('link', { name: 'Download PDF' }).click()]);
  const pdfFile = testInfo.outputPath('quote.pdf');
  await download.saveAs(pdfFile);
  const text = await pdfText(pdfFile);
  for (const expected of ['Brindle & Frayne Masonry', `Draft quote ${saved.reference}`, job.title, 'leaning garden wall', 'Materials', 'Total to pay', shownTotal]) {
    expect(text).toContain(expected);
  }
  await page.keyboard.press('Escape');

  await page.getByRole('button', { name: 'Send to client' }).click();
  await expect(page.getByLabel("Client's e-mail")).toHaveValue(email);
  await page.getByRole('button', { name: 'Send quote' }).click();
  await expect(page.getByText('With the client')).toBeVisible();

  const mail = await readMail(email, { subject: `Your quote ${saved.reference}` });
  expect(mail.text).toContain(shownTotal);
  const link = linkIn(mail, '/q/');

  const clientContext = await browser.newContext({ ...testInfo.project.use, baseURL: testInfo.project.use.baseURL });
  const client = await clientContext.newPage();
  await client.goto(link);
  await expect(client.getByRole('heading', { name: `Quote ${saved.reference}` })).toBeVisible();
  await expect(client.getByRole('row', { name: /^Total/ })).toContainText(shownTotal);
  await shot(client, 'quote-client');
  await client.getByLabel('Your full name').fill(`Iris Penhallow ${stamp}`);
  await client.getByRole('checkbox', { name: /I accept this quote/ }).check();
  await client.getByRole('button', { name: 'Accept and pay the deposit' }).click();

  await expect(client.getByText('Local test payment service')).toBeVisible();
  await shot(client, 'quote-deposit-pay');
  await client.getByRole('button', { name: /^Pay £/ }).click();
  await expect(client.getByText(/Deposit of £[\d,.]+ received/)).toBeVisible();
  await shot(client, 'quote-client-accepted');
  await clientContext.close();

  const board = await (await request.get('/api/board', {
    headers: { Authorization: `Bearer ${token}` },
    params: { from: new Date().toISOString().slice(0, 10), to: new Date(Date.now() + 13 * 86_400_000).toISOString().slice(0, 10) },
  })).json();
  expect(board.trayJobIds).toContain(job.id);

  await page.reload();
  await expect(page.getByText(/Accepted by Iris Penhallow/)).toBeVisible();
  await expect(page.getByText(/Deposit £[\d,.]+: paid/)).toBeVisible();
  if (testInfo.project.name === 'desktop') {
    await page.goto('/board');
    await expect(page.getByTestId('board-tray')).toContainText(job.reference);
    await shot(page, 'quote-board-tray');
  }
});

test('a sent quote is revised into a new frozen version on a new link, and the first stays as it was sent', async ({ page, browser, request, signInPageAs }, testInfo) => {
  test.setTimeout(90_000);
  const stamp = `${testInfo.project.name}${Date.now().toString(36)}r`;
  const token = await apiToken(request);
  const headers = { Authorization: `Bearer ${token}` };
  const { email, job } = await gardenWallEnquiry(request, token, stamp);
  const content = {
    scope: 'Rebuild the leaning garden wall on the old footing.',
    exclusions: null,
    materials: [{ materialId: null, description: 'Red multi facing brick', unit: 'brick', quantity: 660, unitPricePence: 78, wastePct: 5 }],
    labour: [{ description: 'Bricklayer', people: 1, days: 3, dayRatePence: 22_000 }],
    jobDays: 3,
    distanceMiles: 6,
    accessHire: [],
    marginPct: 15,
    breakdownLevel: 'sections',
  };
  const created = await (await request.post('/api/quotes', { headers, data: { jobId: job.id, content } })).json();
  expect((await request.post(`/api/quotes/${created.id}/send`, { headers, data: { version: created.version } })).ok()).toBe(true);
  const firstLink = linkIn(await readMail(email, { subject: `Your quote ${created.reference}` }), '/q/');

  await signInPageAs('owner');
  await page.goto(`/quotes/${created.id}`);
  await expect(page.getByText(/Version 1 was sent .* and is frozen/)).toBeVisible();
  const firstTotal = (await page.getByTestId('gross').textContent())!.trim();
  await page.getByRole('button', { name: 'Revise' }).click();
  await expect(page.getByText('New version started')).toBeVisible();
  await expect(page.getByText('Version 2 is a revision.')).toBeVisible();
  await page.getByLabel('Margin %').fill('25');
  await page.getByLabel('What the client gets, in plain words').fill('Rebuild the leaning garden wall on the old footing, with a brick pier at the gate.');
  await page.getByRole('button', { name: 'Save draft' }).click();
  await expect(page.getByText('Draft saved')).toBeVisible();
  const secondTotal = (await page.getByTestId('gross').textContent())!.trim();
  expect(secondTotal).not.toBe(firstTotal);
  await shot(page, 'quote-revision-draft');
  await page.getByRole('button', { name: 'Send to client' }).click();
  await page.getByRole('button', { name: 'Send quote' }).click();
  await expect(page.getByText('With the client')).toBeVisible();
  const versions = page.getByRole('region', { name: 'Versions' }).getByRole('listitem');
  await expect(versions).toHaveCount(2);
  await expect(versions.nth(0)).toContainText(`Version 1 · ${firstTotal}`);
  await expect(versions.nth(0)).toContainText('sent');
  await expect(versions.nth(1)).toContainText(`Version 2 · ${secondTotal}`);
  await expect(versions.nth(1)).toContainText('sent');
  await expect(page.getByRole('button', { name: 'Save draft' })).toHaveCount(0);
  await shot(page, 'quote-revision-sent');

  // The newest mail carries the new link; the catcher may take a moment to receive it.
  const newestLink = async () => linkIn(await readMail(email, { subject: `Your quote ${created.reference}` }), '/q/');
  await expect.poll(newestLink).not.toBe(firstLink);
  const secondLink = await newestLink();
  const clientContext = await browser.newContext({ ...testInfo.project.use, baseURL: testInfo.project.use.baseURL });
  const client = await clientContext.newPage();
  await client.goto(firstLink);
  await expect(client.getByRole('alert')).toContainText('not valid');
  await client.goto(secondLink);
  await expect(client.getByText('Version 2')).toBeVisible();
  await expect(client.getByRole('row', { name: /^Total/ })).toContainText(secondTotal);
  await expect(client.getByText('brick pier at the gate')).toBeVisible();
  await clientContext.close();
});

test('quoted against achieved takes the days lost from a stand-down and the extra hire from the booking; the office adds only materials', async ({ page, request, signInPageAs }, testInfo) => {
  test.setTimeout(90_000);
  const stamp = `${testInfo.project.name}${Date.now().toString(36)}m`;
  const token = await apiToken(request);
  const headers = { Authorization: `Bearer ${token}` };
  const ok = async <T>(res: Promise<Awaited<ReturnType<APIRequestContext['get']>>>): Promise<T> => {
    const answered = await res;
    expect(answered.ok(), await answered.text()).toBe(true);
    return (await answered.json()) as T;
  };
  const { email, job } = await gardenWallEnquiry(request, token, stamp);
  const content = {
    scope: 'Rebuild the leaning garden wall on the old footing.',
    exclusions: null,
    materials: [{ materialId: null, description: 'Red multi facing brick', unit: 'brick', quantity: 660, unitPricePence: 78, wastePct: 5 }],
    labour: [{ description: 'Bricklayer', people: 1, days: 3, dayRatePence: 22_000 }],
    jobDays: 3,
    distanceMiles: 6,
    accessHire: [{ description: 'Tower', weeks: 1, minimumWeeks: 1, weeklyRatePence: 9_000 }],
    marginPct: 15,
    breakdownLevel: 'sections',
  };
  const quote = await ok<{ id: string; version: number }>(request.post('/api/quotes', { headers, data: { jobId: job.id, content } }));
  await ok(request.post(`/api/quotes/${quote.id}/send`, { headers, data: { version: quote.version } }));
  const link = linkIn(await readMail(email, { subject: 'Your quote' }), '/q/');
  await ok(request.post(`/api/public/quotes/${link.split('/q/')[1]}/accept`, { data: { name: `Iris Penhallow ${stamp}`, agree: true } }));

  // Placed a week or so out, stood down for its first two days, and pushed back by them.
  const crew = await ok<{ id: string }>(request.post('/api/crews', { headers, data: { name: `Wall crew ${stamp}`, colour: '#336699' } }));
  const start = new Date(Date.now() + 7 * 86_400_000).toISOString().slice(0, 10);
  const placed = await ok<{ assignment: { days: string[] } }>(request.post('/api/assignments', {
    headers, data: { jobId: job.id, crewId: crew.id, startDate: start },
  }));
  const hold = await ok<{ id: string; version: number }>(request.post('/api/weather-holds', {
    headers, data: { jobId: job.id, dates: placed.assignment.days.slice(0, 2), reason: 'rain' },
  }));
  await ok(request.post(`/api/weather-holds/${hold.id}/commit`, { headers, data: { mode: 'push', version: hold.version } }));
  // A tower on hire for two weeks against the one priced.
  const supplier = await ok<{ id: string }>(request.post('/api/suppliers', { headers, data: { name: `Steeple Towers ${stamp}`, email: `hire.${stamp}@example.org` } }));
  const erect = placed.assignment.days[0]!;
  const strike = new Date(Date.parse(`${erect}T12:00:00Z`) + 14 * 86_400_000).toISOString().slice(0, 10);
  await ok(request.post('/api/access-bookings', {
    headers, data: { jobIds: [job.id], accessType: 'tower', supplierId: supplier.id, requestedErect: erect, requestedStrike: strike, weeklyRate: 9_000, minimumWeeks: 1, pricedWeeks: 1 },
  }));

  await signInPageAs('office');
  await page.goto('/margins');
  const row = page.getByRole('row', { name: new RegExp(job.reference) });
  await expect(row).toContainText('3 of 3');
  await expect(row).toContainText('2 lost to weather');
  if (testInfo.project.name === 'desktop') await expect(row).toContainText('1 more hire week (£90.00)');
  await shot(page, 'quote-margins-actuals');
  await row.getByRole('button', { name: `Materials added and notes for ${job.reference}` }).click();
  const dialog = page.getByRole('dialog', { name: `What ${job.reference} really took` });
  await expect(dialog.getByText('Days lost to weather')).toBeVisible();
  await expect(dialog.getByRole('definition').filter({ hasText: '2 days' })).toBeVisible();
  await expect(dialog.getByRole('definition').filter({ hasText: '1 week, £90.00' })).toBeVisible();
  // The days and the hire are read from the board and the booking; there is nothing to type for them.
  await expect(dialog.getByRole('spinbutton')).toHaveCount(1);
  await expect(dialog.getByRole('textbox')).toHaveCount(1);
  await dialog.getByLabel('Materials added').fill('45');
  await dialog.getByLabel(/Notes/).fill('Ten more copings');
  await shot(page, 'quote-margins-extras');
  await dialog.getByRole('button', { name: 'Save' }).click();
  await expect(page.getByText('Figures saved')).toBeVisible();
  if (testInfo.project.name === 'desktop') await expect(row).toContainText('materials £45.00');
});

test('crew roles have no way to the prices', async ({ page, signInPageAs }) => {
  await signInPageAs('operative');
  await expect(page.getByRole('link', { name: 'Quotes' })).toHaveCount(0);
  await page.goto('/quotes');
  await expect(page).toHaveURL(/\/not-allowed/);
});

test('the office sees the price list, the costing settings and quoted against achieved', async ({ page, signInPageAs }) => {
  await signInPageAs('office');
  await page.goto('/materials');
  await expect(page.getByRole('cell', { name: 'Red multi facing brick Callowmere Builders Merchants' })).toBeVisible();
  await shot(page, 'quote-price-list');
  await page.goto('/costing');
  // Demo running costs £747.00 a month over 20 working days.
  await expect(page.getByText('£37.35 a working day')).toBeVisible();
  await expect(page.getByText('Only the owner can change these figures.')).toBeVisible();
  await shot(page, 'quote-costing-settings');
  await page.goto('/quotes');
  await expect(page.getByRole('link', { name: /^Q\d{4}$/ }).first()).toBeVisible();
  await shot(page, 'quote-list');
  await page.goto('/margins');
  await expect(page.getByRole('img', { name: /Margin quoted and achieved by month/ })).toBeVisible();
  await shot(page, 'quote-margins');
});
