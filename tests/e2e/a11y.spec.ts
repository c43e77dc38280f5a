import { readFileSync } from 'node:fs';
import AxeBuilder from '@axe-core/playwright';
import type { APIRequestContext, Page } from '@playwright/test';
import { DEMO_USERS, expect, signInAs, test, type DemoRole } from './fixtures';

/**
 * Every route of the web app, read from its route table so a new view cannot be left out: the test fails when a
 * route has no visit below.
 */
const ROUTES_FILE = new URL('../../apps/web/src/router/routes.ts', import.meta.url);
const declared = [...readFileSync(ROUTES_FILE, 'utf8').matchAll(/path: '([^']+)',\s*\n\s*name: '([^']+)'/g)].map((match) => ({ path: match[1]!, name: match[2]! }));

interface Visit {
  /** Who looks at it: a demo user, or nobody signed in. */
  as: DemoRole | 'guest';
  url: (ids: DemoIds) => string;
  /** The view's heading, which shows it has rendered, not a spinner. */
  ready?: string;
  /** A button that opens the view's form dialog, scanned too while open. */
  dialog?: string;
}

interface DemoIds {
  jobId: string;
  quoteId: string;
}

const visits: Record<string, Visit> = {
  'sign-in': { as: 'guest', url: () => '/sign-in' },
  'sign-up': { as: 'guest', url: () => '/sign-up' },
  'accept-invite': { as: 'guest', url: () => '/accept-invite' },
  'forgot-password': { as: 'guest', url: () => '/forgot-password' },
  'reset-password': { as: 'guest', url: () => '/reset-password' },
  // Without a real link these show their "link not valid" state, which is part of the view too.
  'quote-client': { as: 'guest', url: () => '/q/AbCdEfGhIjKlMnOpQrStUvWx' },
  'supplier-response': { as: 'guest', url: () => '/supplier-response' },
  home: { as: 'owner', url: () => '/' },
  'crew-home': { as: 'crewLead', url: () => '/crew', ready: 'Your days' },
  'crew-calendar': { as: 'crewLead', url: () => '/calendar' },
  board: { as: 'office', url: () => '/board', ready: 'Board' },
  job: { as: 'office', url: (ids) => `/jobs/${ids.jobId}` },
  'time-off': { as: 'office', url: () => '/time-off', ready: 'Leave and closures', dialog: 'Add leave or closure' },
  jobs: { as: 'office', url: () => '/jobs', ready: 'Jobs', dialog: 'New job' },
  crews: { as: 'office', url: () => '/crews', ready: 'Crews', dialog: 'New crew' },
  clients: { as: 'office', url: () => '/clients', ready: 'Clients', dialog: 'New client' },
  sites: { as: 'office', url: () => '/sites', ready: 'Sites', dialog: 'New site' },
  people: { as: 'owner', url: () => '/people', ready: 'People', dialog: 'Invite someone' },
  'firm-settings': { as: 'owner', url: () => '/firm' },
  quotes: { as: 'owner', url: () => '/quotes' },
  quote: { as: 'owner', url: (ids) => `/quotes/${ids.quoteId}` },
  materials: { as: 'owner', url: () => '/materials', ready: 'Price list', dialog: 'Add material' },
  'costing-settings': { as: 'owner', url: () => '/costing' },
  'costing-report': { as: 'owner', url: () => '/margins' },
  suppliers: { as: 'office', url: () => '/suppliers', ready: 'Access suppliers', dialog: 'New supplier' },
  'access-bookings': { as: 'office', url: () => '/access', ready: 'Access bookings' },
  'weather-outlook': { as: 'office', url: () => '/weather' },
  'not-allowed': { as: 'operative', url: () => '/not-allowed' },
  'not-found': { as: 'owner', url: () => '/no-such-page' },
};

/**
 * Serious violations still to fix in the web app, each as a view and an axe rule: any other violation fails, and a
 * line here whose violation is gone is reported so it can be deleted. Empty is the goal, and where it stands.
 */
const KNOWN: ReadonlySet<string> = new Set<string>([]);

async function demoIds(request: APIRequestContext): Promise<DemoIds> {
  const signedIn = await request.post('/api/auth/sign-in', { data: DEMO_USERS.owner });
  expect(signedIn.ok()).toBe(true);
  const headers = { Authorization: `Bearer ${((await signedIn.json()) as { accessToken: string }).accessToken}` };
  const jobs = (await (await request.get('/api/jobs', { headers })).json()) as { items: Array<{ id: string }> };
  const quotes = (await (await request.get('/api/quotes', { headers })).json()) as { items?: Array<{ id: string }> } | Array<{ id: string }>;
  const quoteList = Array.isArray(quotes) ? quotes : (quotes.items ?? []);
  return { jobId: jobs.items[0]!.id, quoteId: quoteList[0]?.id ?? jobs.items[0]!.id };
}

async function seriousViolations(page: Page) {
  const result = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa', 'best-practice']).analyze();
  return result.violations
    .filter((violation) => violation.impact === 'serious' || violation.impact === 'critical')
    .map((violation) => ({
      rule: violation.id,
      impact: violation.impact,
      help: violation.help,
      where: violation.nodes.slice(0, 3).map((node) => node.target.join(' ')),
    }));
}

test('every route of the web app has an accessibility visit', () => {
  expect(declared.length).toBeGreaterThan(20);
  expect(declared.filter((route) => !visits[route.name]).map((route) => route.name)).toEqual([]);
});

for (const role of ['guest', 'owner', 'office', 'crewLead', 'operative'] as const) {
  const names = Object.entries(visits).filter(([, visit]) => visit.as === role).map(([name]) => name);
  test(`shows ${role === 'guest' ? 'a visitor' : `the ${role}`} no serious or critical axe violations on ${names.join(', ')}`, async ({ page, request }) => {
    test.setTimeout(180_000);
    const ids = await demoIds(request);
    if (role !== 'guest') await signInAs(page, role);
    const found: Record<string, unknown> = {};
    const stillKnown = new Set<string>();
    for (const name of names) {
      const visit = visits[name]!;
      await page.goto(visit.url(ids));
      await page.waitForLoadState('networkidle');
      await expect(page.locator('main, [role="main"], form').first()).toBeVisible();
      if (visit.ready) await expect(page.getByRole('heading', { name: visit.ready, exact: true }).first()).toBeVisible();
      const record = async (where: string) => {
        const violations = (await seriousViolations(page)).filter((violation) => {
          const key = `${where} ${violation.rule}`;
          if (!KNOWN.has(key)) return true;
          stillKnown.add(key);
          return false;
        });
        if (violations.length) found[`${where} (${page.url().replace(/^https?:\/\/[^/]+/, '')})`] = violations;
      };
      await record(name);
      if (visit.dialog) {
        await page.getByRole('button', { name: visit.dialog, exact: true }).first().click();
        await expect(page.getByRole('dialog')).toBeVisible();
        // Colours read in the middle of the dialog's opening fade are not the ones people see.
        await page.waitForFunction(() => document.getAnimations().every((animation) => animation.playState !== 'running'));
        await record(`${name}-dialog`);
        await page.keyboard.press('Escape');
        await expect(page.getByRole('dialog')).toBeHidden();
      }
    }
    const fixed = [...KNOWN].filter((key) => names.includes(key.split(' ')[0]!.replace(/-dialog$/, '')) && !stillKnown.has(key));
    if (fixed.length) test.info().annotations.push({ type: 'fixed, delete from KNOWN', description: fixed.join('; ') });
    expect(found).toEqual({});
  });
}
