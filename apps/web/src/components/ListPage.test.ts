import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import { h } from 'vue';
import ListPage from './ListPage.vue';

function mounted(props: Partial<{ loadError: string | null; isSearchWide: boolean; search: string }> = {}) {
  return mount(ListPage, {
    props: {
      title: 'Yards',
      intro: 'Where the plant is kept.',
      searchLabel: 'Search yards',
      searchPlaceholder: 'Search by name',
      loadError: null,
      search: '',
      'onUpdate:search': () => {},
      ...props,
    },
    slots: {
      actions: () => h('button', { type: 'button' }, 'New yard'),
      filters: () => h('select', { 'aria-label': 'Filter by owner' }),
      default: () => h('table', { 'aria-label': 'Yards' }),
      dialogs: () => h('div', { id: 'yard-dialog' }),
    },
    global: { plugins: [PrimeVue] },
  });
}

describe('ListPage', () => {
  it('heads the page with its title, intro and actions, then the search and filters above the list', () => {
    const wrapper = mounted();
    expect(wrapper.get('h1').text()).toBe('Yards');
    expect(wrapper.get('header p').text()).toBe('Where the plant is kept.');
    expect(wrapper.get('header button').text()).toBe('New yard');
    const search = wrapper.get('input[aria-label="Search yards"]');
    expect(search.attributes('placeholder')).toBe('Search by name');
    expect(search.classes()).not.toContain('search-wide');
    const toolbar = wrapper.get('.hb-card .hb-toolbar');
    expect(toolbar.find('select[aria-label="Filter by owner"]').exists()).toBe(true);
    expect(wrapper.get('.hb-card table').attributes('aria-label')).toBe('Yards');
    expect(wrapper.find('.hb-page > #yard-dialog').exists()).toBe(true);
    expect(wrapper.find('[role="alert"]').exists()).toBe(false);
  });

  it('says why the list did not load', () => {
    const wrapper = mounted({ loadError: 'Your role in this firm does not allow that.' });
    expect(wrapper.get('[role="alert"]').text()).toContain('Your role in this firm does not allow that.');
  });

  it('passes typed searches up, and widens the box for searches over several fields', async () => {
    const wrapper = mounted({ isSearchWide: true });
    const search = wrapper.get('input[aria-label="Search yards"]');
    expect(search.classes()).toContain('search-wide');
    await search.setValue('canal');
    await flushPromises();
    expect(wrapper.emitted('update:search')).toEqual([['canal']]);
  });
});
