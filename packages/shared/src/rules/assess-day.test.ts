import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { activities } from './activities.js';
import { assessDay, assessDayInputSchema, worseVerdict } from './assess-day.js';
import { daylight, workingWindow } from './daylight.js';
import { calmMildHour, DAY, DAY_AND_48H, FULL_HOURS, hourlyForecast, inWindow, TO_HORIZON, WINDOW } from './fixtures/forecast-builder.js';
import { resolveRuleSettings } from './settings.js';

/** Any hour of British weather the rules must cope with, from hard frost to heat, calm to gale, dry to downpour. */
const anyHour = fc.record({
  tempC: fc.double({ min: -8, max: 36, noNaN: true }),
  windMeanMs: fc.double({ min: 0, max: 20, noNaN: true }),
  windGustMs: fc.double({ min: 0, max: 30, noNaN: true }),
  precipMm: fc.double({ min: 0, max: 5, noNaN: true }),
  precipProbability: fc.double({ min: 0, max: 1, noNaN: true }),
});
describe('assessDay', () => {
  it('gives go with the whole window usable on a calm mild day', () => {
    // Source: Hodboard rule — no reason gives go with the whole window usable; 12 °C, 2 m/s mean and 4 m/s gusts sit below every default limit (settings.test.ts)
    const day = assessDay({ activities: ['bricklaying', 'mewp'], forecast: hourlyForecast(DAY, FULL_HOURS), window: WINDOW });
    expect(day.verdict).toBe('go');
    expect(day.windowHours).toBe(9);
    expect(day.activities.map((a) => [a.activity, a.verdict, a.usableHours, a.reasons.length, a.notes.length])).toEqual([
      ['bricklaying', 'go', 9, 0, 0],
      ['mewp', 'go', 9, 0, 0],
    ]);
    expect(day.notes).toEqual([]);
    expect(day.activities[0]?.mortar).toBe('cement');
  });

  it('takes the worst verdict of the day’s activities', () => {
    // Source: Hodboard rule — the day is the worst of its activities. 16 m/s gusts: MEWP stop at 12.5 m/s (BS EN 280, IPAF FAQ 5848, secondary copy); scaffold-use caution from 0.8 × 18 m/s (common practice, no source)
    const forecast = hourlyForecast(DAY, FULL_HOURS, (h) => (inWindow(h) ? { windMeanMs: 9, windGustMs: 16 } : {}));
    const day = assessDay({ activities: ['bricklaying', 'work-at-height', 'mewp'], forecast, window: WINDOW });
    expect(day.activities.map((a) => a.verdict)).toEqual(['go', 'caution', 'stop']);
    expect(day.verdict).toBe('stop');
    expect(worseVerdict('caution', 'go')).toBe('caution');
  });

  it('stops an activity with too few usable hours and says why', () => {
    // Source: minimum usable hours, common practice, no source
    const forecast = hourlyForecast(DAY, 12);
    const a = assessDay({ activities: ['mewp'], forecast, window: WINDOW }).activities[0];
    expect(a?.usableHours).toBe(4);
    expect(a?.verdict).toBe('caution');
    const strict = assessDay({ activities: ['mewp'], forecast, window: WINDOW, settings: resolveRuleSettings({ minUsableHours: 5 }) }).activities[0];
    expect(strict?.verdict).toBe('stop');
    expect(strict?.reasons.at(-1)).toMatchObject({ ruleId: 'day.usable-hours', threshold: 5, observed: 4 });
  });

  it.each([
    ['2026-03-02T07:59:24Z', 2.01, 'caution'], // Source: minimum usable hours 2 h, common practice, no source — just above
    ['2026-03-02T08:00:00Z', 2, 'caution'], // Source: minimum usable hours 2 h, common practice, no source — at the limit, the day can start
    ['2026-03-02T08:00:36Z', 1.99, 'stop'], // Source: minimum usable hours 2 h, common practice, no source — just below
  ])('with the forecast ending at 10:00 and the window from %s, %d usable h → %s', (start, usable, expected) => {
    // Ten forecast hours from midnight: the window's usable hours end at 10:00, the rest is not forecast (a caution).
    const a = assessDay({ activities: ['mewp'], forecast: hourlyForecast(DAY, 10), window: { start, end: WINDOW.end } }).activities[0];
    expect(a?.usableHours).toBe(usable);
    expect(a?.verdict).toBe(expected);
    const short = a?.reasons.find((r) => r.ruleId === 'day.usable-hours');
    if (expected === 'stop') {
      expect(short).toMatchObject({ verdict: 'stop', threshold: 2, observed: 1.99 });
      // Rounded down in words, so a day just short of the minimum never reads as meeting it.
      expect(short?.message).toMatch(/^Only 1\.9 usable h of /);
    }
    else expect(short).toBeUndefined();
  });

  it('stops fresh mortar work when rain stops part of the day, though enough dry hours are left to start', () => {
    // Source: NBS F10/185 cover the work during rain (secondary copy); 0.5 mm/h at 50 % stops fresh work, common practice, no source
    const forecast = hourlyForecast(DAY, FULL_HOURS, (h) => (h >= 9 && h < 15 ? { precipMm: 2.5, precipProbability: 0.85 } : {}));
    const day = assessDay({ activities: [{ activity: 'bricklaying' }, 'groundworks'], forecast, window: WINDOW });
    const brick = day.activities[0];
    expect(brick?.usableHours).toBe(3);
    expect(brick?.reasons.map((r) => [r.ruleId, r.verdict])).toEqual([['rain.fresh-work', 'stop']]);
    expect(brick?.verdict).toBe('stop');
    expect(day.activities[1]?.verdict).toBe('go');
    expect(day.verdict).toBe('stop');
  });

  it('gives every activity the worst verdict of its reasons, and the day the worst of its activities', () => {
    // Source: Hodboard rule — the day verdict is the worst of its activities, an activity's the worst of its reasons
    const rank = { go: 0, caution: 1, stop: 2 } as const;
    fc.assert(
      fc.property(fc.array(anyHour, { minLength: 24, maxLength: 24 }), fc.subarray([...activities], { minLength: 1 }), fc.constantFrom<'uk' | 'us'>('uk', 'us'), (hours, planned, practice) => {
        const forecast = hours.map((h, i) => ({ ...h, time: new Date(Date.parse(DAY) + i * 3_600_000).toISOString() }));
        const day = assessDay({ activities: planned, forecast, window: WINDOW, settings: resolveRuleSettings({ practice }) });
        let worstActivity = 0;
        for (const a of day.activities) {
          const worstReason = Math.max(0, ...a.reasons.map((r) => rank[r.verdict]));
          expect(rank[a.verdict]).toBe(worstReason);
          worstActivity = Math.max(worstActivity, rank[a.verdict]);
        }
        expect(rank[day.verdict]).toBe(worstActivity);
      }),
      { numRuns: 300 },
    );
  });

  it('rolls the activities\' notes up to the day, each once, without lowering any verdict', () => {
    // Source: Hodboard rule — with the standard forecast (the day and the next 48 h) the look-ahead periods past it are notes;
    // NHBC Standards 2023 §3.2.5 six days of frost protection for mortar, ACI 306R 72 h for concrete (period from memory)
    const day = assessDay({ activities: ['bricklaying', 'pointing', 'concrete', 'mewp'], forecast: hourlyForecast(DAY, DAY_AND_48H), window: WINDOW });
    expect(day.verdict).toBe('go');
    expect(day.activities.map((a) => [a.activity, a.verdict, a.reasons.length, a.notes.map((n) => n.ruleId)])).toEqual([
      ['bricklaying', 'go', 0, ['forecast.reach.frost-protection']],
      ['pointing', 'go', 0, ['forecast.reach.frost-protection']],
      ['concrete', 'go', 0, ['forecast.reach.concrete-protection']],
      ['mewp', 'go', 0, []],
    ]);
    expect(day.notes.map((n) => [n.ruleId, n.activities])).toEqual([
      ['forecast.reach.frost-protection', ['bricklaying', 'pointing']],
      ['forecast.reach.concrete-protection', ['concrete']],
    ]);
    expect(day.notes[0]).toMatchObject({ message: day.activities[0]?.notes[0]?.message, uncovered: day.activities[0]?.notes[0]?.uncovered });
  });

  it('gives the same verdicts and reasons for any forecast that reaches the day and the next 48 h, however much longer', () => {
    // Source: Hodboard rule — the part of a look-ahead period past the standard input only ever adds a note. The weather past the
    // horizon is the calm mild hour, which no default rule reacts to (settings.test.ts)
    fc.assert(
      fc.property(
        fc.array(anyHour, { minLength: TO_HORIZON, maxLength: TO_HORIZON }), fc.integer({ min: TO_HORIZON, max: FULL_HOURS }),
        fc.subarray([...activities], { minLength: 1 }), fc.constantFrom<'uk' | 'us'>('uk', 'us'),
        (hours, length, planned, practice) => {
          const full = hourlyForecast(DAY, FULL_HOURS, (h) => hours[h] ?? calmMildHour);
          const settings = resolveRuleSettings({ practice });
          const long = assessDay({ activities: planned, forecast: full, window: WINDOW, settings });
          const cut = assessDay({ activities: planned, forecast: full.slice(0, length), window: WINDOW, settings });
          expect(cut.verdict).toBe(long.verdict);
          // The frost caution's text says how far ahead it looked, so the texts may differ; all else matches.
          const judged = (d: typeof long) => d.activities.map((a) => [a.verdict, a.usableHours, a.reasons.map(({ message: _, ...r }) => r)]);
          expect(judged(cut)).toEqual(judged(long));
          expect(long.notes).toEqual([]);
          const mortar = practice === 'uk' && planned.some((a) => a === 'bricklaying' || a === 'pointing' || a === 'rendering');
          // Frost protection runs to hour 8 + 144 of the forecast, ACI 306R to hour 8 + 72.
          const noted = (mortar && length < 8 + 144) || (planned.includes('concrete') && length < 8 + 72);
          expect(cut.notes.length > 0).toBe(noted);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('counts part hours at the edges of the window', () => {
    // Source: Hodboard rule — a forecast hour stands for the hour from its time, and part hours in the window count pro rata
    const day = assessDay({ activities: ['tower'], forecast: hourlyForecast(DAY), window: { start: '2026-03-02T07:45:00Z', end: '2026-03-02T16:30:00Z' } });
    expect(day.windowHours).toBe(8.75);
    expect(day.activities[0]?.usableHours).toBe(8.75);
  });

  it('does not count hours the forecast leaves out, and says so', () => {
    // Source: Hodboard rule — every working hour needs a forecast hour (SOURCES.forecast); 12 h from midnight leave 12:00–17:00 out
    const forecast = hourlyForecast(DAY, 12);
    const a = assessDay({ activities: ['roof-work'], forecast, window: WINDOW }).activities[0];
    expect(a?.usableHours).toBe(4);
    expect(a?.reasons[0]).toMatchObject({ ruleId: 'forecast.missing', verdict: 'caution', observed: 5 });
  });

  it('reads a window given with an offset the same as its UTC twin', () => {
    // Source: RFC 3339 §5.6 (ISO 8601 offsets) — 08:00+01:00 is 07:00Z
    const forecast = hourlyForecast('2026-07-01T23:00:00Z');
    const a = assessDay({ activities: ['mewp'], forecast, window: { start: '2026-07-02T08:00:00+01:00', end: '2026-07-02T17:00:00+01:00' } });
    const b = assessDay({ activities: ['mewp'], forecast, window: { start: '2026-07-02T07:00:00Z', end: '2026-07-02T16:00:00Z' } });
    expect(a).toEqual(b);
  });

  it('has 23 hours in the day the clocks go forward and 25 in the day they go back', () => {
    // Source: UK summer time starts 29 Mar 2026 and ends 25 Oct 2026 at 01:00 UTC — from memory
    const spring = assessDay({
      activities: ['groundworks'],
      forecast: hourlyForecast('2026-03-29T00:00:00Z', 48),
      window: { start: '2026-03-29T00:00:00+00:00', end: '2026-03-30T00:00:00+01:00' },
    });
    expect(spring.windowHours).toBe(23);
    expect(spring.activities[0]?.usableHours).toBe(23);
    const autumn = assessDay({
      activities: ['groundworks'],
      forecast: hourlyForecast('2026-10-24T23:00:00Z', 48),
      window: { start: '2026-10-25T00:00:00+01:00', end: '2026-10-26T00:00:00+00:00' },
    });
    expect(autumn.windowHours).toBe(25);
  });

  it('takes a daylight-cut winter window from workingWindow', () => {
    // Source: common practice, no source — the window is cut to sunrise–sunset; the times are checked against astronomy-engine in daylight.test.ts
    const light = daylight('2026-12-21', 51.5074, -0.1278);
    const w = workingWindow('2026-12-21', { start: '07:30', end: '17:00' }, 'Europe/London', { times: light });
    if (w === null) throw new Error('expected a window');
    const day = assessDay({ activities: ['bricklaying'], forecast: hourlyForecast('2026-12-21T00:00:00Z'), window: w });
    expect(day.windowHours).toBeCloseTo(w.hours, 9);
    expect(day.windowHours).toBeLessThan(8);
  });

  it('gives every reason a rule id, a threshold, the observed value, a source and plain text', () => {
    // Source: Hodboard rule — every reason carries a stable rule id, its threshold, the observed value, a source label and a plain message
    const forecast = hourlyForecast(DAY, 72, (h) => (inWindow(h) ? { tempC: 2, windMeanMs: 11, windGustMs: 19, precipMm: 1, precipProbability: 0.9 } : { tempC: -1 }));
    const day = assessDay({ activities: ['bricklaying', 'work-at-height', 'roof-work', 'concrete'], forecast, window: WINDOW });
    const reasons = day.activities.flatMap((a) => a.reasons);
    expect(reasons.length).toBeGreaterThan(6);
    for (const r of reasons) {
      expect(r.ruleId).toMatch(/^[a-z]+(\.[a-z0-9-]+)+$/);
      expect(Number.isFinite(r.threshold)).toBe(true);
      expect(Number.isFinite(r.observed)).toBe(true);
      expect(r.source.length).toBeGreaterThan(10);
      expect(r.message).not.toMatch(/undefined|NaN/);
    }
    expect(day.activities.find((a) => a.activity === 'work-at-height')?.advice[0]).toMatch(/competent person/);
  });

  it.each([
    [{ window: { start: WINDOW.end, end: WINDOW.start } }, /end after it starts/],
    [{ window: { start: '2026-03-02T08:00:00', end: WINDOW.end } }, /offset/],
    [{ activities: [] }, /at least one activity/],
    [{ activities: ['juggling'] }, /unknown activity/],
    [{ forecast: [...hourlyForecast(DAY, 12)].reverse() }, /time order/],
    [{ forecast: hourlyForecast(DAY, 12, (h) => (h === 9 ? { tempC: Number.NaN } : {})) }, /non-numeric/],
  ])('refuses bad input %j with a clear error', (patch, message) => {
    // Source: Hodboard rule — bad input is refused with a readable error, never half-assessed
    const input = { activities: ['mewp'], forecast: hourlyForecast(DAY, 12), window: WINDOW, ...patch } as Parameters<typeof assessDay>[0];
    expect(() => assessDay(input)).toThrow(message);
  });

  it('validates API input with its schema', () => {
    // Source: Hodboard rule — API payloads go through the shared zod schema; a probability is 0–1
    const ok = assessDayInputSchema.safeParse({ activities: [{ activity: 'pointing', mortar: 'hydraulic-lime' }], forecast: hourlyForecast(DAY, 24), window: WINDOW });
    expect(ok.success).toBe(true);
    const bad = assessDayInputSchema.safeParse({ activities: ['mewp'], forecast: hourlyForecast(DAY, 2, () => ({ precipProbability: 40 })), window: WINDOW });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0]?.path).toEqual(['forecast', 0, 'precipProbability']);
  });
});
