import { mkdir } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { test as base, expect, type APIRequestContext, type Locator, type Page, type TestInfo } from '@playwright/test';

export const DEMO_PASSWORD = 'Demo-pass-2026';

export const DEMO_USERS = {
  owner: { email: 'owner@demo.hodboard.test', password: DEMO_PASSWORD },
  office: { email: 'office@demo.hodboard.test', password: DEMO_PASSWORD },
  crewLead: { email: 'lead@demo.hodboard.test', password: DEMO_PASSWORD },
  operative: { email: 'operative@demo.hodboard.test', password: DEMO_PASSWORD },
} as const;

export type DemoRole = keyof typeof DEMO_USERS;

export interface CaughtMail {
  id: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  date: string;
}

const SCREENSHOT_DIR = fileURLToPath(new URL('../screenshots/', import.meta.url));

/** An address on the local mail catcher (its page at the root, its JSON under /messages), from E2E_MAIL_URL. */
export function mailUrl(path = ''): string {
  const base = process.env.E2E_MAIL_URL ?? 'http://127.0.0.1:1080';
  return new URL(path, base.endsWith('/') ? base : `${base}/`).toString();
}

/**
 * Signs in through the form and waits until the form is gone, so the next step starts
 * signed in. To check a refused sign-in, fill the form in the test itself.
 */
export async function signIn(page: Page, email: string, password: string): Promise<void> {
  // A fresh page has nothing loaded; the app's guard sends a signed-out visitor to sign-in.
  if (page.url() === 'about:blank') await page.goto('/');
  const emailField = page.getByLabel('Email', { exact: true });
  const passwordField = page.getByLabel('Password', { exact: true });
  await emailField.fill(email);
  await passwordField.fill(password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await expect(passwordField).toBeHidden();
}

export const isPhone = (info: TestInfo) => info.project.name === 'phone';

/** A signed-in API client, so a test can set up its own data without depending on what earlier runs left. */
export interface Api {
  get<T>(path: string): Promise<T>;
  post<T>(path: string, body: unknown): Promise<T>;
}

export async function apiAs(request: APIRequestContext, role: DemoRole): Promise<Api> {
  const res = await request.post('/api/auth/sign-in', { data: DEMO_USERS[role] });
  expect(res.ok(), await res.text()).toBe(true);
  const { accessToken } = (await res.json()) as { accessToken: string };
  const headers = { Authorization: `Bearer ${accessToken}` };
  const read = async <T>(res: Awaited<ReturnType<APIRequestContext['get']>>) => {
    expect(res.ok(), `${res.url()} answered ${res.status()}: ${await res.text()}`).toBe(true);
    return (await res.json()) as T;
  };
  return {
    get: async (path) => read(await request.get(path, { headers })),
    post: async (path, body) => read(await request.post(path, { headers, data: body })),
  };
}

export function addDays(date: string, days: number): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

/** Types an ISO day into a date field as the UK writes it, then closes the picker so it cannot cover the dialog's buttons. */
export async function fillDate(field: Locator, iso: string): Promise<void> {
  const [y, m, d] = iso.split('-');
  await field.fill(`${d}/${m}/${y}`);
  // Tab, not Escape: the calendar may already have closed itself (a scroll closes it), and Escape would then close the form's dialog.
  await field.press('Tab');
  await expect(field.page().getByRole('dialog', { name: 'Choose Date' })).toBeHidden();
}

/** Accepts the double-booking question when the chosen day is already taken (the demo board is full), and waits for what it settles to. */
export async function confirmIfAsked(page: Page, settled: Locator): Promise<void> {
  const bookAnyway = page.getByRole('button', { name: 'Book anyway' });
  await expect(bookAnyway.or(settled).first()).toBeVisible({ timeout: 10_000 });
  if (await bookAnyway.isVisible()) {
    await bookAnyway.click();
    // Until the question's dialog has finished closing (its button leaves the page last), it takes the next drag.
    await expect(bookAnyway).toHaveCount(0);
  }
  await expect(settled).toBeVisible();
}

export async function signInAs(page: Page, role: DemoRole): Promise<void> {
  await signIn(page, DEMO_USERS[role].email, DEMO_USERS[role].password);
}

export interface ReadMailOptions {
  /** Only mail whose subject contains this text or matches this pattern. */
  subject?: string | RegExp;
  timeoutMs?: number;
}

/** The newest mail to `to`, waiting for it to arrive (sending is asynchronous). */
export async function readMail(to: string, options: ReadMailOptions = {}): Promise<CaughtMail> {
  const deadline = Date.now() + (options.timeoutMs ?? 10_000);
  const { subject } = options;
  for (;;) {
    const res = await fetch(mailUrl(`messages?to=${encodeURIComponent(to)}`));
    if (!res.ok) throw new Error(`mail catcher answered ${res.status} at ${res.url}`);
    const messages = (await res.json()) as CaughtMail[];
    const match = messages.find((m) =>
      subject === undefined ? true : typeof subject === 'string' ? m.subject.includes(subject) : subject.test(m.subject),
    );
    if (match) return match;
    if (Date.now() > deadline) {
      throw new Error(`no mail to ${to}${subject ? ` with subject ${String(subject)}` : ''} arrived in time`);
    }
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
}

export async function clearMail(): Promise<void> {
  const res = await fetch(mailUrl('messages'), { method: 'DELETE' });
  if (!res.ok) throw new Error(`mail catcher answered ${res.status} to DELETE /messages`);
}

/** The first link in a mail's text whose URL contains `contains` (e.g. "/invite/"). */
export function linkIn(mail: CaughtMail, contains = ''): string {
  const link = (mail.text.match(/https?:\/\/[^\s<>"')\]]+/g) ?? []).find((url) => url.includes(contains));
  if (!link) throw new Error(`no link containing "${contains}" in mail "${mail.subject}"`);
  return link;
}

/** Saves a full-page screenshot as tests/screenshots/<project>-<name>.png. */
export async function shot(page: Page, name: string): Promise<string> {
  await mkdir(SCREENSHOT_DIR, { recursive: true });
  const path = `${SCREENSHOT_DIR}${base.info().project.name}-${name}.png`;
  await page.screenshot({ path, fullPage: true });
  return path;
}

interface HodboardFixtures {
  /** `shot(name)` for the test's own page. */
  pageShot: (name: string) => Promise<string>;
  /** `signInAs(role)` for the test's own page. */
  signInPageAs: (role: DemoRole) => Promise<void>;
}

export const test = base.extend<HodboardFixtures>({
  pageShot: async ({ page }, use) => {
    await use((name) => shot(page, name));
  },
  signInPageAs: async ({ page }, use) => {
    await use((role) => signInAs(page, role));
  },
});

export { expect };
