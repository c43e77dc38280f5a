import { describe, expect, it } from 'vitest';
import { accessWindowFor, adverseWeatherDays, hireCost, inspectionRecordsKeptUntil, inspectionsDue, windStopDays } from './access.js';
import { assessDay } from './assess-day.js';
import { spanFor } from './calendar.js';
import { DAY, hourlyForecast, inWindow, WINDOW } from './fixtures/forecast-builder.js';

describe('accessWindowFor', () => {
  it('has the scaffold up the working day before the job and down the working day after', () => {
    // Source: gov.uk bank-holidays.json, Easter 2026 (3 and 6 Apr) inside the span
    expect(accessWindowFor(spanFor('2026-04-01', 5))).toEqual({
      erectBy: '2026-03-31',
      firstUse: '2026-04-01',
      lastUse: '2026-04-09',
      strikeFrom: '2026-04-10',
    });
  });

  it('skips holidays either side of the job', () => {
    // Source: gov.uk bank-holidays.json, Good Friday and Easter Monday 2026
    expect(accessWindowFor(['2026-04-07', '2026-04-08'])).toMatchObject({ erectBy: '2026-04-02' });
    expect(accessWindowFor(['2026-04-01', '2026-04-02'])).toMatchObject({ strikeFrom: '2026-04-07' });
  });

  it('leaves the scaffold up through the curing days', () => {
    // Source: Hodboard rule (common practice, no source) — strike from the next working day after the last job day plus the curing days, counted as calendar days
    // Friday last day + 3 calendar days of curing = Monday, so strike from Tuesday.
    expect(accessWindowFor(['2026-03-05', '2026-03-06'], { curingDays: 3 }).strikeFrom).toBe('2026-03-10');
    expect(accessWindowFor(['2026-03-05', '2026-03-06'], { curingDays: 0 }).strikeFrom).toBe('2026-03-09');
  });

  it('refuses an empty or back-to-front span', () => {
    // Source: Hodboard rule — a job span is one or more dates in order
    expect(() => accessWindowFor([])).toThrow(/at least one date/);
    expect(() => accessWindowFor(['2026-03-06', '2026-03-05'])).toThrow(/date order/);
  });
});

describe('hireCost', () => {
  it.each([
    ['2026-03-08', 1], // common practice, no source — hire is charged per week or part week, rounded up: 6 days is one week
    ['2026-03-09', 1], // common practice, no source — part weeks rounded up: 7 days is one week
    ['2026-03-10', 2], // common practice, no source — part weeks rounded up: 8 days starts a second week
    ['2026-03-16', 2], // common practice, no source — part weeks rounded up: 14 days is two weeks
    ['2026-03-17', 3], // common practice, no source — part weeks rounded up: 15 days starts a third week
  ])('erected 2 Mar 2026 and struck %s charges %d weeks', (strikeFrom, weeks) => {
    const c = hireCost({ erectBy: '2026-03-02', strikeFrom }, { weeklyRate: 12_000, minimumWeeks: 1 });
    expect(c.chargedWeeks).toBe(weeks);
    expect(c.pence).toBe(weeks * 12_000);
  });

  it('never charges less than the minimum hire', () => {
    // Source: londonscaffolds.co.uk terms — initial hire up to 4 weeks (secondary copy)
    expect(hireCost({ erectBy: '2026-03-02', strikeFrom: '2026-03-10' }, { weeklyRate: 9_500, minimumWeeks: 4 })).toEqual({
      hireDays: 8,
      chargedWeeks: 4,
      pence: 38_000,
    });
  });

  it('refuses a rate in fractions of a penny', () => {
    // Source: Hodboard rule — money is integer pence
    expect(() => hireCost({ erectBy: '2026-03-02', strikeFrom: '2026-03-10' }, { weeklyRate: 99.5, minimumWeeks: 1 })).toThrow(/weeklyRate/);
  });
});

describe('inspectionsDue', () => {
  it('inspects after assembly and then at least every 7 days under WAHR 2005 reg 12', () => {
    // Source: Work at Height Regulations 2005 reg 12 — before first use, and within the previous 7 days (secondary copy)
    expect(inspectionsDue('2026-03-02', '2026-03-27', [], 'uk').map((i) => [i.date, i.reasons])).toEqual([
      ['2026-03-02', ['after-assembly']],
      ['2026-03-09', ['within-7-days']],
      ['2026-03-16', ['within-7-days']],
      ['2026-03-23', ['within-7-days']],
    ]);
  });

  it('adds one after each adverse-weather day and restarts the 7 days from it', () => {
    // Source: WAHR 2005 reg 12 — after each exceptional circumstance such as adverse weather (secondary copy)
    expect(inspectionsDue('2026-03-02', '2026-03-27', ['2026-03-11'], 'uk').map((i) => [i.date, i.reasons])).toEqual([
      ['2026-03-02', ['after-assembly']],
      ['2026-03-09', ['within-7-days']],
      ['2026-03-12', ['after-adverse-weather']],
      ['2026-03-19', ['within-7-days']],
      ['2026-03-26', ['within-7-days']],
    ]);
  });

  it('never leaves more than 7 days between inspections', () => {
    // Source: Work at Height Regulations 2005 reg 12 — a working platform is not used unless inspected within the previous 7 days (secondary copy)
    const due = inspectionsDue('2026-01-05', '2026-06-30', ['2026-02-14', '2026-02-15', '2026-04-01'], 'uk').map((i) => Date.parse(i.date));
    for (let i = 1; i < due.length; i++) expect(((due[i] as number) - (due[i - 1] as number)) / 86_400_000).toBeLessThanOrEqual(7);
  });

  it('inspects before every shift and after any occurrence under 29 CFR 1926.451(f)(3)', () => {
    // Source: 29 CFR 1926.451(f)(3) — before each work shift and after any occurrence (secondary copy)
    const due = inspectionsDue('2026-03-02', '2026-03-08', ['2026-03-04'], 'us');
    expect(due.map((i) => [i.date, i.reasons])).toEqual([
      ['2026-03-02', ['before-shift']],
      ['2026-03-03', ['before-shift']],
      ['2026-03-04', ['before-shift']],
      ['2026-03-05', ['before-shift', 'after-occurrence']],
      ['2026-03-06', ['before-shift']],
    ]);
    expect(due[0]?.source).toMatch(/1926\.451\(f\)\(3\)/);
  });

  it('takes the adverse days from the wind stops in day assessments', () => {
    // Source: WAHR 2005 reg 12 — inspect after adverse weather (secondary copy); a day with a wind stop counts as adverse (Hodboard rule); 24 m/s gusts pass the 18 m/s scaffold-use stop (weak secondary copy)
    const calm = assessDay({ activities: ['work-at-height'], forecast: hourlyForecast(DAY), window: WINDOW });
    const gale = assessDay({
      activities: ['work-at-height'],
      forecast: hourlyForecast(DAY, 72, (h) => (inWindow(h) ? { windMeanMs: 17, windGustMs: 24 } : {})),
      window: WINDOW,
    });
    expect(adverseWeatherDays([{ date: '2026-03-02', assessment: calm }, { date: '2026-03-03', assessment: gale }])).toEqual(['2026-03-03']);
  });

  it('counts a night-time gale while the scaffold stands, and only days with a wind stop', () => {
    // Three days from local midnight 1 March 2026 (GMT); gusts of 24 m/s at 02:00–04:00 on 2 March only.
    const hours = hourlyForecast('2026-03-01T00:00:00Z', 72, (h) => (h >= 26 && h < 29 ? { windMeanMs: 15, windGustMs: 24 } : {}));
    // Source: WAHR 2005 reg 12 — inspect after adverse weather (secondary copy); 18 m/s scaffold-use gust stop (weak secondary copy, SOURCES.scaffoldUse).
    expect(windStopDays(hours, '2026-03-01', '2026-03-03', 'Europe/London', 'work-at-height')).toEqual(['2026-03-02']);
    // Days outside the forecast are not guessed at.
    expect(windStopDays(hours, '2026-03-04', '2026-03-06', 'Europe/London', 'work-at-height')).toEqual([]);
  });

  it('reads the days in the firm\'s zone: 23:30 UTC on 31 May is 1 June in London', () => {
    const hours = hourlyForecast('2026-05-31T00:00:00Z', 48, (h) => (h === 23 ? { windMeanMs: 15, windGustMs: 24 } : {}));
    // Source: IANA tz database — Europe/London is UTC+1 (BST) on 31 May 2026.
    expect(windStopDays(hours, '2026-05-31', '2026-06-01', 'Europe/London', 'work-at-height')).toEqual(['2026-06-01']);
  });

  it('refuses a strike before erection', () => {
    // Source: Hodboard rule — access is struck on or after the day it goes up
    expect(() => inspectionsDue('2026-03-10', '2026-03-02', [], 'uk')).toThrow(/struck on or after/);
  });
});

describe('inspectionRecordsKeptUntil', () => {
  it.each([
    // Source: WAHR 2005 reg 12(6) — kept until the work is complete, then for 3 months (secondary copy: trade-rules §1d)
    ['2027-07-12', '2027-10-12'],
    // Source: as above; a month end clamps to the shorter month (common practice, no source)
    ['2026-11-30', '2027-02-28'],
    ['2027-11-30', '2028-02-29'],
    ['2026-10-15', '2027-01-15'],
  ])('keeps records of access struck on %s until %s', (struckOn, keepUntil) => {
    expect(inspectionRecordsKeptUntil(struckOn).keepUntil).toBe(keepUntil);
  });

  it('keeps them for the life of the booking while the access is still up', () => {
    // Source: WAHR 2005 reg 12(6) — kept on site until the construction work is complete (secondary copy)
    expect(inspectionRecordsKeptUntil(null)).toMatchObject({ keepUntil: null, source: expect.stringMatching(/reg 12\(6\)/) });
  });
});
