import { fileURLToPath } from 'node:url';
import type { APIRequestContext, Page, TestInfo } from '@playwright/test';
import { test, expect, signIn, shot, DEMO_USERS } from './fixtures';

// The crew's phone, one-handed, at a common phone size.
test.use({ viewport: { width: 390, height: 844 }, screen: { width: 390, height: 844 } });
test.beforeEach(({}, info) => {
  test.skip(info.project.name !== 'phone', 'the crew journeys are phone journeys');
});

/** A modal sits in the viewport, which a full-page capture loses: this one keeps what the phone shows. */
async function screenShot(page: Page, info: TestInfo, name: string): Promise<void> {
  await page.screenshot({ path: fileURLToPath(new URL(`../screenshots/${info.project.name}-${name}.png`, import.meta.url)) });
}

async function tokenFor(request: APIRequestContext, who: keyof typeof DEMO_USERS): Promise<string> {
  const res = await request.post('/api/auth/sign-in', { data: DEMO_USERS[who] });
  expect(res.ok()).toBe(true);
  return ((await res.json()) as { accessToken: string }).accessToken;
}

/** Two small JPEGs drawn in the page, as a phone camera would hand them over. */
async function photos(page: Page): Promise<Array<{ name: string; mimeType: string; buffer: Buffer }>> {
  const urls = await page.evaluate(() =>
    ['#9c4221', '#2f6f6a'].map((colour) => {
      const canvas = document.createElement('canvas');
      canvas.width = 640;
      canvas.height = 480;
      const context = canvas.getContext('2d')!;
      context.fillStyle = colour;
      context.fillRect(0, 0, 640, 480);
      context.fillStyle = '#f6e7df';
      for (let row = 0; row < 8; row += 1) for (let col = 0; col < 6; col += 1) context.fillRect(col * 110 + (row % 2) * 55, row * 60, 100, 50);
      return canvas.toDataURL('image/jpeg', 0.9);
    }),
  );
  return urls.map((url, index) => ({ name: `wall-${index + 1}.jpg`, mimeType: 'image/jpeg', buffer: Buffer.from(url.split(',')[1]!, 'base64') }));
}

/** The crew home's second section: "Tomorrow", or "Next working day" on a Friday or before a holiday. */
const NEXT_DAY = /^(Tomorrow|Next working day)/;

async function okJson<T>(response: Awaited<ReturnType<APIRequestContext['get']>>): Promise<T> {
  expect(response.ok(), await response.text()).toBe(true);
  return (await response.json()) as T;
}

interface OwnJob {
  reference: string;
  /** The section of the crew home its card is in. */
  section: RegExp;
  remove(): Promise<void>;
}

/**
 * A one-day job of the test's own on the lead's crew, booked over what is there from today (or from the next working
 * day): at a weekend or on a holiday a span from today starts on the next working day, so the test has a card to work
 * on whatever day it runs.
 */
async function ownJobForLead(request: APIRequestContext, title: string, from: 'today' | 'nextDay' = 'today'): Promise<OwnJob> {
  const office = { Authorization: `Bearer ${await tokenFor(request, 'office')}` };
  const lead = { Authorization: `Bearer ${await tokenFor(request, 'crewLead')}` };
  const days = await okJson<{ today: string; nextDay: string; days: Array<{ crewId: string; crewName: string }> }>(await request.get('/api/crew-days', { headers: lead }));
  const crewId = days.days.find((day) => day.crewName === 'Stack crew')!.crewId;
  const sites = await okJson<{ items: Array<{ id: string; clientId: string }> }>(await request.get('/api/sites?pageSize=1', { headers: office }));
  const created = await okJson<{ id: string; version: number }>(await request.post('/api/jobs', {
    headers: office,
    data: { clientId: sites.items[0]!.clientId, siteId: sites.items[0]!.id, title: `${title} ${Date.now().toString(36)}`, workTypes: ['repointing'], estimatedWorkingDays: 1 },
  }));
  const job = await okJson<{ id: string; version: number; reference: string }>(await request.post(`/api/jobs/${created.id}/status`, { headers: office, data: { status: 'booked', version: created.version } }));
  const placed = await okJson<{ assignment: { id: string; days: string[] } }>(await request.post('/api/assignments', {
    headers: office,
    data: { jobId: job.id, crewId, startDate: days[from], confirmDoubleBooking: true },
  }));
  return {
    reference: job.reference,
    section: placed.assignment.days[0] === days.today ? /^Today/ : NEXT_DAY,
    async remove() {
      // Read again: what the test did may have moved the assignment's version on.
      const now = await okJson<{ days: Array<{ assignmentId: string; assignmentVersion: number }> }>(await request.get('/api/crew-days', { headers: lead }));
      const version = now.days.find((day) => day.assignmentId === placed.assignment.id)?.assignmentVersion;
      if (version !== undefined) await okJson(await request.delete(`/api/assignments/${placed.assignment.id}?version=${version}`, { headers: office }));
    },
  };
}

test.describe('the crew phone', () => {
  test('a lead sees tomorrow with its notes, adds two photos, stands down for wind and the office sees it live', async ({ page, browser, request }, info) => {
    test.setTimeout(90_000);
    await signIn(page, DEMO_USERS.crewLead.email, DEMO_USERS.crewLead.password);
    await expect(page.getByRole('heading', { level: 1, name: 'Your days' })).toBeVisible();
    const tomorrow = page.getByRole('region', { name: NEXT_DAY });
    const card = tomorrow.getByRole('article').first();
    await expect(card.getByRole('heading', { level: 3 })).toContainText(/J\d{4}/);
    await expect(card.getByRole('link', { name: 'Open in maps' })).toHaveAttribute('href', /^geo:/);
    await expect(card.getByRole('link', { name: /^Call / })).toHaveAttribute('href', /^tel:/);
    await expect(card.getByRole('region', { name: 'Site notes' }).getByRole('listitem').first()).toBeVisible();
    await shot(page, 'crew-home');

    const photoList = card.getByRole('region', { name: 'Photos' }).getByRole('listitem');
    const before = await photoList.count();
    // Hold each upload's answer back a moment, so the progress state is on screen long enough to see.
    await page.route('**/api/photos', async (route) => {
      await new Promise((resolve) => setTimeout(resolve, 700));
      await route.continue();
    });
    await card.getByLabel(/^Photos for J\d{4}$/).setInputFiles(await photos(page));
    await expect(card.getByText(/Uploading \d+%|Waiting to send/).first()).toBeVisible();
    await shot(page, 'crew-photos-uploading');
    await expect(page.getByRole('region', { name: 'Photos' }).first()).toBeVisible();
    await expect(photoList).toHaveCount(before + 2, { timeout: 15_000 });
    await expect(card.getByText(/Uploading|Waiting to send/)).toHaveCount(0, { timeout: 15_000 });
    const thumbs = card.getByRole('region', { name: 'Photos' }).locator('img[src*="/api/public/photos/"]');
    await expect(thumbs).toHaveCount(before + 2);
    // Thumbnails load lazily, so bring them on screen as a lead scrolling to them would.
    await thumbs.last().scrollIntoViewIfNeeded();
    await expect.poll(() => thumbs.evaluateAll((imgs) => imgs.filter((img) => (img as HTMLImageElement).naturalWidth > 0).length)).toBe(before + 2);
    await page.unroute('**/api/photos');

    const office = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true, locale: 'en-GB', timezoneId: 'Europe/London' });
    const officePage = await office.newPage();
    await signIn(officePage, DEMO_USERS.office.email, DEMO_USERS.office.password);
    await officePage.goto('/crew');
    const reference = (await card.getByRole('heading', { level: 3 }).innerText()).match(/J\d{4}/)![0];
    const officeCard = officePage.getByRole('region', { name: NEXT_DAY }).getByRole('article').filter({ hasText: reference }).first();
    await expect(officeCard).toBeVisible();
    await expect(officeCard.getByRole('status')).toHaveCount(0);

    await card.getByRole('button', { name: 'Stand down for weather' }).click();
    const dialog = page.getByRole('dialog');
    await expect(dialog.getByText(/competent person on site decides/)).toBeVisible();
    await dialog.getByText('Wind', { exact: true }).click();
    await dialog.getByLabel('Note for the office (optional)').fill('Gusts lifting the sheeting on the top lift');
    await screenShot(page, info, 'crew-stand-down');
    await dialog.getByRole('button', { name: 'Next' }).click();
    await dialog.getByRole('button', { name: 'Confirm stand-down' }).click();
    await expect(card.getByRole('status')).toContainText('Stood down for wind', { timeout: 15_000 });

    // No reload in the office: the push over the socket brings it.
    await expect(officeCard.getByRole('status')).toContainText('Stood down for wind', { timeout: 15_000 });
    await shot(officePage, 'crew-office-sees-hold');
    await office.close();

    const token = await tokenFor(request, 'crewLead');
    const holds = await request.get('/api/weather-holds', { headers: { Authorization: `Bearer ${token}` } });
    const wind = ((await holds.json()) as Array<{ jobReference: string; reason: string; notes: string | null }>)
      .filter((hold) => hold.jobReference === reference && hold.notes === 'Gusts lifting the sheeting on the top lift');
    expect(wind).toHaveLength(1);
  });

  test('a note and a stand-down made with no signal wait on the phone and arrive once when it returns', async ({ page, context, request }) => {
    test.setTimeout(90_000);
    const own = await ownJobForLead(request, 'Sill pointing');
    const reference = own.reference;
    await signIn(page, DEMO_USERS.crewLead.email, DEMO_USERS.crewLead.password);
    const card = page.getByRole('region', { name: own.section }).getByRole('article').filter({ hasText: reference }).first();
    await expect(card.getByRole('button', { name: 'Stand down for weather' })).toBeVisible();
    // A phone that has the app's code: the service worker holds it once installed (a first visit that loses its
    // signal sooner is the next test's).
    await page.evaluate(async () => {
      await navigator.serviceWorker.ready;
    });
    const noteText = `Mortar boards washed and stacked ${Date.now().toString(36)}`;

    await context.setOffline(true);
    await expect(page.getByRole('status').filter({ hasText: 'No signal' })).toBeVisible();
    await card.getByRole('button', { name: 'Add note' }).click();
    await card.getByLabel('New site note').fill(noteText);
    await card.getByRole('button', { name: 'Save note' }).click();
    await card.getByRole('button', { name: 'Stand down for weather' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByText('Rain', { exact: true }).click();
    await dialog.getByRole('button', { name: 'Next' }).click();
    await expect(dialog.getByText(/No signal: this waits on the phone/)).toBeVisible();
    await dialog.getByRole('button', { name: 'Confirm stand-down' }).click();

    const outbox = page.getByRole('region', { name: /waiting to send/ });
    await expect(outbox).toContainText('2 waiting to send');
    await expect(card.getByRole('region', { name: 'Site notes' }).getByText('Waiting to send')).toBeVisible();
    await expect(card.getByText(/Stand-down for rain waiting to send/)).toBeVisible();
    await shot(page, 'crew-offline-waiting');

    await context.setOffline(false);
    await expect(outbox).toHaveCount(0, { timeout: 20_000 });
    await expect(card.getByText(noteText)).toHaveCount(1);
    await expect(card.getByRole('status')).toContainText('Stood down for rain');
    // A second trip through the network must not send anything again.
    await context.setOffline(true);
    await context.setOffline(false);
    await page.waitForTimeout(1500);

    const token = await tokenFor(request, 'crewLead');
    const auth = { Authorization: `Bearer ${token}` };
    const days = (await (await request.get('/api/crew-days', { headers: auth })).json()) as { days: Array<{ job: { id: string; reference: string } }> };
    const jobId = days.days.find((day) => day.job.reference === reference)!.job.id;
    const notes = (await (await request.get(`/api/site-notes?jobId=${jobId}`, { headers: auth })).json()) as Array<{ body: string }>;
    expect(notes.filter((note) => note.body === noteText)).toHaveLength(1);
    const holds = (await (await request.get(`/api/weather-holds?jobId=${jobId}`, { headers: auth })).json()) as Array<{ reason: string }>;
    expect(holds.filter((hold) => hold.reason === 'rain')).toHaveLength(1);
    await shot(page, 'crew-back-online');
    await own.remove();
  });

  test.describe('on a first visit', () => {
    // No service worker yet, as on a phone that has not kept the app's code, so the page's own requests are all there is.
    test.use({ serviceWorkers: 'block' });

    test('a stand-down form whose code had not arrived when the signal went says so, and opens when the signal is back', async ({ page, context, request }, info) => {
      test.setTimeout(90_000);
      const own = await ownJobForLead(request, 'Gable verge');
      // The form's code never gets through while this holds: the signal went as it was on its way.
      const formCode = '**/assets/CrewStandDownDialog-*.js';
      await page.route(formCode, (route) => route.abort('internetdisconnected'));
      await signIn(page, DEMO_USERS.crewLead.email, DEMO_USERS.crewLead.password);
      const card = page.getByRole('region', { name: own.section }).getByRole('article').filter({ hasText: own.reference }).first();
      await expect(card.getByRole('button', { name: 'Stand down for weather' })).toBeVisible();

      await context.setOffline(true);
      await card.getByRole('button', { name: 'Stand down for weather' }).click();
      const notice = page.getByRole('status').filter({ hasText: 'This form had not reached the phone' });
      await expect(notice).toContainText('It opens by itself when the signal is back');
      await expect(page.getByRole('dialog')).toHaveCount(0);
      await screenShot(page, info, 'crew-form-on-its-way');

      await page.unroute(formCode);
      await context.setOffline(false);
      const dialog = page.getByRole('dialog');
      await expect(dialog.getByText(/competent person on site decides/)).toBeVisible({ timeout: 15_000 });
      await expect(notice).toHaveCount(0);
      await dialog.getByText('Frost or cold', { exact: true }).click();
      await dialog.getByRole('button', { name: 'Next' }).click();
      await dialog.getByRole('button', { name: 'Confirm stand-down' }).click();
      await expect(card.getByRole('status')).toContainText(/Stood down for frost/i, { timeout: 15_000 });
      await own.remove();
    });
  });

  test("reopened with no signal, the phone shows the crew home from what it saved, and what waits is still queued", async ({ page, context, request }, info) => {
    test.setTimeout(90_000);
    const own = await ownJobForLead(request, 'Lintel check');
    await signIn(page, DEMO_USERS.crewLead.email, DEMO_USERS.crewLead.password);
    const tomorrowCard = page.getByRole('region', { name: NEXT_DAY }).getByRole('article').first();
    const tomorrowRef = (await tomorrowCard.getByRole('heading', { level: 3 }).innerText()).match(/J\d{4}/)![0];
    // The installed app's code must be on the phone before the signal goes: wait for the service worker.
    await page.evaluate(async () => {
      await navigator.serviceWorker.ready;
    });
    const todayRef = own.reference;
    const todayCard = page.getByRole('region', { name: own.section }).getByRole('article').filter({ hasText: todayRef }).first();
    const noteText = `Lintel bearings checked ${Date.now().toString(36)}`;

    await context.setOffline(true);
    await todayCard.getByRole('button', { name: 'Add note' }).click();
    await todayCard.getByLabel('New site note').fill(noteText);
    await todayCard.getByRole('button', { name: 'Save note' }).click();
    await expect(page.getByRole('region', { name: /waiting to send/ })).toContainText('1 waiting to send');

    await page.reload();
    await expect(page.getByRole('heading', { level: 1, name: 'Your days' })).toBeVisible();
    await expect(page).toHaveURL(/\/crew$/);
    await expect(page.getByRole('status').filter({ hasText: 'Offline — showing what was last seen' })).toBeVisible();
    await expect(page.getByRole('region', { name: NEXT_DAY }).getByRole('article').filter({ hasText: tomorrowRef })).toBeVisible();
    const outbox = page.getByRole('region', { name: /waiting to send/ });
    await expect(outbox).toContainText('1 waiting to send');
    const reopenedToday = page.getByRole('region', { name: own.section }).getByRole('article').filter({ hasText: todayRef }).first();
    await expect(reopenedToday.getByRole('region', { name: 'Site notes' }).getByText('Waiting to send')).toBeVisible();
    await screenShot(page, info, 'crew-reopened-offline');

    await context.setOffline(false);
    await expect(outbox).toHaveCount(0, { timeout: 20_000 });
    await expect(page.getByRole('status').filter({ hasText: 'Offline — showing what was last seen' })).toHaveCount(0);
    await expect(reopenedToday.getByText(noteText)).toHaveCount(1);

    const token = await tokenFor(request, 'crewLead');
    const auth = { Authorization: `Bearer ${token}` };
    const days = (await (await request.get('/api/crew-days', { headers: auth })).json()) as { days: Array<{ job: { id: string; reference: string } }> };
    const jobId = days.days.find((day) => day.job.reference === todayRef)!.job.id;
    const notes = (await (await request.get(`/api/site-notes?jobId=${jobId}`, { headers: auth })).json()) as Array<{ body: string }>;
    expect(notes.filter((note) => note.body === noteText)).toHaveLength(1);
    await own.remove();
  });

  // Last in the file: it puts a second job on the crew's tomorrow for as long as it runs.
  test("the lead's phone says so when the office puts a job on their crew's tomorrow", async ({ page, request }, info) => {
    await signIn(page, DEMO_USERS.crewLead.email, DEMO_USERS.crewLead.password);
    await expect(page.getByRole('heading', { level: 1, name: 'Your days' })).toBeVisible();
    // The phone connects for pushes once its days have loaded.
    await expect(page.locator('.crew-home[data-live="live"]')).toBeVisible({ timeout: 15_000 });

    const job = await ownJobForLead(request, 'Coping stones', 'nextDay');

    const banner = page.getByRole('alert').filter({ hasText: /(Tomorrow|Monday|Tuesday|Wednesday|Thursday|Friday)'s job changed/ });
    await expect(banner).toContainText(job.reference);
    await expect(banner).toContainText(/It is new for (tomorrow|\w+day):/);
    await screenShot(page, info, 'crew-tomorrow-changed');
    await banner.getByRole('button', { name: 'Dismiss' }).click();
    await expect(banner).toHaveCount(0);

    await job.remove();
  });
});
