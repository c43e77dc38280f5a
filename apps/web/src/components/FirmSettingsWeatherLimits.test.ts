import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { defaultRuleSettings, WEATHER_LIMITS_SAFETY_NOTE, type WeatherLimitsDto } from '@hodboard/shared';
import FirmSettingsWeatherLimits from './FirmSettingsWeatherLimits.vue';

const api = vi.hoisted(() => ({ getWeatherLimits: vi.fn(), updateWeatherLimits: vi.fn() }));
vi.mock('@/api/weather', () => api);

const dto = (overrides: WeatherLimitsDto['overrides'] = {}, version = 0): WeatherLimitsDto => ({
  overrides, effective: { ...defaultRuleSettings, ...overrides }, ignored: [], version, updatedAt: version ? '2027-03-01T09:00:00.000Z' : null,
});

async function mounted() {
  const wrapper = mount(FirmSettingsWeatherLimits, { global: { plugins: [PrimeVue, ToastService] }, attachTo: document.body });
  await flushPromises();
  return wrapper;
}

const input = (wrapper: Awaited<ReturnType<typeof mounted>>, key: string) => wrapper.get(`#limit-${key}`);

async function type(wrapper: Awaited<ReturnType<typeof mounted>>, key: string, text: string) {
  const field = input(wrapper, key);
  (field.element as HTMLInputElement).value = text;
  await field.trigger('input');
  await field.trigger('blur');
  await flushPromises();
}

describe('the weather limits section', () => {
  beforeEach(() => {
    vi.clearAllMocks();
    api.getWeatherLimits.mockResolvedValue(dto());
  });

  it('shows the safety caution, and each threshold with its default, unit and source', async () => {
    const wrapper = await mounted();
    expect(wrapper.get('[data-testid="weather-limits-caution"]').text()).toBe(WEATHER_LIMITS_SAFETY_NOTE);
    expect(WEATHER_LIMITS_SAFETY_NOTE).toMatch(/manufacturer or supplier/);
    expect(WEATHER_LIMITS_SAFETY_NOTE).toMatch(/local regulations/);
    expect(WEATHER_LIMITS_SAFETY_NOTE).toMatch(/competent person/);
    const mewp = wrapper.get('[data-limit="mewpGustStopMs"]').text();
    expect(mewp).toContain('Default: 12.5 m/s (28 mph)');
    expect(mewp).toContain('BS EN 280');
    expect((input(wrapper, 'mewpGustStopMs').element as HTMLInputElement).value).toBe('12.5 m/s');
    expect(input(wrapper, 'mewpGustStopMs').attributes('aria-describedby')).toContain('limit-mewpGustStopMs-meta');
    wrapper.unmount();
  });

  it('saves only what differs from the default, and a reset puts the default back', { timeout: 20_000 }, async () => {
    api.updateWeatherLimits.mockImplementation(async (overrides: WeatherLimitsDto['overrides']) => dto(overrides, 1));
    const wrapper = await mounted();
    await type(wrapper, 'scaffoldUseGustStopMs', '15');
    await type(wrapper, 'towerMeanStopMs', '7.6');
    const row = wrapper.get('[data-limit="scaffoldUseGustStopMs"]');
    expect(row.classes()).toContain('is-changed');
    await wrapper.get('form').trigger('submit');
    await flushPromises();
    // 7.6 is how the 17 mph default shows, so it stays the default rather than becoming the firm's own.
    expect(api.updateWeatherLimits).toHaveBeenLastCalledWith({ scaffoldUseGustStopMs: 15 }, 0);

    await wrapper.get('[data-limit="scaffoldUseGustStopMs"] button').trigger('click');
    await wrapper.get('form').trigger('submit');
    await flushPromises();
    expect(api.updateWeatherLimits).toHaveBeenLastCalledWith({}, 1);
    wrapper.unmount();
  });

  it('names a value out of bounds beside its field and sends nothing', { timeout: 20_000 }, async () => {
    const wrapper = await mounted();
    await type(wrapper, 'rainStopProbability', '150');
    await wrapper.get('form').trigger('submit');
    await flushPromises();
    expect(api.updateWeatherLimits).not.toHaveBeenCalled();
    expect(wrapper.get('[data-limit="rainStopProbability"]').text()).toContain('At most 100 %');
    wrapper.unmount();
  });
});
