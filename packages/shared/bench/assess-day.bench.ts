import { Bench } from 'tinybench';
import { assessDay, spanFor, defaultWorkCalendar, type AssessDayInput, type ForecastHour, type PlannedActivity } from '../src/rules/index.js';

// The package is runtime-neutral (no Node or DOM types); the bench only needs these.
declare const console: { log(...args: unknown[]): void };
declare const performance: { now(): number };
declare const process: { env: Record<string, string | undefined> };

const JOB_DAYS = 10_000;
const HOURS = 72; // the day and the next 48 h, as the board sends it

function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
}

const plans: readonly PlannedActivity[][] = [
  ['bricklaying', 'work-at-height'],
  ['roof-work'],
  [{ activity: 'pointing', mortar: 'hydraulic-lime' }, 'tower'],
  ['scaffold-erection'],
  ['concrete', 'groundworks'],
  ['rendering', 'mewp', 'sheet-handling'],
];

function makeInputs(): AssessDayInput[] {
  const rnd = mulberry32(20260302);
  const out: AssessDayInput[] = [];
  const day0 = Date.UTC(2026, 0, 5);
  for (let j = 0; j < JOB_DAYS; j++) {
    const midnight = day0 + (j % 365) * 86_400_000;
    const base = -4 + rnd() * 30;
    const windBase = rnd() * 14;
    const wet = rnd();
    const forecast: ForecastHour[] = [];
    for (let h = 0; h < HOURS; h++) {
      const mean = Math.max(0, windBase + (rnd() - 0.5) * 4);
      forecast.push({
        time: new Date(midnight + h * 3_600_000).toISOString(),
        tempC: base + 5 * Math.sin(((h % 24) - 9) / 24 * 2 * Math.PI) + (rnd() - 0.5),
        windMeanMs: mean,
        windGustMs: mean * (1.3 + rnd() * 0.5),
        precipMm: wet > 0.6 ? rnd() * 3 : 0,
        precipProbability: wet > 0.6 ? rnd() : rnd() * 0.2,
      });
    }
    out.push({
      activities: plans[j % plans.length] as PlannedActivity[],
      forecast,
      window: { start: new Date(midnight + 8 * 3_600_000).toISOString(), end: new Date(midnight + 17 * 3_600_000).toISOString() },
    });
  }
  return out;
}

const inputs = makeInputs();
let sink = 0;

const bench = new Bench({ name: 'hodboard rules', time: 1500, warmup: true });
bench
  .add(`assessDay × ${JOB_DAYS} job-days`, () => {
    for (const input of inputs) sink += assessDay(input).activities.length;
  })
  .add('spanFor 20 working days', () => {
    sink += spanFor('2026-03-20', 20, defaultWorkCalendar).length;
  })
  .add('spanFor 20 working days, varied starts', () => {
    const d = 1 + (sink % 28);
    sink += spanFor(`2026-12-${d < 10 ? `0${d}` : d}`, 20, defaultWorkCalendar).length;
  });

const t0 = performance.now();
await bench.run();
const elapsed = performance.now() - t0;

const rows: Array<Record<string, string | number>> = [];
for (const task of bench.tasks) {
  const r = task.result;
  if (r.state !== 'completed') {
    console.log(`${task.name}: ${r.state}`);
    continue;
  }
  const opsPerSec = r.throughput.mean;
  if (task.name.startsWith('assessDay')) {
    const perSecond = Math.round(opsPerSec * JOB_DAYS);
    console.log(`${task.name}: ${perSecond.toLocaleString('en-GB')} job-days/s (${(r.latency.mean / JOB_DAYS * 1000).toFixed(2)} µs per job-day, ${r.latency.samplesCount} runs)`);
    rows.push({ figure: 'assessDay, job-days per second', hodboard: perSecond, target: '≥ 100000', met: perSecond >= 100_000 ? 'yes' : 'NO' });
  } else {
    console.log(`${task.name}: ${Math.round(opsPerSec).toLocaleString('en-GB')} ops/s (${(r.latency.mean * 1000).toFixed(2)} µs per call)`);
  }
}
console.log(`(bench ran ${(elapsed / 1000).toFixed(1)} s; checksum ${sink % 1000})`);
const resultsFile = process.env.BENCH_RESULTS_FILE;
if (resultsFile) {
  const fs = (await import('node:fs' as string)) as { writeFileSync(path: string, data: string): void };
  fs.writeFileSync(resultsFile, JSON.stringify(rows));
}
