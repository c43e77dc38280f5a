import type { Locator, Page, TestInfo } from '@playwright/test';
import { test, expect, addDays, apiAs, confirmIfAsked, fillDate, isPhone, signIn, shot, DEMO_USERS, type Api } from './fixtures';

interface CreatedJob {
  id: string;
  reference: string;
  version: number;
}

/** A fresh booked job of `days` working days, so it lands in the tray. */
async function bookedJob(api: Api, title: string, days: number, priority: 'normal' | 'urgent' = 'normal'): Promise<CreatedJob> {
  const sites = await api.get<{ items: Array<{ id: string; clientId: string }> }>('/api/sites?pageSize=1');
  const site = sites.items[0]!;
  const job = await api.post<CreatedJob>('/api/jobs', {
    clientId: site.clientId, siteId: site.id, title, workTypes: ['garden-wall'], estimatedWorkingDays: days, priority,
  });
  return api.post<CreatedJob>(`/api/jobs/${job.id}/status`, { status: 'booked', version: job.version });
}

interface SavedAssignment {
  id: string;
  jobId: string;
  crewId: string;
  startDate: string;
  workingDays: number;
  days: string[];
}

interface SavedBoard {
  days: Array<{ date: string; isWorkingDay: boolean }>;
  crews: Array<{ id: string; name: string; leave: Array<{ date: string }> }>;
  assignments: SavedAssignment[];
  trayJobIds: string[];
}

function readBoard(api: Api, from: string, to: string): Promise<SavedBoard> {
  return api.get<SavedBoard>(`/api/board?from=${from}&to=${to}`);
}

function crewNamed(board: SavedBoard, name: string): SavedBoard['crews'][number] {
  const crew = board.crews.find((c) => c.name === name);
  expect(crew, `the demo firm has ${name}`).toBeDefined();
  return crew!;
}

/** The days in range that crew works: the firm's working days less the whole crew's leave. */
function workingDaysOf(board: SavedBoard, crewName: string): string[] {
  const leave = new Set(crewNamed(board, crewName).leave.map((day) => day.date));
  return board.days.filter((day) => day.isWorkingDay && !leave.has(day.date)).map((day) => day.date);
}

/** A fresh job put straight on a crew, as if the office had placed it before this page opened. */
async function placedJob(api: Api, title: string, days: number, crewId: string, startDate: string): Promise<CreatedJob> {
  const job = await bookedJob(api, title, days);
  await api.post('/api/assignments', { jobId: job.id, crewId, startDate, confirmDoubleBooking: true });
  return job;
}

function unique(info: TestInfo): string {
  return `${info.project.name}-${Date.now().toString(36)}`;
}

function isoWeekday(date: string): number {
  const day = new Date(`${date}T00:00:00Z`).getUTCDay();
  return day === 0 ? 7 : day;
}

async function crewCells(page: Page, crew: string): Promise<Array<{ date: string; isWorking: boolean }>> {
  const cells = page.getByRole('group', { name: crew, exact: true }).locator('.cell[data-date]');
  // The heading shows before the board's data arrives; read the row only once it is drawn.
  await expect(cells.first()).toBeVisible();
  return cells.evaluateAll((elements) =>
    elements.map((el) => ({ date: (el as HTMLElement).dataset.date!, isWorking: (el as HTMLElement).dataset.working === 'true' })),
  );
}

/**
 * Drops `source` on a day cell. Bars cover most cells, so Playwright's hit check would refuse the cell;
 * the board reads the day from the pointer position, which is what a person dragging relies on too.
 */
async function dropOn(source: Locator, cell: Locator, grabAt?: { x: number; y: number }): Promise<void> {
  await source.dragTo(cell, { force: true, ...(grabAt ? { sourcePosition: grabAt } : {}) });
}

interface Box {
  x: number;
  y: number;
  width: number;
  height: number;
}

interface Point {
  x: number;
  y: number;
}

/**
 * Drags with the mouse from a point on `source` to a point on `target`, each worked out from its element's box, after
 * scrolling so that both are on screen at once: if the page scrolls while the button is down, the browser drops the drag.
 */
async function dragWithMouse(page: Page, source: Locator, grab: (box: Box) => Point, target: Locator, drop: (box: Box, from: Point) => Point): Promise<void> {
  await source.scrollIntoViewIfNeeded();
  const ends = async () => {
    const from = grab((await source.boundingBox())!);
    return { from, to: drop((await target.boundingBox())!, from) };
  };
  let { from, to } = await ends();
  const height = page.viewportSize()!.height;
  const onScreen = (point: Point) => point.y > 10 && point.y < height - 10;
  if (!onScreen(from) || !onScreen(to)) {
    await page.evaluate((by) => window.scrollBy(0, by), (from.y + to.y) / 2 - height / 2);
    ({ from, to } = await ends());
  }
  expect(onScreen(from) && onScreen(to), `both ends of the drag on screen: ${JSON.stringify({ from, to })}`).toBe(true);
  await page.mouse.move(from.x, from.y);
  await page.mouse.down();
  await page.mouse.move(from.x + 10, from.y, { steps: 3 });
  await page.mouse.move(to.x, to.y, { steps: 12 });
  await page.mouse.up();
}

const middleOf = (box: Box): Point => ({ x: box.x + box.width / 2, y: box.y + box.height / 2 });
/** Inside a bar's first day, so a move keeps that day under the pointer. */
const firstDayOf = (box: Box): Point => ({ x: box.x + 12, y: box.y + 12 });
/** A day cell spans every lane of its row; the row reads the day from x alone, so stay at the height the drag began. */
const sameRowAs = (box: Box, from: Point): Point => ({ x: box.x + box.width / 2, y: from.y });

/**
 * Waits for a place or move dialog to close, accepting the double-booking question if the server asks it. The dialog
 * stays open while the question is on its way, so "dialog still visible" cannot mean "no question coming".
 */
async function closesOnceConfirmed(page: Page, dialog: Locator): Promise<void> {
  await expect(async () => {
    await acceptDoubleBookingIfShown(page);
    await expect(dialog).toBeHidden({ timeout: 1_000 });
  }).toPass({ timeout: 15_000 });
}

/**
 * Clicks "Book anyway" if the double-booking question is showing. The click gives up after a second: a question
 * already closing leaves the page mid-click, and an unbounded click would then wait out the whole test inside a poll.
 */
async function acceptDoubleBookingIfShown(page: Page): Promise<void> {
  const bookAnyway = page.getByRole('button', { name: 'Book anyway' });
  if (await bookAnyway.isVisible()) await bookAnyway.click({ timeout: 1_000 }).catch(() => undefined);
}

/**
 * Reloads the board and waits for the weather outlook and the access bookings as well as the board itself: their
 * markers and bands add height to the lanes, so a bar located before they arrive may have moved when the button goes down.
 */
async function reloadBoard(page: Page): Promise<void> {
  const answered = ['/api/board?', '/api/weather/outlook', '/api/access-bookings'].map((path) =>
    page.waitForResponse((res) => res.url().includes(path)).then((res) => res.finished()),
  );
  await page.reload();
  await Promise.all(answered);
}

/** Of `dates`, the one where the crew has the fewest jobs, so a calendar day's "more" fold cannot hide one more. */
function quietestDay(board: SavedBoard, crewId: string, dates: string[]): string {
  const load = (date: string) => board.assignments.filter((a) => a.crewId === crewId && a.days.includes(date)).length;
  const quietest = dates.reduce((best, date) => (load(date) < load(best) ? date : best));
  expect(load(quietest), `a day with room on the calendar among ${dates.join(', ')}`).toBeLessThan(3);
  return quietest;
}

function savedBar(page: Page, jobId: string): Locator {
  return page.locator(`.bar[data-job-id="${jobId}"]:not([data-assignment-id^="pending:"]):not([aria-busy="true"])`);
}

test.describe('board', () => {
  test('the office drags a tray job onto a Thursday and its bar skips the weekend', async ({ page, request }, info) => {
    test.skip(isPhone(info), 'dragging onto the grid is a desktop task; phones get the menu');
    const office = await apiAs(request, 'office');
    const job = await bookedJob(office, `Boundary wall ${unique(info)}`, 3);

    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    await expect(page.getByRole('heading', { level: 1, name: 'Board' })).toBeVisible();
    const card = page.getByTestId('board-tray').getByRole('button', { name: new RegExp(`^${job.reference} `) });
    await expect(card).toBeVisible();

    const cells = await crewCells(page, 'Stack crew');
    const thursdayIndex = cells.findIndex((cell) => isoWeekday(cell.date) === 4 && cell.isWorking);
    expect(thursdayIndex, 'a working Thursday in the first week shown').toBeGreaterThanOrEqual(0);
    const thursday = cells[thursdayIndex]!.date;
    const expected = cells.slice(thursdayIndex).filter((cell) => cell.isWorking).slice(0, 3).map((cell) => cell.date);
    const weekend = cells.slice(thursdayIndex).filter((cell) => isoWeekday(cell.date) >= 6).slice(0, 2).map((cell) => cell.date);
    expect(weekend).toHaveLength(2);

    const target = page.getByRole('group', { name: 'Stack crew', exact: true }).locator(`.cell[data-date="${thursday}"]`);
    await dropOn(card, target);
    const bar = savedBar(page, job.id);
    await confirmIfAsked(page, bar);

    const worked = bar.locator('.segment[data-worked="true"]');
    await expect(worked).toHaveCount(3);
    expect(await worked.evaluateAll((els) => els.map((el) => (el as HTMLElement).dataset.date))).toEqual(expected);
    for (const day of expected) expect(isoWeekday(day)).toBeLessThanOrEqual(5);
    for (const day of weekend) await expect(bar.locator(`.segment[data-date="${day}"]`)).toHaveAttribute('data-worked', 'false');

    // The drawn bar must sit over the day columns it claims, not merely carry the right attributes.
    for (const day of expected) {
      const segmentBox = await bar.locator(`.segment[data-date="${day}"]`).boundingBox();
      const cellBox = await page.getByRole('group', { name: 'Stack crew', exact: true }).locator(`.cell[data-date="${day}"]`).boundingBox();
      expect(Math.abs(segmentBox!.x - cellBox!.x)).toBeLessThan(2);
      expect(Math.abs(segmentBox!.width - cellBox!.width)).toBeLessThan(2);
    }
    await expect(card).toBeHidden();
    await expect(page.getByTestId('board-announcement')).toContainText(`${job.reference} is now on Stack crew`);
    await bar.scrollIntoViewIfNeeded();
    await shot(page, 'board-placed');
  });

  test('a move made by the office appears on the owner\'s open board without a reload', async ({ browser, request }, info) => {
    test.skip(isPhone(info), 'the two-browser check runs once, on the desktop board');
    const office = await apiAs(request, 'office');
    const job = await bookedJob(office, `Gable repoint ${unique(info)}`, 2);

    const ownerContext = await browser.newContext();
    const officeContext = await browser.newContext();
    try {
      const ownerPage = await ownerContext.newPage();
      const officePage = await officeContext.newPage();
      await signIn(ownerPage, DEMO_USERS.owner.email, DEMO_USERS.owner.password);
      await signIn(officePage, DEMO_USERS.office.email, DEMO_USERS.office.password);
      await expect(ownerPage.getByRole('status').filter({ hasText: /^Live$/ })).toBeVisible();
      await expect(officePage.getByRole('heading', { level: 1, name: 'Board' })).toBeVisible();

      const cells = await crewCells(officePage, 'Pointing crew');
      const working = cells.filter((cell) => cell.isWorking);
      const [first, later] = [working[0]!.date, working[working.length - 3]!.date];

      const row = officePage.getByRole('group', { name: 'Pointing crew', exact: true });
      await dropOn(officePage.getByTestId('board-tray').getByRole('button', { name: new RegExp(`^${job.reference} `) }), row.locator(`.cell[data-date="${first}"]`));
      await confirmIfAsked(officePage, savedBar(officePage, job.id));

      await ownerPage.evaluate(() => ((window as unknown as { boardMarker: number }).boardMarker = 1));
      const ownerBar = savedBar(ownerPage, job.id);
      await expect(ownerBar).toHaveAttribute('data-start', first);

      // Held by its first day, so the bar's start lands on the day it is dropped on.
      await dropOn(savedBar(officePage, job.id), row.locator(`.cell[data-date="${later}"]`), { x: 12, y: 12 });
      await confirmIfAsked(officePage, officePage.locator(`.bar[data-job-id="${job.id}"][data-start="${later}"]:not([aria-busy="true"])`));

      await expect(ownerBar).toHaveAttribute('data-start', later);
      expect(await ownerPage.evaluate(() => (window as unknown as { boardMarker?: number }).boardMarker)).toBe(1);
      await ownerBar.scrollIntoViewIfNeeded();
      await shot(ownerPage, 'board-owner-live');
    } finally {
      await ownerContext.close();
      await officeContext.close();
    }
  });

  test('without a mouse, the office places a tray job from its menu, nudges it with the arrow keys and sends it back', async ({ page, request }, info) => {
    test.skip(isPhone(info), 'the grid and its keys are the desktop board; phones get the same menu on their list');
    const office = await apiAs(request, 'office');
    const job = await bookedJob(office, `Coping stones ${unique(info)}`, 1);

    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    await expect(page.getByRole('heading', { level: 1, name: 'Board' })).toBeVisible();
    const card = page.getByTestId('board-tray').getByRole('button', { name: new RegExp(`^${job.reference} `) });
    await card.focus();
    await page.keyboard.press('Enter');
    const place = page.getByRole('menuitem', { name: 'Place on a crew and day…' });
    await expect(place).toBeVisible();
    // The menu takes the focus; the first arrow press lands on its first item.
    await page.keyboard.press('ArrowDown');
    await expect(place).toHaveClass(/p-focus/);
    await page.keyboard.press('Enter');

    const dialog = page.getByRole('dialog');
    await expect(dialog).toBeVisible();
    const cells = await crewCells(page, 'Wall crew');
    // A Tuesday, so the next working day is the Wednesday after it whatever the weekend does.
    const day = cells.find((cell) => cell.isWorking && isoWeekday(cell.date) === 2 && cells.some((c) => c.date > cell.date && isoWeekday(c.date) === 3 && c.isWorking))!.date;
    const next = cells.find((cell) => cell.date > day && cell.isWorking)!.date;
    // Arrow down opens the crew list, then walks down it one crew per press until Wall crew has the focus.
    const crewBox = dialog.getByLabel('Crew');
    const wallCrew = page.getByRole('option', { name: 'Wall crew', exact: true });
    await expect(async () => {
      await crewBox.press('ArrowDown');
      await expect(wallCrew).toHaveAttribute('data-p-focused', 'true', { timeout: 500 });
    }).toPass({ timeout: 15_000 });
    await crewBox.press('Enter');
    await expect(crewBox).toHaveText('Wall crew');
    await fillDate(dialog.getByLabel('First day'), day);
    await expect(dialog.getByLabel('Working days')).toHaveValue('1');
    await dialog.getByLabel('Working days').press('Enter');
    const bar = savedBar(page, job.id);
    await confirmIfAsked(page, bar);
    await expect(bar).toHaveAttribute('data-start', day);
    await expect(page.getByTestId('board-announcement')).toContainText(`${job.reference} is now on Wall crew`);

    // Arrow right: one working day later. Shift + arrow right: one working day longer.
    await bar.focus();
    await page.keyboard.press('ArrowRight');
    await confirmIfAsked(page, page.locator(`.bar[data-job-id="${job.id}"][data-start="${next}"]:not([aria-busy="true"])`));
    await expect(bar).toBeFocused();
    await page.keyboard.press('Shift+ArrowRight');
    await confirmIfAsked(page, bar.locator('.segment[data-worked="true"]').nth(1));
    await expect(bar.locator('.segment[data-worked="true"]')).toHaveCount(2);
    const saved = await office.get<{ assignments: Array<{ jobId: string; startDate: string; workingDays: number }> }>(`/api/board?from=${day}&to=${day}`);
    expect(saved.assignments.find((a) => a.jobId === job.id)).toBeUndefined();
    const later = await office.get<{ assignments: Array<{ jobId: string; startDate: string; workingDays: number }> }>(`/api/board?from=${next}&to=${next}`);
    expect(later.assignments.find((a) => a.jobId === job.id)).toMatchObject({ startDate: next, workingDays: 2 });
    await shot(page, 'board-keyboard');

    // Delete: back to the tray, where the menu found it.
    await bar.focus();
    await page.keyboard.press('Delete');
    await expect(card).toBeVisible();
    await expect(page.locator(`.bar[data-job-id="${job.id}"]`)).toHaveCount(0);
  });

  test('on a phone the board does not jump while it connects and its weather and access lines arrive', async ({ page }, info) => {
    test.skip(!isPhone(info), 'the wrapping toolbar and the per-job lines are the phone layout');
    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    await page.goto('/');
    await page.addInitScript(() => {
      const shifts: number[] = [];
      (window as unknown as { hbShifts: number[] }).hbShifts = shifts;
      new PerformanceObserver((list) => {
        for (const entry of list.getEntries()) shifts.push((entry as PerformanceEntry & { value: number }).value);
      }).observe({ type: 'layout-shift', buffered: true });
    });
    await page.goto('/board');
    await expect(page.getByTestId('board')).toBeVisible();
    await expect(page.getByRole('status').filter({ hasText: /^Live$/ })).toBeVisible();
    await page.waitForTimeout(500);
    // Every shift counts, input or not. The status pill once changed width as the page connected, wrapping the toolbar
    // and moving the whole board by a row: about 0.1.
    const total = await page.evaluate(() => (window as unknown as { hbShifts: number[] }).hbShifts.reduce((sum, value) => sum + value, 0));
    expect(total).toBeLessThan(0.02);
  });

  test('on a phone the office moves a job to another crew from its menu', async ({ page, request }, info) => {
    test.skip(!isPhone(info), 'the phone list has no grid to drag on; its menu does the move');
    const office = await apiAs(request, 'office');
    const job = await bookedJob(office, `Pier rebuild ${unique(info)}`, 1);
    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    await expect(page.getByRole('heading', { level: 1, name: 'Board' })).toBeVisible();
    const from = await page.getByTestId('board').getAttribute('data-from');
    const board = await office.get<{ crews: Array<{ id: string; name: string }> }>(`/api/board?from=${from}&to=${from}`);
    const crewId = (name: string) => board.crews.find((crew) => crew.name === name)!.id;
    const placed = await office.post<{ assignment: { startDate: string } }>('/api/assignments', { jobId: job.id, crewId: crewId('Stack crew'), startDate: from, confirmDoubleBooking: true });

    const item = page.locator(`[data-assignment-id][data-job-id="${job.id}"]`);
    await expect(item).toBeVisible();
    await item.scrollIntoViewIfNeeded();
    await item.click();
    await page.getByRole('menuitem', { name: 'Move to another crew or day…' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByLabel('Crew').click();
    await page.getByRole('option', { name: 'Wall crew', exact: true }).click();
    await dialog.getByRole('button', { name: /^Move/ }).click();
    await closesOnceConfirmed(page, dialog);

    await expect.poll(async () => {
      const after = await office.get<{ assignments: Array<{ jobId: string; crewId: string; startDate: string }> }>(`/api/board?from=${from}&to=${placed.assignment.startDate}`);
      return after.assignments.find((a) => a.jobId === job.id)?.crewId;
    }).toBe(crewId('Wall crew'));
    await shot(page, 'board-phone-move');
  });

  test('the office stretches a bar by its end over a weekend, then pulls it back to one day, and both are saved', async ({ page, request }, info) => {
    test.skip(isPhone(info), 'the end handle is on the desktop grid; phones change the length from the menu');
    const office = await apiAs(request, 'office');
    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    const from = (await page.getByTestId('board').getAttribute('data-from'))!;
    const to = addDays(from, 13);
    const board = await readBoard(office, from, to);
    const working = workingDaysOf(board, 'Stack crew');
    // A Thursday with three more working days on the board: four days from it must cross a weekend.
    const startIndex = working.findIndex((date, index) => isoWeekday(date) === 4 && index + 3 < working.length);
    expect(startIndex, 'a working Thursday with a week after it on the board').toBeGreaterThanOrEqual(0);
    const lengthened = working.slice(startIndex, startIndex + 4);
    const [start, newEnd] = [lengthened[0]!, lengthened[3]!];
    const weekend = board.days.filter((day) => day.date > start && day.date < newEnd && isoWeekday(day.date) >= 6).map((day) => day.date);
    expect(weekend).toHaveLength(2);
    const job = await placedJob(office, `Retaining wall ${unique(info)}`, 2, crewNamed(board, 'Stack crew').id, start);

    await reloadBoard(page);
    const row = page.getByRole('group', { name: 'Stack crew', exact: true });
    const bar = savedBar(page, job.id);
    await expect(bar.locator('.segment[data-worked="true"]')).toHaveCount(2);

    await dragWithMouse(page, bar.getByTestId('bar-end'), middleOf, row.locator(`.cell[data-date="${newEnd}"]`), sameRowAs);
    await confirmIfAsked(page, bar.and(page.locator(`[data-end="${newEnd}"]`)));
    const worked = bar.locator('.segment[data-worked="true"]');
    await expect(worked).toHaveCount(4);
    expect(await worked.evaluateAll((els) => els.map((el) => (el as HTMLElement).dataset.date))).toEqual(lengthened);
    for (const day of weekend) await expect(bar.locator(`.segment[data-date="${day}"]`)).toHaveAttribute('data-worked', 'false');
    await expect(bar).toHaveAttribute('data-start', start);
    await expect(page.getByTestId('board-announcement')).toContainText(`${job.reference} is now on Stack crew`);
    await expect(page.getByTestId('board-announcement')).toContainText('4 working days');
    await bar.scrollIntoViewIfNeeded();
    await shot(page, 'board-lengthened');

    await reloadBoard(page);
    await expect(worked).toHaveCount(4);
    expect((await readBoard(office, from, to)).assignments.find((a) => a.jobId === job.id)).toMatchObject({ startDate: start, workingDays: 4, days: lengthened });

    await dragWithMouse(page, bar.getByTestId('bar-end'), middleOf, row.locator(`.cell[data-date="${start}"]`), sameRowAs);
    await confirmIfAsked(page, bar.and(page.locator(`[data-end="${start}"]`)));
    await expect(worked).toHaveCount(1);
    await expect.poll(async () => (await readBoard(office, from, to)).assignments.find((a) => a.jobId === job.id)?.workingDays).toBe(1);
  });

  test('the office drags a placed bar onto the tray and the job leaves the board for the tray', async ({ page, request }, info) => {
    test.skip(isPhone(info), 'dragging off the grid is a desktop task; phones use the menu\'s Back to tray');
    const office = await apiAs(request, 'office');
    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    const from = (await page.getByTestId('board').getAttribute('data-from'))!;
    const to = addDays(from, 13);
    const board = await readBoard(office, from, to);
    const job = await placedJob(office, `Path edging ${unique(info)}`, 2, crewNamed(board, 'Pointing crew').id, workingDaysOf(board, 'Pointing crew')[1]!);

    await reloadBoard(page);
    const bar = savedBar(page, job.id);
    await expect(bar).toBeVisible();
    const tray = page.getByTestId('board-tray');
    const card = tray.getByRole('button', { name: new RegExp(`^${job.reference} `) });
    await expect(card).toHaveCount(0);

    // The tray's heading, not its middle: a long tray runs below the fold.
    await dragWithMouse(page, bar, firstDayOf, tray, (box) => ({ x: box.x + 40, y: box.y + 16 }));
    await expect(card).toBeVisible();
    await expect(page.locator(`.bar[data-job-id="${job.id}"]`)).toHaveCount(0);
    await expect(page.getByTestId('board-announcement')).toContainText(`${job.reference} is back in the tray`);
    await shot(page, 'board-dragged-to-tray');

    const after = await readBoard(office, from, to);
    expect(after.trayJobIds).toContain(job.id);
    expect(after.assignments.find((a) => a.jobId === job.id)).toBeUndefined();
  });

  test('the office drags a bar down to another crew\'s row and the job moves to that crew on the same day', async ({ page, request }, info) => {
    test.skip(isPhone(info), 'dragging between rows is a desktop task; phones move a job from its menu');
    const office = await apiAs(request, 'office');
    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    const from = (await page.getByTestId('board').getAttribute('data-from'))!;
    const to = addDays(from, 13);
    const board = await readBoard(office, from, to);
    const wallDays = new Set(workingDaysOf(board, 'Wall crew'));
    const day = workingDaysOf(board, 'Stack crew').find((date) => wallDays.has(date) && isoWeekday(date) <= 3)!;
    const job = await placedJob(office, `Brick pier ${unique(info)}`, 2, crewNamed(board, 'Stack crew').id, day);

    await reloadBoard(page);
    const stackRow = page.getByRole('group', { name: 'Stack crew', exact: true });
    const wallRow = page.getByRole('group', { name: 'Wall crew', exact: true });
    await expect(stackRow.locator(`.bar[data-job-id="${job.id}"]`)).toBeVisible();

    // Held by its first day and dropped at the top of the other row, so the bar keeps its start.
    await dragWithMouse(page, savedBar(page, job.id), firstDayOf, wallRow.locator(`.cell[data-date="${day}"]`), (box) => ({ x: box.x + 12, y: box.y + 12 }));
    const moved = wallRow.locator(`.bar[data-job-id="${job.id}"][data-start="${day}"]:not([aria-busy="true"])`);
    await confirmIfAsked(page, moved);
    await expect(stackRow.locator(`.bar[data-job-id="${job.id}"]`)).toHaveCount(0);
    await expect(moved.locator('.segment[data-worked="true"]')).toHaveCount(2);
    await expect(page.getByTestId('board-announcement')).toContainText(`${job.reference} is now on Wall crew`);
    await moved.scrollIntoViewIfNeeded();
    await shot(page, 'board-moved-crew');

    expect((await readBoard(office, from, to)).assignments.find((a) => a.jobId === job.id)).toMatchObject({
      crewId: crewNamed(board, 'Wall crew').id, startDate: day, workingDays: 2,
    });
  });

  test('with the keyboard, Alt and the down arrow move a job to the crew below and Alt with the up arrow brings it back', async ({ page, request }, info) => {
    test.skip(isPhone(info), 'the grid and its keys are the desktop board');
    const office = await apiAs(request, 'office');
    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    const from = (await page.getByTestId('board').getAttribute('data-from'))!;
    const to = addDays(from, 13);
    await expect(page.locator('.crew-row').first()).toBeVisible();
    const rowIds = await page.locator('.crew-row[data-crew-id]').evaluateAll((rows) => rows.map((row) => (row as HTMLElement).dataset.crewId!));
    expect(rowIds.length).toBeGreaterThanOrEqual(2);
    const [topId, belowId] = [rowIds[0]!, rowIds[1]!];
    const board = await readBoard(office, from, to);
    const [top, below] = [board.crews.find((c) => c.id === topId)!, board.crews.find((c) => c.id === belowId)!];
    const belowDays = new Set(workingDaysOf(board, below.name));
    const day = workingDaysOf(board, top.name).find((date) => belowDays.has(date))!;
    const job = await placedJob(office, `Lintel swap ${unique(info)}`, 1, top.id, day);

    await reloadBoard(page);
    const topRow = page.getByRole('group', { name: top.name, exact: true });
    const belowRow = page.getByRole('group', { name: below.name, exact: true });
    const onTop = topRow.locator(`.bar[data-job-id="${job.id}"]:not([aria-busy="true"])`);
    const onBelow = belowRow.locator(`.bar[data-job-id="${job.id}"]:not([aria-busy="true"])`);
    await expect(onTop).toBeVisible();

    await onTop.focus();
    await page.keyboard.press('Alt+ArrowDown');
    await confirmIfAsked(page, onBelow);
    await expect(onTop).toHaveCount(0);
    await expect(onBelow).toHaveAttribute('data-start', day);
    // The bar is drawn afresh in the other row; the focus goes with it so the next key acts on the same job.
    await expect(onBelow).toBeFocused();
    await expect(page.getByTestId('board-announcement')).toContainText(`${job.reference} is now on ${below.name}`);
    await expect.poll(async () => (await readBoard(office, from, to)).assignments.find((a) => a.jobId === job.id)?.crewId).toBe(below.id);

    await page.keyboard.press('Alt+ArrowUp');
    await confirmIfAsked(page, onTop);
    await expect(onBelow).toHaveCount(0);
    await expect(onTop).toBeFocused();
    await expect.poll(async () => (await readBoard(office, from, to)).assignments.find((a) => a.jobId === job.id)?.crewId).toBe(top.id);
  });

  test('from a placed job\'s menu the office changes its length, then sends it back to the tray', async ({ page, request }, info) => {
    const office = await apiAs(request, 'office');
    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    const from = (await page.getByTestId('board').getAttribute('data-from'))!;
    const to = addDays(from, 13);
    const board = await readBoard(office, from, to);
    const working = workingDaysOf(board, 'Stack crew');
    const startIndex = working.findIndex((date, index) => isoWeekday(date) === 4 && index + 2 < working.length);
    expect(startIndex, 'a working Thursday with two working days after it on the board').toBeGreaterThanOrEqual(0);
    const job = await placedJob(office, `Sill repair ${unique(info)}`, 1, crewNamed(board, 'Stack crew').id, working[startIndex]!);

    await reloadBoard(page);
    // The desktop grid draws a bar, the phone list a card; both carry the assignment and open the same menu.
    const placed = page.locator(`[data-assignment-id][data-job-id="${job.id}"]:not([aria-busy="true"])`);
    await expect(placed).toBeVisible();
    await placed.scrollIntoViewIfNeeded();
    await placed.click();
    await page.getByRole('menuitem', { name: 'Change length…' }).click();
    const dialog = page.getByRole('dialog', { name: `Change the length of ${job.reference}` });
    await expect(dialog).toBeVisible();
    await expect(dialog.getByLabel('Crew')).toHaveCount(0);
    const length = dialog.getByLabel('Working days');
    await expect(length).toHaveValue('1');
    // Once open, the dialog puts the focus on its close button; a value typed before then is lost when the field blurs.
    await expect(dialog.getByRole('button', { name: 'Close' })).toBeFocused();
    await length.fill('3');
    await expect(length).toHaveValue('3');
    await dialog.getByRole('button', { name: 'Save length' }).click();
    await closesOnceConfirmed(page, dialog);

    await expect.poll(async () => (await readBoard(office, from, to)).assignments.find((a) => a.jobId === job.id)?.days).toEqual(working.slice(startIndex, startIndex + 3));
    if (isPhone(info)) await expect(placed).toContainText('3 days');
    else await expect(placed.locator('.segment[data-worked="true"]')).toHaveCount(3);
    await expect(page.getByTestId('board-announcement')).toContainText('3 working days');

    await placed.scrollIntoViewIfNeeded();
    await placed.click();
    await page.getByRole('menuitem', { name: 'Back to tray' }).click();
    const card = page.getByTestId('board-tray').getByRole('button', { name: new RegExp(`^${job.reference} `) });
    await expect(card).toBeVisible();
    await expect(page.locator(`[data-assignment-id][data-job-id="${job.id}"]`)).toHaveCount(0);
    await card.scrollIntoViewIfNeeded();
    await shot(page, 'board-menu-back-to-tray');
    const after = await readBoard(office, from, to);
    expect(after.trayJobIds).toContain(job.id);
    expect(after.assignments.find((a) => a.jobId === job.id)).toBeUndefined();
  });

  test('on the crew calendar the office drags a job to a later day and the board agrees', async ({ page, request }, info) => {
    test.skip(isPhone(info), 'dragging on the month grid is a desktop task');
    const office = await apiAs(request, 'office');
    const job = await bookedJob(office, `Garden steps ${unique(info)}`, 1);
    const today = new Date().toISOString().slice(0, 10);
    const ahead = new Date(Date.now() + 40 * 86_400_000).toISOString().slice(0, 10);
    const plan = await readBoard(office, today, ahead);
    const wall = crewNamed(plan, 'Wall crew');
    // Days the crew itself works (its alternate Fridays off would move the job), in the month the calendar opens on;
    // the later one the day with most room, so the job is not folded under "+ more".
    // Both must also lie in the two weeks the board opens on, from this week's Monday, where the move is checked after.
    const monthEnd = `${today.slice(0, 7)}-31`;
    const boardEnd = addDays(today, 13 - ((new Date(`${today}T12:00:00Z`).getUTCDay() + 6) % 7));
    const lastDay = monthEnd < boardEnd ? monthEnd : boardEnd;
    const working = workingDaysOf(plan, 'Wall crew').filter((date) => date > today && date <= lastDay);
    const start = working[0];
    const later = start ? working.filter((date) => date > addDays(start, 1)) : [];
    test.skip(!start || later.length === 0, 'too near the end of the month or the board\'s two weeks for a later day on the same page');
    const target = quietestDay(plan, wall.id, later);
    await office.post('/api/assignments', { jobId: job.id, crewId: wall.id, startDate: start, confirmDoubleBooking: true });

    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    await page.goto(`/calendar?crew=${wall.id}`);
    await expect(page.getByRole('heading', { level: 1, name: 'Crew calendar' })).toBeVisible();
    const event = page.locator('.fc-event').filter({ hasText: job.reference });
    await expect(event).toBeVisible();
    // The tray and the leave arrive after the grid and move its rows; measure once they have.
    await page.waitForLoadState('networkidle');
    await dragWithMouse(page, event, (box) => ({ x: box.x + 8, y: box.y + box.height / 2 }), page.locator(`.fc-daygrid-day[data-date="${target}"]`), middleOf);
    await expect.poll(async () => {
      await acceptDoubleBookingIfShown(page);
      const after = await office.get<{ assignments: Array<{ jobId: string; startDate: string }> }>(`/api/board?from=${today}&to=${ahead}`);
      return after.assignments.find((a) => a.jobId === job.id)?.startDate;
    }, { timeout: 15_000 }).toBe(target);
    await expect(page.locator(`.fc-daygrid-day[data-date="${target}"] .fc-event`).filter({ hasText: job.reference })).toBeVisible();
    await shot(page, 'crew-calendar-moved');

    await page.goto('/board');
    await expect(savedBar(page, job.id)).toHaveAttribute('data-start', target!);
  });

  test('a crew lead on a phone sees a job the office puts on their crew appear', async ({ page, request }, info) => {
    test.skip(!isPhone(info), 'this is the crew lead\'s phone view');
    const office = await apiAs(request, 'office');
    const job = await bookedJob(office, `Chimney flaunching ${unique(info)}`, 2);

    await signIn(page, DEMO_USERS.crewLead.email, DEMO_USERS.crewLead.password);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Board', exact: true }).click();
    await expect(page.getByRole('heading', { level: 1, name: 'Board' })).toBeVisible();
    await expect(page.getByRole('heading', { level: 2, name: 'Stack crew' })).toBeVisible();
    await expect(page.getByRole('heading', { level: 2, name: 'Wall crew' })).toHaveCount(0);
    await expect(page.getByRole('status').filter({ hasText: /^Live$/ })).toBeVisible();
    await expect(page.getByText(job.reference)).toHaveCount(0);

    const from = await page.getByTestId('board').getAttribute('data-from');
    const board = await office.get<{ crews: Array<{ id: string; name: string }> }>(`/api/board?from=${from}&to=${from}`);
    const stack = board.crews.find((crew) => crew.name === 'Stack crew')!;
    await office.post('/api/assignments', { jobId: job.id, crewId: stack.id, startDate: from, confirmDoubleBooking: true });

    const card = page.locator(`[data-assignment-id][data-job-id="${job.id}"]`);
    await expect(card).toBeVisible();
    await expect(card).toContainText(job.reference);
    await expect(card).toContainText('2 days');
    await card.scrollIntoViewIfNeeded();
    await shot(page, 'board-lead-phone');
  });
});

/** The first of next month, and the calendar's title for it ("January 2027"). */
function nextMonth(): { first: string; title: string } {
  const now = new Date();
  const first = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() + 1, 1));
  return { first: first.toISOString().slice(0, 10), title: first.toLocaleDateString('en-GB', { month: 'long', year: 'numeric', timeZone: 'UTC' }) };
}

/** Opens one crew's calendar on next month, so every day used lies ahead and sits in the grid's first rows, near the tray. */
async function openCalendarOnNextMonth(page: Page, crewId: string): Promise<void> {
  await page.goto(`/calendar?crew=${crewId}`);
  await expect(page.getByRole('heading', { level: 1, name: 'Crew calendar' })).toBeVisible();
  await expect(page.locator('.fc-daygrid-day').first()).toBeVisible();
  await page.locator('.fc-next-button').click();
  await expect(page.locator('.fc-toolbar-title')).toHaveText(nextMonth().title);
}

test.describe('crew calendar', () => {
  test('the office switches a crew\'s calendar to the week and sees the job on its day', async ({ page, request }, info) => {
    const office = await apiAs(request, 'office');
    const today = new Date().toISOString().slice(0, 10);
    const board = await readBoard(office, today, addDays(today, 20));
    const crew = crewNamed(board, 'Extension crew');
    const day = quietestDay(board, crew.id, workingDaysOf(board, crew.name).filter((date) => date > today).slice(0, 5));
    const job = await placedJob(office, `Porch step ${unique(info)}`, 1, crew.id, day);

    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    await page.goto(`/calendar?crew=${crew.id}`);
    await expect(page.getByRole('heading', { level: 1, name: 'Crew calendar' })).toBeVisible();
    await page.getByRole('button', { name: 'Week', exact: true }).click();
    const week = page.locator('.fc-timeGridWeek-view');
    await expect(week).toBeVisible();
    // The week view opens on the current week; the day may fall in the next one.
    const thisMonday = addDays(today, 1 - isoWeekday(today));
    for (let shown = thisMonday; day >= addDays(shown, 7); shown = addDays(shown, 7)) {
      await page.locator('.fc-next-button').click();
      await expect(week.locator(`.fc-col-header-cell[data-date="${addDays(shown, 7)}"]`)).toBeVisible();
    }

    const column = week.locator(`.fc-col-header-cell[data-date="${day}"]`);
    await expect(column).toBeVisible();
    const event = week.locator('.fc-daygrid-body .fc-event').filter({ hasText: job.reference });
    await expect(event).toBeVisible();
    await expect(event).toContainText('Porch step');
    // In the "Jobs" row, under its own day's column.
    const [eventBox, columnBox] = [(await event.boundingBox())!, (await column.boundingBox())!];
    expect(eventBox.x).toBeGreaterThanOrEqual(columnBox.x - 1);
    expect(eventBox.x + eventBox.width).toBeLessThanOrEqual(columnBox.x + columnBox.width + 1);
    await shot(page, 'crew-calendar-week');
  });

  test('on the month calendar the office stretches a job\'s end to a later day and its length is saved in working days', async ({ page, request }, info) => {
    test.skip(isPhone(info), 'stretching an event is a desktop pointer task; phones change the length from the menu');
    const office = await apiAs(request, 'office');
    const { first } = nextMonth();
    const board = await readBoard(office, first, addDays(first, 20));
    const stack = crewNamed(board, 'Stack crew');
    const working = workingDaysOf(board, 'Stack crew');
    // From a Thursday or Friday, three working days run over a weekend.
    const starts = working.filter((date, index) => isoWeekday(date) >= 4 && date < addDays(first, 14) && index + 2 < working.length);
    const startIndex = working.indexOf(quietestDay(board, stack.id, starts));
    const expected = working.slice(startIndex, startIndex + 3);
    const [start, end] = [expected[0]!, expected[2]!];
    const job = await placedJob(office, `Garden pillar ${unique(info)}`, 1, stack.id, start);

    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    await openCalendarOnNextMonth(page, stack.id);
    const event = page.locator(`.fc-daygrid-day[data-date="${start}"] .fc-event`).filter({ hasText: job.reference });
    await expect(event).toBeVisible();
    await event.hover();
    const resizer = event.locator('.fc-event-resizer-end');
    await expect(resizer).toBeVisible();
    const from = (await resizer.boundingBox())!;
    const target = page.locator(`.fc-daygrid-day[data-date="${end}"]`);
    const to = (await target.boundingBox())!;
    await page.mouse.move(from.x + from.width / 2, from.y + from.height / 2);
    await page.mouse.down();
    await page.mouse.move(from.x + from.width / 2 + 20, from.y + from.height / 2, { steps: 4 });
    await page.mouse.move(to.x + to.width / 2, to.y + to.height / 2, { steps: 12 });
    await page.mouse.up();

    await expect.poll(async () => {
      await acceptDoubleBookingIfShown(page);
      return (await readBoard(office, first, addDays(first, 20))).assignments.find((a) => a.jobId === job.id)?.days;
    }, { timeout: 15_000 }).toEqual(expected);
    // The job's last run now ends on the day it was stretched to.
    await expect.poll(async () => {
      const cell = (await target.boundingBox())!;
      const runs = await page.locator('.fc-daygrid-event').filter({ hasText: job.reference }).evaluateAll((els) => els.map((el) => el.getBoundingClientRect().right));
      return runs.some((right) => Math.abs(right - (cell.x + cell.width)) < 6);
    }).toBe(true);
    await shot(page, 'crew-calendar-resized');
  });

  test('the office drags a job from the calendar\'s tray onto a day and it is booked on that crew from that day', async ({ page, request }, info) => {
    test.skip(isPhone(info), 'dragging from the tray is a desktop pointer task; phones use its Place button');
    const office = await apiAs(request, 'office');
    const { first } = nextMonth();
    const board = await readBoard(office, first, addDays(first, 20));
    const stack = crewNamed(board, 'Stack crew');
    const day = quietestDay(board, stack.id, workingDaysOf(board, 'Stack crew').slice(0, 5));
    // Urgent jobs head the tray, so the card sits near the top of the page beside the month's first rows.
    const job = await bookedJob(office, `Boundary piers ${unique(info)}`, 2, 'urgent');

    await signIn(page, DEMO_USERS.office.email, DEMO_USERS.office.password);
    await openCalendarOnNextMonth(page, stack.id);
    const card = page.locator(`.cal-tray-item[data-job-id="${job.id}"]`);
    await expect(card).toBeVisible();
    await page.waitForLoadState('networkidle');
    await dragWithMouse(page, card.locator('.text'), (box) => ({ x: box.x + 20, y: box.y + box.height / 2 }), page.locator(`.fc-daygrid-day[data-date="${day}"]`), middleOf);

    await expect.poll(async () => {
      await acceptDoubleBookingIfShown(page);
      return (await readBoard(office, first, addDays(first, 20))).assignments.find((a) => a.jobId === job.id);
    }, { timeout: 15_000 }).toMatchObject({ crewId: stack.id, startDate: day, workingDays: 2 });
    await expect(card).toHaveCount(0);
    await expect(page.locator(`.fc-daygrid-day[data-date="${day}"] .fc-event`).filter({ hasText: job.reference })).toBeVisible();
    await shot(page, 'crew-calendar-from-tray');
  });
});
