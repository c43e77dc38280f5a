import type { Locator, Page, TestInfo } from '@playwright/test';
import { test, expect, addDays, apiAs, isPhone, shot, signIn, DEMO_USERS, type Api } from './fixtures';

interface Placed {
  id: string;
  reference: string;
  days: string[];
}

/**
 * A two-day scaffold job from tomorrow (or the next working day) on the last crew, booked over whatever is there
 * already: always on the board's first screen and inside the forecast, whatever today is.
 */
async function jobNextWeek(api: Api, info: TestInfo): Promise<Placed> {
  const tag = `${info.project.name}-${Date.now().toString(36)}`;
  const sites = await api.get<{ items: Array<{ id: string; clientId: string }> }>('/api/sites?pageSize=1');
  const site = sites.items[0]!;
  const crews = await api.get<{ items: Array<{ id: string }> }>('/api/crews?pageSize=10');
  const crew = crews.items[crews.items.length - 1]!;
  const created = await api.post<{ id: string; reference: string; version: number }>('/api/jobs', {
    clientId: site.clientId, siteId: site.id, title: `Parapet rebuild ${tag}`, workTypes: ['brickwork'], accessNeeds: ['scaffold'], estimatedWorkingDays: 2,
  });
  const job = await api.post<{ id: string; reference: string; version: number }>(`/api/jobs/${created.id}/status`, { status: 'booked', version: created.version });
  const change = await api.post<{ assignment: { days: string[] } }>('/api/assignments', {
    jobId: job.id, crewId: crew.id, startDate: addDays(new Date().toISOString().slice(0, 10), 1), workingDays: 2, confirmDoubleBooking: true,
  });
  return { id: job.id, reference: job.reference, days: change.assignment.days };
}

function barOf(page: Page, jobId: string, phone: boolean): Locator {
  return phone ? page.locator(`.job[data-job-id="${jobId}"]`) : page.locator(`.bar[data-job-id="${jobId}"]:not([aria-busy="true"])`);
}

test.describe('weather stand-downs', () => {
  test('the office stands a job down from the board, previews the push, commits, and the owner\'s board follows', async ({ page, browser, request }, info) => {
    const phone = isPhone(info);
    const api = await apiAs(request, 'office');
    const job = await jobNextWeek(api, info);
    const [firstDay, lastDay] = [job.days[0]!, job.days[job.days.length - 1]!];

    const ownerContext = phone ? null : await browser.newContext({ viewport: { width: 1366, height: 900 }, locale: 'en-GB', timezoneId: 'Europe/London' });
    try {
      const ownerPage = ownerContext ? await ownerContext.newPage() : null;
      if (ownerPage) {
        await signIn(ownerPage, DEMO_USERS.owner.email, DEMO_USERS.owner.password);
        await expect(ownerPage.getByRole('status').filter({ hasText: /^Live$/ })).toBeVisible();
        await expect(barOf(ownerPage, job.id, false)).toHaveAttribute('data-end', lastDay);
        await ownerPage.evaluate(() => ((window as unknown as { notReloaded: boolean }).notReloaded = true));
      }

      await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
      const bar = barOf(page, job.id, phone);
      await expect(bar).toHaveAttribute('data-end', lastDay);
      // Each of the job's forecast days carries a marker with its word, never a colour alone, and opens its reasons;
      // on the phone each marker sits under the job's card with its date.
      const markers = page.locator(`.weather-marker[data-job-id="${job.id}"]`);
      await expect(markers.first()).toBeVisible();
      for (const marker of await markers.all()) await expect(marker).toHaveText(/Fine|Watch|Stop/);
      if (phone) await expect(page.getByRole('group', { name: `Weather for ${job.reference}` })).toContainText(/(Mon|Tue|Wed|Thu|Fri|Sat|Sun) \d+/);
      await markers.first().getByRole('button').click();
      const panel = page.getByRole('dialog', { name: `Weather for ${job.reference}` });
      await expect(panel.getByTestId('weather-safety-note')).toBeVisible();
      await shot(page, 'weather-board-reasons');
      await page.keyboard.press('Escape');
      await expect(panel).toBeHidden();
      if (!phone) {
        await bar.scrollIntoViewIfNeeded();
        await shot(page, 'weather-board-before');
      }

      await bar.click();
      await page.getByRole('menuitem', { name: 'Stand down…' }).click();
      const standDown = page.getByRole('dialog', { name: `Stand down ${job.reference}` });
      await expect(standDown.getByTestId('weather-safety-note')).toBeVisible();
      const firstBox = standDown.locator(`#stand-down-${firstDay}`);
      if (!(await firstBox.isChecked())) await standDown.getByText(new Intl.DateTimeFormat('en-GB', { weekday: 'short', day: 'numeric', month: 'short', timeZone: 'UTC' }).format(new Date(`${firstDay}T12:00:00Z`)).replace(',', ''), { exact: true }).click();
      await expect(firstBox).toBeChecked();
      // The dialog ticks the days whose forecast says stop; this test stands down the first day only.
      for (const box of await standDown.locator('input[id^="stand-down-"]:checked').all()) {
        if ((await box.getAttribute('id')) !== `stand-down-${firstDay}`) await box.uncheck({ force: true });
      }
      await expect(standDown.locator('input[id^="stand-down-"]:checked')).toHaveCount(1);
      await standDown.getByLabel('Reason').click();
      await page.getByRole('option', { name: 'Wind' }).click();
      await shot(page, 'weather-stand-down-dialog');
      await standDown.getByRole('button', { name: 'Stand down and re-plan…' }).click();

      const replan = page.getByRole('dialog', { name: `Re-plan ${job.reference}` });
      await expect(replan.getByLabel('Push this job', { exact: false }).first()).toBeChecked();
      const moves = replan.getByTestId('replan-moves');
      const row = moves.locator(`tr[data-job-id="${job.id}"]`);
      await expect(row).toBeVisible();
      await expect(replan.getByTestId('replan-lost-days')).toHaveText('1 working day lost to the weather.');
      await shot(page, 'weather-replan-preview');
      await replan.getByRole('button', { name: 'Commit re-plan' }).click();
      await expect(replan).toBeHidden();

      // One working day lost: the job now ends one working day later than it did.
      const newEnd = await expect.poll(async () => bar.getAttribute('data-end')).not.toBe(lastDay).then(() => bar.getAttribute('data-end'));
      expect(newEnd! > lastDay).toBe(true);
      await expect(bar).not.toHaveAttribute('data-start', addDays(firstDay, -1));
      if (!phone) await bar.scrollIntoViewIfNeeded();
      await shot(page, 'weather-board-after');

      if (ownerPage) {
        await expect(barOf(ownerPage, job.id, false)).toHaveAttribute('data-end', newEnd!);
        expect(await ownerPage.evaluate(() => (window as unknown as { notReloaded?: boolean }).notReloaded)).toBe(true);
      }

      // The job page tells the same story: the stand-down, re-planned.
      await page.goto(`/jobs/${job.id}`);
      const weather = page.getByTestId('job-weather');
      await expect(weather.getByText('Re-planned')).toBeVisible();
      await expect(weather.getByTestId('weather-safety-note')).toBeVisible();
      await weather.scrollIntoViewIfNeeded();
      await shot(page, 'weather-job-page');
    } finally {
      await ownerContext?.close();
    }
  });

  test('the outlook lists the coming week with the safety caution', async ({ page }, info) => {
    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    await page.goto('/weather');
    await expect(page.getByRole('heading', { level: 1, name: 'Weather outlook' })).toBeVisible();
    await expect(page.getByTestId('weather-safety-note')).toBeVisible();
    await expect(page.locator('section[data-date]')).toHaveCount(7);
    await shot(page, `weather-outlook-${info.project.name}`);
  });
});

test.describe('a firm\'s weather limits', () => {
  // Later tests read the demo firm's verdicts: whatever happens here, the firm goes back to the defaults.
  test.afterEach(async ({ request }) => {
    const owner = await request.post('/api/auth/sign-in', { data: DEMO_USERS.owner });
    const headers = { Authorization: `Bearer ${((await owner.json()) as { accessToken: string }).accessToken}` };
    const current = (await (await request.get('/api/weather/limits', { headers })).json()) as { version: number };
    await request.put('/api/weather/limits', { headers, data: { overrides: {}, version: current.version } });
  });

  test('lowers a weather limit on firm settings and the job\'s days turn to Stop, then resets it', async ({ page, request }, info) => {
    // Six page loads and two saves: more than the usual budget on a busy two-core machine.
    test.slow();
    const job = await jobNextWeek(await apiAs(request, 'office'), info);
    const markers = page.locator(`.weather-marker[data-job-id="${job.id}"]`);
    await signIn(page, DEMO_USERS.owner.email, DEMO_USERS.owner.password);
    await page.goto('/board');
    await expect(markers.first()).toBeVisible();
    const before = await markers.allInnerTexts();

    await page.goto('/firm');
    const limits = page.getByTestId('weather-limits');
    await expect(limits.getByTestId('weather-limits-caution')).toContainText('competent person');
    // Any gust at all now stops work from the scaffold this job needs.
    const gust = limits.getByLabel('Working from a scaffold or roof edge: stop at gusts of', { exact: true });
    await gust.fill('1');
    await gust.press('Tab');
    await expect(limits.locator('[data-limit="scaffoldUseGustStopMs"]')).toContainText('Default: 18 m/s (40 mph)');
    await limits.getByRole('button', { name: 'Save weather limits' }).click();
    await expect(page.getByText('Weather limits saved')).toBeVisible();
    await shot(page, 'weather-limits-saved');

    await page.goto('/board');
    await expect(markers.first()).toBeVisible();
    for (const marker of await markers.all()) await expect(marker).toHaveText(/Stop/);
    await shot(page, 'weather-limits-board');

    await page.goto('/firm');
    await limits.getByRole('button', { name: 'Reset all to defaults' }).click();
    await limits.getByRole('button', { name: 'Save weather limits' }).click();
    await expect(limits.getByText('Every limit is at its default.')).toBeVisible();
    await page.goto('/board');
    await expect(markers.first()).toBeVisible();
    await expect.poll(() => markers.allInnerTexts()).toEqual(before);
  });
});
