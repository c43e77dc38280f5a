import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { createPinia, setActivePinia } from 'pinia';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { DayWeatherDto } from '@hodboard/shared';
import { useWeatherStore } from '@/stores/weather-store';
import WeatherDayMarker from './WeatherDayMarker.vue';
import WeatherStaleNotice from './WeatherStaleNotice.vue';
import WeatherVerdictBadge from './WeatherVerdictBadge.vue';

const day = (overrides: Partial<DayWeatherDto> = {}): DayWeatherDto => ({
  assignmentId: 'a1', jobId: 'j1', date: '2027-03-25', verdict: 'caution', reasons: [], notes: [], advice: [],
  forecastFetchedAt: '2027-03-24T06:00:00.000Z', isStale: false, ...overrides,
});
const global = { plugins: [PrimeVue] };

const api = vi.hoisted(() => ({ getWeatherOutlook: vi.fn() }));
vi.mock('@/api/weather', () => api);

describe('stale forecasts on the board', () => {
  beforeEach(() => {
    vi.useFakeTimers();
    vi.setSystemTime(new Date('2027-03-24T11:00:00Z'));
  });
  afterEach(() => {
    vi.useRealTimers();
  });

  it('marks a verdict from an old forecast with a clock and the word, not colour alone', () => {
    const fresh = mount(WeatherVerdictBadge, { props: { verdict: 'stop' } });
    expect(fresh.classes()).not.toContain('is-stale');
    expect(fresh.text()).toBe('Stop');
    const old = mount(WeatherVerdictBadge, { props: { verdict: 'stop', isStale: true } });
    expect(old.classes()).toContain('is-stale');
    expect(old.text()).toBe('Stop · old');
    expect(old.find('.pi-history').exists()).toBe(true);
    expect(mount(WeatherVerdictBadge, { props: { verdict: 'go', isStale: true, isLong: true } }).text()).toBe('Fine to work · old forecast');
  });

  it('passes the staleness of the day to the board marker, in its text and its name', () => {
    const marker = mount(WeatherDayMarker, { props: { day: day({ isStale: true }), jobReference: 'J-0042' }, global });
    expect(marker.classes()).toContain('is-stale');
    expect(marker.get('.verdict').text()).toBe('Watch · old');
    expect(marker.get('button').attributes('aria-label')).toContain('old forecast');
    const fresh = mount(WeatherDayMarker, { props: { day: day(), jobReference: 'J-0042' }, global });
    expect(fresh.get('.verdict').text()).toBe('Watch');
  });

  it('shows no notice while every forecast shown is fresh', () => {
    const wrapper = mount(WeatherStaleNotice, { props: { days: [day(), day({ date: '2027-03-26' })] }, global });
    expect(wrapper.find('[data-testid="weather-stale-notice"]').exists()).toBe(false);
  });

  it('warns when any shown forecast is old, with the age of the oldest and how many jobs it touches', () => {
    const days = [
      day({ isStale: true, forecastFetchedAt: '2027-03-24T08:00:00.000Z' }),
      day({ isStale: true, date: '2027-03-26', forecastFetchedAt: '2027-03-24T08:00:00.000Z' }),
      day({ jobId: 'j2', isStale: true, forecastFetchedAt: '2027-03-24T06:00:00.000Z' }),
      day({ jobId: 'j3' }),
    ];
    const notice = mount(WeatherStaleNotice, { props: { days }, global }).get('[data-testid="weather-stale-notice"]');
    expect(notice.text()).toContain('Some sites could not get a fresh forecast; their verdicts use the last one that came through (the oldest fetched 5 hours ago).');
    expect(notice.text()).toContain('Marked old on 2 jobs here.');
  });

  it('reads, for the board, the verdicts of the placed days inside the range it shows and no others', async () => {
    setActivePinia(createPinia());
    const shown = day({ jobId: 'j1', date: '2027-03-26', isStale: true });
    const later = day({ jobId: 'j1', date: '2027-04-06', isStale: true });
    const other = day({ jobId: 'j9', date: '2027-03-26', isStale: true });
    api.getWeatherOutlook.mockResolvedValue({ from: '2027-03-24', to: '2027-04-06', days: [shown, later, other], atRisk: [] });
    const store = useWeatherStore();
    await store.loadVerdicts();
    const onBoard = store.verdictsWithin([{ jobId: 'j1', days: ['2027-03-25', '2027-03-26', '2027-04-06'] }], '2027-03-22', '2027-04-04');
    expect(onBoard).toEqual([shown]);
    expect(mount(WeatherStaleNotice, { props: { days: onBoard }, global }).text()).toContain('Marked old on 1 job here.');
    expect(store.verdictsWithin([{ jobId: 'j1', days: ['2027-03-25'] }], '2027-03-22', '2027-04-04')).toEqual([]);
  });
});
