import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { DayWeatherDto, WeatherOutlookDto } from '@hodboard/shared';

const api = vi.hoisted(() => ({
  listWeatherHolds: vi.fn(),
  raiseWeatherHold: vi.fn(),
  previewReplan: vi.fn(),
  commitReplan: vi.fn(),
  withdrawWeatherHold: vi.fn(),
  getWeatherLossSummary: vi.fn(),
  getWeatherOutlook: vi.fn(),
  refreshForecasts: vi.fn(),
}));
vi.mock('@/api/weather', () => api);

const { ruleLabel, useWeatherStore, worstVerdict } = await import('./weather-store');

const jobA = 'cccccccc-0000-4000-8000-000000000001';
const jobB = 'cccccccc-0000-4000-8000-000000000002';

function day(jobId: string, date: string, verdict: DayWeatherDto['verdict']): DayWeatherDto {
  return {
    assignmentId: `as-${jobId}`, jobId, date, verdict, notes: [], advice: [], forecastFetchedAt: '2027-03-01T06:00:00.000Z', isStale: false,
    reasons: verdict === 'go' ? [] : [{ activity: 'work-at-height', ruleId: 'wind.scaffold-use.balance', verdict, message: 'Gusts to 21 m/s', source: 'test', at: '2027-03-02T11:00:00.000Z', threshold: 17, unit: 'm/s', observed: 21, beaufort: { force: 6, name: 'Strong breeze' } }],
  };
}

function outlook(days: DayWeatherDto[], from = '2027-03-01'): WeatherOutlookDto {
  return { from, to: '2027-03-14', days, atRisk: [] };
}

describe('weather store', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    for (const fn of Object.values(api)) fn.mockReset();
  });

  it.each([
    [[], null],
    [['go', 'go'], 'go'],
    [['go', 'caution', 'go'], 'caution'],
    [['caution', 'stop', 'go'], 'stop'],
  ] as const)('the worst of %j is %s', (verdicts, expected) => {
    expect(worstVerdict(verdicts.map((v, i) => day(jobA, `2027-03-0${i + 1}`, v)))).toBe(expected);
  });

  it.each([
    ['wind.scaffold-use.balance', 'Wind: scaffold use, balance'],
    ['cold.mortar.frost-protection', 'Cold: mortar, frost protection'],
    ['day.usable-hours', 'Daylight: usable hours'],
    ['forecast', 'Forecast'],
  ])('names rule %s as "%s"', (ruleId, expected) => {
    expect(ruleLabel(ruleId)).toBe(expected);
  });

  it('keeps a fortnight of verdicts for the board and the first week as the outlook', async () => {
    api.getWeatherOutlook.mockResolvedValue(outlook([day(jobA, '2027-03-02', 'stop'), day(jobA, '2027-03-09', 'go')]));
    const store = useWeatherStore();
    await store.loadVerdicts();
    expect(api.getWeatherOutlook).toHaveBeenCalledWith(14);
    expect(store.verdictFor(jobA, '2027-03-09')?.verdict).toBe('go');
    expect(store.outlook?.to).toBe('2027-03-07');
    expect(store.outlook?.days.map((d) => d.date)).toEqual(['2027-03-02']);
  });

  it('moves a job\'s verdicts with it and leaves other jobs alone', async () => {
    api.getWeatherOutlook.mockResolvedValue(outlook([day(jobA, '2027-03-02', 'stop'), day(jobA, '2027-03-03', 'stop'), day(jobB, '2027-03-02', 'caution')]));
    const store = useWeatherStore();
    await store.loadVerdicts();
    store.applyScheduleChange({ job: { id: jobA } as never, weather: [day(jobA, '2027-03-04', 'go')] });
    expect(store.verdictFor(jobA, '2027-03-02')).toBeUndefined();
    expect(store.verdictFor(jobA, '2027-03-04')?.verdict).toBe('go');
    expect(store.verdictFor(jobB, '2027-03-02')?.verdict).toBe('caution');
  });

  it('reloads once after a burst of forecast pushes', async () => {
    vi.useFakeTimers();
    try {
      api.getWeatherOutlook.mockResolvedValue(outlook([]));
      const store = useWeatherStore();
      for (let i = 0; i < 5; i += 1) store.applyEvent({ type: 'forecast:updated', id: `site-${i}` });
      store.applyEvent({ type: 'access:updated', id: 'x' });
      await vi.advanceTimersByTimeAsync(500);
      expect(api.getWeatherOutlook).toHaveBeenCalledTimes(1);
    } finally {
      vi.useRealTimers();
    }
  });

  it('reloads the verdicts when the firm changes its weather limits', async () => {
    vi.useFakeTimers();
    try {
      api.getWeatherOutlook.mockResolvedValue(outlook([day(jobA, '2027-03-02', 'go')]));
      const store = useWeatherStore();
      await store.loadVerdicts();
      api.getWeatherOutlook.mockResolvedValue(outlook([day(jobA, '2027-03-02', 'stop')]));
      store.applyEvent({ type: 'weather-limits:updated', id: 'firm-1', version: 2 });
      await vi.advanceTimersByTimeAsync(500);
      expect(api.getWeatherOutlook).toHaveBeenCalledTimes(2);
      expect(store.verdictFor(jobA, '2027-03-02')?.verdict).toBe('stop');
    } finally {
      vi.useRealTimers();
    }
  });

  it('marks the stand-down re-planned once the commit succeeds', async () => {
    const hold = { id: 'h1', jobId: jobA, jobReference: 'J-101', crewId: null, dates: ['2027-03-02'], reason: 'wind', notes: null, raisedBy: 'Ruth Brindle', raisedFrom: 'office', raisedAt: '2027-03-01T08:00:00.000Z', status: 'open', forecastSeen: [], forecastFetchedAt: null, forecastWasStale: false, replanMode: null, version: 1 } as const;
    api.raiseWeatherHold.mockResolvedValue(hold);
    api.commitReplan.mockResolvedValue({ holdId: 'h1', mode: 'push', lostWorkingDays: 1, workedDays: [], moves: [], accessChanges: [], clientsToTell: [], warnings: [], planKey: 'plan-1' });
    const store = useWeatherStore();
    await store.raise({ jobId: jobA, dates: ['2027-03-02'], reason: 'wind' });
    expect(store.openHolds.map((h) => h.id)).toEqual(['h1']);
    await store.commit('h1', { mode: 'push', version: 1 });
    expect(api.commitReplan).toHaveBeenCalledWith('h1', { mode: 'push', version: 1 });
    expect(store.holdsForJob(jobA)[0]?.status).toBe('replanned');
    expect(store.openHolds).toEqual([]);
  });

  it('keeps the stand-down open when the commit is refused', async () => {
    const hold = { id: 'h2', jobId: jobA, jobReference: 'J-101', crewId: null, dates: ['2027-03-02'], reason: 'wind', notes: null, raisedBy: null, raisedFrom: 'office', raisedAt: '2027-03-01T08:00:00.000Z', status: 'open', forecastSeen: [], forecastFetchedAt: null, forecastWasStale: false, replanMode: null, version: 1 } as const;
    api.raiseWeatherHold.mockResolvedValue(hold);
    api.commitReplan.mockRejectedValue(new Error('409'));
    const store = useWeatherStore();
    await store.raise({ jobId: jobA, dates: ['2027-03-02'], reason: 'wind' });
    await expect(store.commit('h2', { mode: 'push', version: 1 })).rejects.toThrow();
    expect(store.openHolds.map((h) => h.id)).toEqual(['h2']);
  });

  it('sends the version when withdrawing a stand-down and keeps the withdrawn one the API answers', async () => {
    const hold = { id: 'h3', jobId: jobA, jobReference: 'J-101', crewId: null, dates: ['2027-03-02'], reason: 'rain', notes: null, raisedBy: null, raisedFrom: 'crew', raisedAt: '2027-03-01T08:00:00.000Z', status: 'open', forecastSeen: [], forecastFetchedAt: null, forecastWasStale: false, replanMode: null, version: 3 } as const;
    api.raiseWeatherHold.mockResolvedValue(hold);
    api.withdrawWeatherHold.mockResolvedValue({ ...hold, status: 'withdrawn', version: 4 });
    const store = useWeatherStore();
    await store.raise({ jobId: jobA, dates: ['2027-03-02'], reason: 'rain' });
    await store.withdraw(store.holdsForJob(jobA)[0]!);
    expect(api.withdrawWeatherHold).toHaveBeenCalledWith('h3', { version: 3 });
    expect(store.holdsForJob(jobA)[0]).toMatchObject({ status: 'withdrawn', version: 4 });
    expect(store.openHolds).toEqual([]);
  });
});
