import { flushPromises, mount } from '@vue/test-utils';
import { describe, expect, it, vi } from 'vitest';
import { h } from 'vue';
import { componentOnCall, lazyComponent, loadWithRetry } from './lazy-code';

const noSignal = () => new TypeError('Failed to fetch dynamically imported module: /assets/CrewStandDownDialog.js');

function setOnline(isOnline: boolean): void {
  vi.spyOn(navigator, 'onLine', 'get').mockReturnValue(isOnline);
  if (isOnline) window.dispatchEvent(new Event('online'));
}

describe('code loaded on first use, tried again', () => {
  it('keeps trying with no signal as long as that lasts, and loads as soon as the signal is back', async () => {
    setOnline(false);
    const loader = vi.fn<() => Promise<string>>().mockRejectedValue(noSignal());
    let result: string | undefined;
    void loadWithRetry(loader, { pauseMs: 1, onlineAttempts: 2, offlinePauseMs: 5 }).then((value) => (result = value));
    // Far more tries than the two allowed online: failures with no signal do not count.
    await vi.waitFor(() => expect(loader.mock.calls.length).toBeGreaterThan(4));
    expect(result).toBeUndefined();

    loader.mockResolvedValue('the form');
    const triesBefore = loader.mock.calls.length;
    setOnline(true);
    await vi.waitFor(() => expect(result).toBe('the form'));
    expect(loader.mock.calls.length).toBe(triesBefore + 1);
  });

  it('with no signal, tries again at once when the signal is back rather than at the next pause', async () => {
    setOnline(false);
    const loader = vi.fn<() => Promise<string>>().mockRejectedValueOnce(noSignal()).mockResolvedValue('the form');
    let result: string | undefined;
    void loadWithRetry(loader, { offlinePauseMs: 60_000 }).then((value) => (result = value));
    await vi.waitFor(() => expect(loader).toHaveBeenCalledTimes(1));
    await flushPromises();
    expect(result).toBeUndefined();
    setOnline(true);
    await vi.waitFor(() => expect(result).toBe('the form'));
  });

  it('with a signal, tries again after a pause and gives up after the set number of failures', async () => {
    setOnline(true);
    const loader = vi.fn().mockRejectedValue(new Error('404 /assets/gone.js'));
    await expect(loadWithRetry(loader, { onlineAttempts: 3, pauseMs: 1 })).rejects.toThrow('404 /assets/gone.js');
    expect(loader).toHaveBeenCalledTimes(3);
  });

  it('renders a component whose first load failed with no signal, and says when its code has arrived', async () => {
    setOnline(false);
    const Form = (props: { title: string }) => h('form', props.title);
    const loader = vi.fn().mockRejectedValueOnce(noSignal()).mockResolvedValue({ default: Form });
    const lazy = lazyComponent(loader, { pauseMs: 1, offlinePauseMs: 60_000 });
    const host = mount(() => h(lazy.component, { title: 'Stand down for weather' }));
    await flushPromises();
    expect(host.find('form').exists()).toBe(false);
    expect(lazy.loaded.value).toBe(false);

    setOnline(true);
    await vi.waitFor(() => expect(host.find('form').text()).toBe('Stand down for weather'));
    expect(lazy.loaded.value).toBe(true);
    host.unmount();
  });

  it('brings a component called for from code once, however often it is asked for, and tries again after a failure', async () => {
    setOnline(true);
    const Menu = (props: { title: string }) => h('nav', props.title);
    const loader = vi.fn().mockRejectedValueOnce(new Error('500 /assets/menu.js')).mockResolvedValue({ default: Menu });
    const menu = componentOnCall(loader, { onlineAttempts: 1 });
    expect(menu.component.value).toBeNull();

    await expect(menu.load()).rejects.toThrow('500 /assets/menu.js');
    expect(menu.component.value).toBeNull();
    await Promise.all([menu.load(), menu.load()]);
    expect(loader).toHaveBeenCalledTimes(2);
    expect(menu.component.value).toBe(Menu);
  });
});
