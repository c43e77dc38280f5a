import type { Browser, BrowserContext, Page, TestInfo } from '@playwright/test';
import { test, expect, addDays, apiAs, confirmIfAsked, fillDate, isPhone, linkIn, readMail, shot, signIn, DEMO_USERS, type Api } from './fixtures';

/** The Monday a few weeks ahead of whatever today is, so the job never lands on the past or on the demo's busy weeks. */
function mondayWeeksAhead(weeks: number): string {
  const today = new Date().toISOString().slice(0, 10);
  const weekday = new Date(`${today}T00:00:00Z`).getUTCDay() || 7;
  return addDays(today, 1 - weekday + weeks * 7);
}

/** "Tue 30 Mar", as the job page writes a day. */
function plainDay(iso: string): string {
  return new Intl.DateTimeFormat('en-GB', { weekday: 'short', day: 'numeric', month: 'short', timeZone: 'UTC' }).format(new Date(`${iso}T12:00:00Z`)).replace(',', '');
}

interface Setup {
  job: { id: string; reference: string };
  crewName: string;
  week: string;
  supplierEmail: string;
  bookingId: string;
}

/** A scaffold job of 3 days on a crew, with its own supplier and a requested booking that follows the job. */
async function scaffoldJobOnBoard(api: Api, info: TestInfo): Promise<Setup> {
  const tag = `${info.project.name}-${Date.now().toString(36)}`;
  const sites = await api.get<{ items: Array<{ id: string; clientId: string }> }>('/api/sites?pageSize=1');
  const site = sites.items[0]!;
  const crews = await api.get<{ items: Array<{ id: string; name: string }> }>('/api/crews?pageSize=10');
  const crew = crews.items[crews.items.length - 1]!;
  const created = await api.post<{ id: string; reference: string; version: number }>('/api/jobs', {
    clientId: site.clientId, siteId: site.id, title: `Gable rebuild ${tag}`, workTypes: ['brickwork'], accessNeeds: ['scaffold'], estimatedWorkingDays: 3,
  });
  const job = await api.post<{ id: string; reference: string; version: number }>(`/api/jobs/${created.id}/status`, { status: 'booked', version: created.version });
  const week = mondayWeeksAhead(info.project.name === 'phone' ? 9 : 7);
  await api.post('/api/assignments', { jobId: job.id, crewId: crew.id, startDate: addDays(week, 1), workingDays: 3, confirmDoubleBooking: true });
  const supplierEmail = `hire-${tag}@tallpole-hire.test`;
  const supplier = await api.post<{ id: string }>('/api/suppliers', {
    name: `Tallpole Hire ${tag}`, contactName: 'Bryony Ashgrove', email: supplierEmail, leadTimeWorkingDays: 3, minimumWeeks: 1, weeklyRates: { scaffold: 16_500 },
  });
  const booking = await api.post<{ id: string }>('/api/access-bookings', { jobIds: [job.id], accessType: 'scaffold', supplierId: supplier.id, curingDays: 2 });
  return { job, crewName: crew.name, week, supplierEmail, bookingId: booking.id };
}

function barOf(page: Page, jobId: string, phone: boolean) {
  return phone ? page.locator(`.job[data-job-id="${jobId}"]`) : page.locator(`.bar[data-job-id="${jobId}"]:not([aria-busy="true"])`);
}

async function supplierContext(browser: Browser, page: Page, info: TestInfo): Promise<BrowserContext> {
  return browser.newContext({
    viewport: page.viewportSize() ?? undefined,
    isMobile: isPhone(info),
    hasTouch: isPhone(info),
    locale: 'en-GB',
    timezoneId: 'Europe/London',
  });
}

test.describe('access bookings', () => {
  test('a move of a job with a confirmed scaffold asks the supplier, whose answer shows on the office board live', async ({ page, browser, request }, info) => {
    const api = await apiAs(request, 'office');
    const setup = await scaffoldJobOnBoard(api, info);
    const phone = isPhone(info);

    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    await page.goto(`/jobs/${setup.job.id}`);
    const section = page.getByTestId('job-access');
    await expect(section.getByRole('heading', { name: /Scaffold/ })).toBeVisible();
    await expect(section.getByTestId('access-state')).toHaveText('Requested');
    await expect(section.getByTestId('access-safety-note')).toContainText('competent');
    await expect(section.getByTestId('access-hire')).toContainText('£');

    // The supplier has phoned to confirm: the office records it.
    await section.getByRole('button', { name: 'Confirm…' }).click();
    const confirm = page.getByRole('dialog', { name: "Confirm the supplier's dates" });
    await confirm.getByRole('button', { name: 'Confirm dates' }).click();
    await expect(confirm).toBeHidden();
    await expect(section.getByTestId('access-state')).toHaveText('Confirmed');
    await section.scrollIntoViewIfNeeded();
    await shot(page, 'access-job-confirmed');

    await page.goto(`/board?week=${setup.week}`);
    const bar = barOf(page, setup.job.id, phone);
    await expect(bar).toBeVisible();
    const band = page.locator(`[data-testid="access-band"][data-booking-id="${setup.bookingId}"]`);
    if (!phone) await expect(band.first()).toHaveAttribute('data-state', 'confirmed');
    const oldStrike = phone ? null : await band.first().getAttribute('data-strike');

    // Move it a week on through the bar's menu, as the office would on any screen size.
    await bar.click();
    await page.getByRole('menuitem', { name: 'Move to another crew or day…' }).click();
    const move = page.getByRole('dialog').filter({ has: page.getByLabel('First day') });
    const newStart = addDays(setup.week, 8);
    await fillDate(move.getByLabel('First day'), newStart);
    await move.getByRole('button', { name: 'Move', exact: true }).click();
    await confirmIfAsked(page, bar.and(page.locator(`[data-start="${newStart}"]`)));
    // On a phone the office watches the job page; on a desktop, the board with its access band.
    if (phone) {
      await page.goto(`/jobs/${setup.job.id}`);
      await expect(section.getByTestId('access-change')).toContainText('Waiting for their answer');
    }
    await page.evaluate(() => ((window as unknown as { notReloaded: boolean }).notReloaded = true));

    const mail = await readMail(setup.supplierEmail, { subject: 'Date change' });
    const needed = /Now needed: up (\d{4}-\d{2}-\d{2}), down (\d{4}-\d{2}-\d{2})/.exec(mail.text);
    expect(needed, mail.text).not.toBeNull();
    const [, newErect, newStrike] = needed!;
    if (oldStrike) expect(newStrike! > oldStrike).toBe(true);

    const supplier = await supplierContext(browser, page, info);
    try {
      const supplierPage = await supplier.newPage();
      await supplierPage.goto(linkIn(mail, '/supplier-response'));
      await expect(supplierPage.getByRole('heading', { level: 1, name: 'New dates for the scaffold' })).toBeVisible();
      await expect(supplierPage.getByTestId('access-safety-note')).toBeVisible();
      await shot(supplierPage, 'access-supplier-link');
      await supplierPage.getByRole('button', { name: 'Accept the new dates' }).click();
      await expect(supplierPage.getByTestId('supplier-answered')).toContainText('the new dates are confirmed');
      await shot(supplierPage, 'access-supplier-accepted');

      // A second use of the same link is refused in plain words.
      await supplierPage.reload();
      await expect(supplierPage.getByTestId('supplier-answered')).toBeVisible();
      await expect(supplierPage.getByRole('button', { name: 'Accept the new dates' })).toHaveCount(0);
    } finally {
      await supplier.close();
    }

    // The office's open board follows without a reload.
    if (!phone) {
      await expect(band.first()).toHaveAttribute('data-strike', newStrike!);
      await expect(band.first()).toHaveAttribute('data-erect', newErect!);
      await band.first().scrollIntoViewIfNeeded();
    }
    if (phone) await expect(section.getByTestId('access-dates')).toContainText(`down ${plainDay(newStrike!)}`);
    expect(await page.evaluate(() => (window as unknown as { notReloaded?: boolean }).notReloaded)).toBe(true);
    // The office is told on whatever page is open, since the answer comes from outside the firm.
    await expect(page.getByText(/accepted the new dates/).first()).toBeVisible();
    await shot(page, phone ? 'access-job-after-answer' : 'access-board-after-answer');

    if (!phone) await page.goto(`/jobs/${setup.job.id}`);
    await expect(section.getByTestId('access-dates')).toContainText(`up ${plainDay(newErect!)}, down ${plainDay(newStrike!)} (confirmed)`);
    await expect(section.getByTestId('access-change')).toHaveCount(0);
  });

  test('the supplier link explains a missing or unknown code instead of failing', async ({ page }) => {
    await page.goto('/supplier-response?token=not-a-real-token-at-all-000000');
    await expect(page.getByRole('alert')).toContainText(/not valid|expired/);
    await page.goto('/supplier-response');
    await expect(page.getByRole('alert')).toContainText('missing its code');
  });
});
