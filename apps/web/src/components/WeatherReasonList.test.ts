import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import type { DayWeatherDto, DayWeatherReasonDto } from '@hodboard/shared';
import WeatherReasonList from './WeatherReasonList.vue';

// The hours are shown in the viewer's clock; pin it so the expected text does not depend on the machine.
process.env.TZ = 'UTC';

const reason = (overrides: Partial<DayWeatherReasonDto>): DayWeatherReasonDto => ({
  activity: 'scaffold-erection', ruleId: 'wind.scaffold-erection.gust', verdict: 'stop', message: 'Gusts of 20.5 m/s reach the limit.',
  source: 'NASC TG20 guidance', at: '2027-03-25T11:00:00.000Z', threshold: 17.9, unit: 'm/s', observed: 20.5, beaufort: null, ...overrides,
});
const day = (reasons: DayWeatherReasonDto[], overrides: Partial<DayWeatherDto> = {}): DayWeatherDto => ({
  assignmentId: 'a1', jobId: 'j1', date: '2027-03-25', verdict: 'stop', reasons, notes: [], advice: [],
  forecastFetchedAt: '2027-03-24T06:00:00.000Z', isStale: false, ...overrides,
});
const figures = (d: DayWeatherDto) =>
  mount(WeatherReasonList, { props: { day: d }, global: { plugins: [PrimeVue] } }).findAll('[data-testid="reason-figures"]').map((p) => p.text());

describe('WeatherReasonList', () => {
  it('shows the limit and the forecast value with the hour, in m/s and mph, and the Beaufort force of the mean wind', () => {
    // 17.9 m/s = 40.0 mph and 20.5 m/s = 45.9 mph (1 mph = 0.44704 m/s exactly, by definition of the international mile and hour)
    const text = figures(day([reason({ beaufort: { force: 6, name: 'Strong breeze' } })]));
    expect(text).toEqual(['Limit 17.9 m/s (40 mph) · forecast 20.5 m/s (46 mph) at 11:00 · mean wind force 6, strong breeze']);
  });

  it('gives a temperature rule its limit and coldest hour, naming the day when that hour falls after the job-day', () => {
    const text = figures(day([
      reason({ activity: 'bricklaying', ruleId: 'cold.mortar.cement', threshold: 3, unit: '°C', observed: -2.4, at: '2027-03-26T04:00:00.000Z' }),
      reason({ activity: 'bricklaying', ruleId: 'rain.fresh-work', verdict: 'caution', threshold: 0.5, unit: 'mm/h', observed: 1.25, at: '2027-03-25T14:00:00.000Z' }),
    ]));
    expect(text).toEqual([
      'Limit 3 °C · forecast -2.4 °C at 04:00 on Fri 26 Mar',
      'Limit 0.5 mm/h · forecast 1.3 mm/h at 14:00',
    ]);
  });

  it('reads the hour-counting rules as hours needed, missing or covered, with no hour of day', () => {
    const text = figures(day([
      reason({ ruleId: 'day.usable-hours', threshold: 4, unit: 'h', observed: 2.5, at: null }),
      reason({ ruleId: 'day.usable-hours', threshold: 2, unit: 'h', observed: 1.99, at: null }),
      reason({ ruleId: 'forecast.missing', verdict: 'caution', threshold: 0, unit: 'h', observed: 3, at: null }),
      reason({ ruleId: 'forecast.reach.frost-protection', verdict: 'caution', threshold: 57, unit: 'h', observed: 52.5, at: null }),
    ]));
    expect(text).toEqual([
      'Needs 4 h usable · forecast leaves 2.5 h',
      'Needs 2 h usable · forecast leaves 1.9 h',
      'No forecast for 3 h of the working window',
      'Forecast covers 52.5 h of the 57 h it should reach',
    ]);
  });

  it('shows a look-ahead past the forecast as a muted note, once, naming its activities, and not as a reason', () => {
    const message = 'The forecast reaches 2 days 16 h of the 6 days the frost-protection rule looks ahead (none yet for 2027-03-28 00:00 UTC to 2027-03-31 08:00 UTC); check it again nearer the day.';
    const d = day([], {
      verdict: 'go',
      notes: [{
        activities: ['bricklaying', 'pointing'], ruleId: 'forecast.reach.frost-protection', message, source: 'Hodboard rule',
        uncovered: [{ from: '2027-03-28T00:00:00.000Z', to: '2027-03-31T08:00:00.000Z' }],
      }],
    });
    const wrapper = mount(WeatherReasonList, { props: { day: d }, global: { plugins: [PrimeVue] } });
    const notes = wrapper.findAll('[data-testid="reason-note"]');
    expect(notes).toHaveLength(1);
    expect(notes[0]!.find('i.pi-info-circle').exists()).toBe(true);
    expect(notes[0]!.text()).toBe(`Note, not counted in the verdict: ${message} (Bricklaying, Pointing)`);
    expect(wrapper.findAll('[data-rule]')).toHaveLength(0);
    expect(wrapper.text()).toContain('No forecast rule is near its limit');
    expect(wrapper.get('.head').text()).toContain('Fine to work');
  });

  it('shows no note line when there is none', () => {
    const wrapper = mount(WeatherReasonList, { props: { day: day([reason({})]) }, global: { plugins: [PrimeVue] } });
    expect(wrapper.find('[data-testid="reason-note"]').exists()).toBe(false);
  });

  it('keeps the rule, the message and the source beside the figures', () => {
    const wrapper = mount(WeatherReasonList, { props: { day: day([reason({})]) }, global: { plugins: [PrimeVue] } });
    const item = wrapper.get('[data-rule="wind.scaffold-erection.gust"]');
    expect(item.text()).toContain('Wind: scaffold erection, gust');
    expect(item.text()).toContain('Gusts of 20.5 m/s reach the limit.');
    expect(item.text()).toContain('Source: NASC TG20 guidance');
  });
});
