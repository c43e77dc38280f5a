// The pages' budget (run by scripts/bench-pages.sh against the built app and the seeded demo firm): the JavaScript
// the crew home route loads (gzip), and Lighthouse 12's mobile run (simulated slow 4G, 4× CPU) of the crew
// home as the demo crew lead and of the office board as the demo office user, each signed in for real in the
// audited browser. Floor, in the same browser and run: Lighthouse on a bare static page (a heading and a line)
// served from loopback, which is what the throttled phone costs before any app at all.
// Usage: node scripts/bench-pages.mjs BASE_URL DIST_DIR. Writes rows to BENCH_RESULTS_FILE when set, and each
// page's median Lighthouse report and its trace into the folder BENCH_KEEP_REPORTS names, when set;
// BENCH_LIGHTHOUSE_RUNS sets the runs per page (5).
import { mkdirSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:http';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import lighthouse from 'lighthouse';
import { computeMedianRun } from 'lighthouse/core/lib/median-run.js';
import puppeteer from 'puppeteer-core';

// Budgets: route JS ≤ 200 KB gzip and first render ≤ 1.5 s on a throttled phone (crew-phone issue);
// Lighthouse performance and accessibility ≥ 95 on both pages.
const BUDGET_JS_GZIP_KB = 200;
const BUDGET_FIRST_RENDER_MS = 1500;
const BUDGET_SCORE = 95;
// Lighthouse's own advice for a figure to compare by: several runs, reported by the median one (closest to the
// median first paint and time to interactive), since one run moves by several points with what the machine is doing.
const RUNS = Number(process.env.BENCH_LIGHTHOUSE_RUNS ?? 5);
const PASSWORD = 'Demo-pass-2026';
const PAGES = [
  { label: 'crew home /crew (crew lead)', path: '/crew', email: 'lead@demo.hodboard.test', fcpBudget: BUDGET_FIRST_RENDER_MS },
  { label: 'office board /board (office)', path: '/board', email: 'office@demo.hodboard.test', fcpBudget: null },
];
// From the stack notes: Debian's Chromium, headless, nothing reaching out beyond loopback.
const CHROME_FLAGS = [
  '--headless=new', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update',
  '--disable-sync', '--no-first-run', '--host-resolver-rules=MAP * ~NOTFOUND, EXCLUDE 127.0.0.1',
];

const [baseUrl, distDir] = process.argv.slice(2);
if (!baseUrl || !distDir) throw new Error('usage: bench-pages.mjs BASE_URL DIST_DIR');
const assets = path.join(distDir, 'assets');

/** Static imports only: what the browser must fetch before the module runs (dynamic imports load later). */
function staticImports(file) {
  const code = readFileSync(path.join(assets, file), 'utf8');
  const found = new Set();
  for (const match of code.matchAll(/(?:import|export)\s*(?:[^'"()]*?from\s*)?["']\.\/([^"']+\.js)["']/g)) found.add(match[1]);
  return [...found];
}

function closure(roots) {
  const seen = new Set();
  const stack = [...roots];
  while (stack.length) {
    const file = stack.pop();
    if (seen.has(file)) continue;
    seen.add(file);
    stack.push(...staticImports(file));
  }
  return seen;
}

function crewRouteJs() {
  const html = readFileSync(path.join(distDir, 'index.html'), 'utf8');
  const entry = /<script[^>]+src="\/assets\/([^"]+\.js)"/.exec(html)?.[1];
  // The first script imports the app only after the shell has painted; the page preloads that code in its head.
  const preloaded = [...html.matchAll(/<link rel="modulepreload"[^>]*href="\/assets\/([^"]+\.js)"/g)].map((match) => match[1]);
  const view = readdirSync(assets).find((name) => /^CrewHomeView-[\w-]+\.js$/.test(name));
  if (!entry || !view) throw new Error('build has no entry script or no CrewHomeView chunk; run the web build first');
  let gzip = 0;
  for (const file of closure([entry, ...preloaded, view])) gzip += gzipSync(readFileSync(path.join(assets, file)), { level: 9 }).length;
  return gzip / 1024;
}

const FLOOR_HTML = `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="description" content="A bare page"><title>Today</title></head><body><main><h1>Today</h1><p>Nothing booked for today.</p></main></body></html>`;

/** One Lighthouse run of the page, retried when Chromium hands back a broken trace. */
async function runOnce(page, url) {
  // A trace can come back broken on a busy machine (NO_NAVSTART and the like); Lighthouse's advice is to run again.
  for (let attempt = 1; ; attempt += 1) {
    await page.goto('about:blank');
    const result = await lighthouse(url, {
      output: 'json', logLevel: 'error', onlyCategories: ['performance', 'accessibility'], formFactor: 'mobile', throttlingMethod: 'simulate',
    }, undefined, page);
    if (!result.lhr.runtimeError) return { lhr: result.lhr, trace: result.artifacts?.Trace };
    if (attempt === 3) throw new Error(`Lighthouse on ${url}: ${result.lhr.runtimeError.code} ${result.lhr.runtimeError.message}`);
    console.log(`Lighthouse on ${url}: ${result.lhr.runtimeError.code}; running it again`);
  }
}

async function audit(page, url) {
  const runs = [];
  for (let run = 0; run < RUNS; run += 1) runs.push(await runOnce(page, url));
  const median = computeMedianRun(runs.map((run) => run.lhr));
  const { lhr, trace } = runs.find((run) => run.lhr === median);
  const scores = runs.map((run) => Math.round((run.lhr.categories.performance.score ?? 0) * 100)).sort((a, b) => a - b);
  const firstPaints = runs.map((run) => Math.round(run.lhr.audits['first-contentful-paint']?.numericValue ?? 0)).sort((a, b) => a - b);
  if (process.env.BENCH_KEEP_REPORTS) {
    // The floor page sits at "/", so it is named apart from the app's pages.
    const name = new URL(url).pathname.replaceAll('/', '-').replace(/^-$/, '-floor');
    mkdirSync(process.env.BENCH_KEEP_REPORTS, { recursive: true });
    const file = path.join(process.env.BENCH_KEEP_REPORTS, `lighthouse${name}.json`);
    writeFileSync(file, JSON.stringify(lhr));
    // The unthrottled trace the scores were simulated from: where each long task went (chrome://tracing opens it).
    if (trace) writeFileSync(file.replace(/\.json$/, '.trace.json'), JSON.stringify(trace));
    console.log(`  median run's report: ${file}`);
  }
  const value = (id) => lhr.audits[id]?.numericValue ?? null;
  const failing = Object.values(lhr.audits).filter((a) => a.score !== null && a.score < 1 && lhr.categories.accessibility.auditRefs.some((r) => r.id === a.id && r.weight > 0));
  return {
    scores,
    firstPaints,
    finalUrl: lhr.finalDisplayedUrl,
    performance: Math.round((lhr.categories.performance.score ?? 0) * 100),
    accessibility: Math.round((lhr.categories.accessibility.score ?? 0) * 100),
    fcp: value('first-contentful-paint'),
    lcp: value('largest-contentful-paint'),
    tbt: value('total-blocking-time'),
    a11yFailing: failing.map((a) => a.id),
    renderBlocking: (lhr.audits['render-blocking-resources']?.details?.items ?? []).map((i) => `${new URL(i.url).pathname} (${Math.round(i.wastedMs ?? 0)} ms)`),
    // Where the main thread went (throttled figures), to read a low score by.
    bootup: (lhr.audits['bootup-time']?.details?.items ?? []).slice(0, 4).map((i) => `${i.url.startsWith('http') ? new URL(i.url).pathname : i.url} ${Math.round(i.scripting ?? 0)} ms scripting`),
    work: (lhr.audits['mainthread-work-breakdown']?.details?.items ?? []).slice(0, 4).map((i) => `${i.groupLabel ?? i.group} ${Math.round(i.duration ?? 0)} ms`),
  };
}

const floorServer = createServer((_req, res) => res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' }).end(FLOOR_HTML));
await new Promise((resolve) => floorServer.listen(0, '127.0.0.1', resolve));
const floorUrl = `http://127.0.0.1:${floorServer.address().port}/`;

const browser = await puppeteer.launch({ executablePath: process.env.CHROME_PATH ?? '/usr/bin/chromium', headless: true, args: CHROME_FLAGS });
const rows = [];
try {
  const floor = await audit(await browser.newPage(), floorUrl);
  const gzipKb = crewRouteJs();
  rows.push({ figure: 'crew route JS (gzip: entry, preloaded app, crew home view, their static imports), KB', hodboard: Number(gzipKb.toFixed(1)), floor: null, ratio: null, target: `≤ ${BUDGET_JS_GZIP_KB}`, met: gzipKb <= BUDGET_JS_GZIP_KB ? 'yes' : 'NO' });
  for (const target of PAGES) {
    // Each page in its own browser context, signed in the way the app does it: the sign-in call sets the
    // refresh cookie, and the page Lighthouse loads restores the session from it.
    const context = await browser.createBrowserContext();
    const page = await context.newPage();
    await page.goto(new URL('/sign-in', baseUrl).toString(), { waitUntil: 'load' });
    const status = await page.evaluate(async (email, password) => {
      const res = await fetch('/api/auth/sign-in', { method: 'POST', credentials: 'include', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ email, password }) });
      return res.status;
    }, target.email, PASSWORD);
    if (status !== 200) throw new Error(`sign-in as ${target.email} answered ${status}`);
    const url = new URL(target.path, baseUrl).toString();
    const lh = await audit(page, url);
    // What was audited, to look at: the page as Lighthouse left it, shown at the phone size it emulated.
    if (process.env.BENCH_RESULTS_FILE) {
      // Width and height only: changing isMobile or hasTouch would reload the page.
      await page.setViewport({ width: 412, height: 823 });
      await page.waitForNetworkIdle({ idleTime: 500, timeout: 10_000 }).catch(() => {});
      const shot = path.join(path.dirname(process.env.BENCH_RESULTS_FILE), `pages${target.path.replaceAll('/', '-')}.png`);
      await page.screenshot({ path: shot });
      console.log(`  screenshot: ${shot}`);
    }
    await context.close();
    if (new URL(lh.finalUrl).pathname !== target.path) throw new Error(`Lighthouse ended on ${lh.finalUrl}, not ${target.path}: the session did not restore`);
    console.log(`${target.label}: audited ${lh.finalUrl} (signed in as ${target.email}); performance over ${RUNS} runs: ${lh.scores.join(', ')}; first contentful paint: ${lh.firstPaints.join(', ')} ms`);
    if (lh.a11yFailing.length) console.log(`  accessibility audits not passed: ${lh.a11yFailing.join(', ')}`);
    for (const item of lh.renderBlocking) console.log(`  render-blocking: ${item}`);
    console.log(`  main thread: ${lh.work.join('; ')}`);
    console.log(`  scripts: ${lh.bootup.join('; ')}`);
    const name = `${target.label}, Lighthouse mobile, median of ${RUNS} runs:`;
    rows.push(
      { figure: `${name} performance score`, hodboard: lh.performance, floor: floor.performance, target: `≥ ${BUDGET_SCORE}`, met: lh.performance >= BUDGET_SCORE ? 'yes' : 'NO' },
      { figure: `${name} accessibility score`, hodboard: lh.accessibility, floor: floor.accessibility, target: `≥ ${BUDGET_SCORE}`, met: lh.accessibility >= BUDGET_SCORE ? 'yes' : 'NO' },
      { figure: `${name} first contentful paint, ms`, hodboard: Math.round(lh.fcp), floor: Math.round(floor.fcp), target: target.fcpBudget ? `≤ ${target.fcpBudget}` : '—', met: target.fcpBudget ? (lh.fcp <= target.fcpBudget ? 'yes' : 'NO') : '' },
      { figure: `${name} largest contentful paint, ms`, hodboard: Math.round(lh.lcp), floor: Math.round(floor.lcp), target: '—', met: '' },
      { figure: `${name} total blocking time, ms`, hodboard: Math.round(lh.tbt), floor: Math.round(floor.tbt), target: '—', met: '' },
    );
  }
} finally {
  await browser.close();
  floorServer.close();
}
for (const row of rows) if (row.floor !== null && row.ratio === undefined) row.ratio = Math.round((row.hodboard / Math.max(row.floor, 1)) * 100) / 100;
for (const row of rows) console.log(`${row.figure.padEnd(72)} ${String(row.hodboard).padStart(7)}  floor ${String(row.floor ?? '—').padStart(5)}  target ${row.target} ${row.met}`);
if (process.env.BENCH_RESULTS_FILE) writeFileSync(process.env.BENCH_RESULTS_FILE, JSON.stringify(rows));
