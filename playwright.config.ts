import { defineConfig, devices } from '@playwright/test';

// Debian's Chromium, never a downloaded browser. The flags keep it from calling outside hosts:
// the resolver maps every name except the loopback ones to "not found".
const chromium = {
  browserName: 'chromium' as const,
  launchOptions: {
    executablePath: process.env.E2E_CHROMIUM ?? '/usr/bin/chromium',
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--no-first-run',
      '--disable-quic',
      '--disable-features=AutofillServerCommunication,MediaRouter,OptimizationHints',
      '--host-resolver-rules=MAP * ~NOTFOUND, EXCLUDE 127.0.0.1, EXCLUDE localhost',
    ],
  },
};

export default defineConfig({
  testDir: 'tests/e2e',
  outputDir: 'test-results/e2e',
  timeout: 30_000,
  expect: { timeout: 5_000 },
  fullyParallel: false,
  forbidOnly: Boolean(process.env.CI),
  retries: 0,
  // Tests share one seeded database; one worker keeps them from racing for the same rows.
  workers: Number(process.env.E2E_WORKERS ?? 1),
  reporter: [['list'], ['json', { outputFile: process.env.E2E_JSON_REPORT ?? 'test-results/e2e.json' }]],
  use: {
    ...chromium,
    baseURL: process.env.E2E_BASE_URL ?? 'http://127.0.0.1:3000',
    locale: 'en-GB',
    timezoneId: 'Europe/London',
    trace: 'retain-on-failure',
    screenshot: 'only-on-failure',
  },
  projects: [
    { name: 'desktop', use: { ...chromium, viewport: { width: 1366, height: 900 } } },
    {
      name: 'phone',
      use: {
        ...devices['Pixel 7'],
        ...chromium,
        viewport: { width: 412, height: 915 },
        screen: { width: 412, height: 915 },
        isMobile: true,
        hasTouch: true,
      },
    },
  ],
});
