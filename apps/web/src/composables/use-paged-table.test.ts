import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import Column from 'primevue/column';
import DataTable from 'primevue/datatable';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, effectScope, h, nextTick, ref } from 'vue';
import type { Page, Problem } from '@hodboard/shared';
import { ApiError } from '@/api/http';
import { usePagedTable, type PagedTableOptions, type PageRequest } from './use-paged-table';

type Row = { id: string; name: string };
type Sort = 'name' | 'createdAt';

const scopes: ReturnType<typeof effectScope>[] = [];

function pagedTable(fetchPage: (request: PageRequest<Sort>) => Promise<Page<Row>>, options: PagedTableOptions<Sort> = {}) {
  const scope = effectScope();
  scopes.push(scope);
  return scope.run(() => usePagedTable(fetchPage, options))!;
}

const page = (items: Row[], total = items.length): Page<Row> => ({ items, total, page: 1, pageSize: 25 });

afterEach(() => {
  while (scopes.length) scopes.pop()!.stop();
  vi.useRealTimers();
});

describe('usePagedTable', () => {
  it('binds the loaded rows, paging and sort to the DataTable props', async () => {
    const fetchPage = vi.fn(async () => page([{ id: 'a', name: 'North' }], 60));
    const table = pagedTable(fetchPage, { sort: 'name', order: 'desc' });
    expect(table.tableProps.value.loading).toBe(true);
    await vi.waitFor(() => expect(table.tableProps.value.loading).toBe(false));

    expect(table.tableProps.value).toMatchObject({
      value: [{ id: 'a', name: 'North' }],
      lazy: true,
      paginator: true,
      rows: 25,
      first: 0,
      totalRecords: 60,
      rowsPerPageOptions: [10, 25, 50],
      sortField: 'name',
      sortOrder: -1,
      dataKey: 'id',
    });
    expect(fetchPage).toHaveBeenCalledWith({ page: 1, pageSize: 25, sort: 'name', order: 'desc', q: undefined });
  });

  it('loads the page the table asks for through the bound page and sort events', async () => {
    const fetchPage = vi.fn(async () => page([], 60));
    const table = pagedTable(fetchPage, { sort: 'name' });
    await vi.waitFor(() => expect(fetchPage).toHaveBeenCalledTimes(1));

    table.tableProps.value.onPage({ page: 2, rows: 10 });
    expect(fetchPage).toHaveBeenLastCalledWith(expect.objectContaining({ page: 3, pageSize: 10 }));
    expect(table.tableProps.value).toMatchObject({ first: 20, rows: 10 });

    table.tableProps.value.onSort({ sortField: 'createdAt', sortOrder: -1 });
    expect(fetchPage).toHaveBeenLastCalledWith(expect.objectContaining({ page: 1, sort: 'createdAt', order: 'desc' }));
    expect(table.tableProps.value).toMatchObject({ first: 0, sortField: 'createdAt', sortOrder: -1 });
  });

  it('searches from page one once typing pauses, and again when a filter changes', async () => {
    vi.useFakeTimers();
    const fetchPage = vi.fn(async () => page([]));
    const status = ref<string | null>(null);
    const table = pagedTable(fetchPage, { watchSources: [status] });
    table.onPage({ page: 1, rows: 25 });
    fetchPage.mockClear();

    table.search.value = '  north ';
    await nextTick();
    await vi.advanceTimersByTimeAsync(299);
    expect(fetchPage).not.toHaveBeenCalled();
    await vi.advanceTimersByTimeAsync(1);
    expect(fetchPage).toHaveBeenCalledWith(expect.objectContaining({ page: 1, q: 'north' }));

    status.value = 'booked';
    await nextTick();
    expect(fetchPage).toHaveBeenCalledTimes(2);
  });

  it('says why the list did not load, and clears it once a reload works', async () => {
    const problem: Problem = { type: 'about:blank', title: 'Not allowed', status: 403, code: 'forbidden' };
    const fetchPage = vi.fn<(request: PageRequest<Sort>) => Promise<Page<Row>>>().mockRejectedValueOnce(new ApiError(problem));
    fetchPage.mockResolvedValue(page([]));
    const table = pagedTable(fetchPage);
    await vi.waitFor(() => expect(table.loadError.value).toBe('Your role in this firm does not allow that.'));

    await table.reload();
    expect(table.loadError.value).toBeNull();
  });

  it('drives a real DataTable through v-bind: its paginator asks for the next page', async () => {
    const fetchPage = vi.fn(async ({ page: number }: PageRequest<Sort>) =>
      ({ items: [{ id: `row-${number}`, name: `Crew ${number}` }], total: 30, page: number, pageSize: 10 }),
    );
    const Harness = defineComponent(() => {
      const { tableProps } = usePagedTable(fetchPage, { pageSize: 10 });
      return () => h(DataTable, tableProps.value, () => h(Column, { field: 'name', header: 'Crew' }));
    });
    const wrapper = mount(Harness, { global: { plugins: [PrimeVue] } });
    await flushPromises();
    expect(wrapper.text()).toContain('Crew 1');

    await wrapper.get('button[aria-label="Next Page"]').trigger('click');
    await flushPromises();
    expect(fetchPage).toHaveBeenLastCalledWith(expect.objectContaining({ page: 2, pageSize: 10 }));
    expect(wrapper.text()).toContain('Crew 2');
    wrapper.unmount();
  });

  it('keeps the newest answer when an older, slower one arrives last', async () => {
    let answerFirst: (value: Page<Row>) => void = () => {};
    const fetchPage = vi
      .fn<(request: PageRequest<Sort>) => Promise<Page<Row>>>()
      .mockImplementationOnce(() => new Promise((resolve) => (answerFirst = resolve)))
      .mockResolvedValueOnce(page([{ id: 'new', name: 'Newer' }]));
    const table = pagedTable(fetchPage);
    await table.reload();
    answerFirst(page([{ id: 'old', name: 'Older' }]));
    await Promise.resolve();
    expect(table.tableProps.value.value).toEqual([{ id: 'new', name: 'Newer' }]);
  });
});
