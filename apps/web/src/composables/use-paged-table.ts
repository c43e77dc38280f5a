import { computed, onScopeDispose, ref, shallowRef, watch, type ComputedRef, type Ref, type WatchSource } from 'vue';
import type { Page } from '@hodboard/shared';
import { messageForError } from '@/api/problem-messages';

export interface PageRequest<TSort extends string> {
  page: number;
  pageSize: number;
  sort?: TSort;
  order: 'asc' | 'desc';
  q?: string;
}

export interface PagedTableOptions<TSort extends string> {
  pageSize?: number;
  sort?: TSort;
  order?: 'asc' | 'desc';
  debounceMs?: number;
  /** Other inputs (filters) that should reload from page one when they change. */
  watchSources?: WatchSource[];
  immediate?: boolean;
  rowsPerPageOptions?: number[];
  dataKey?: string;
}

/** The subset of PrimeVue's DataTable page/sort events this composable reads. */
export interface TablePageEvent {
  page: number;
  rows: number;
}
export interface TableSortEvent {
  sortField?: unknown;
  sortOrder?: number | null;
}

/** Everything a lazy, paged and sortable DataTable needs, for `v-bind` (the `on…` keys bind its page and sort events). */
export interface PagedTableProps<T> {
  value: T[];
  lazy: true;
  paginator: true;
  rows: number;
  first: number;
  totalRecords: number;
  rowsPerPageOptions: number[];
  loading: boolean;
  sortField: string | undefined;
  sortOrder: 1 | -1;
  dataKey: string;
  onPage(event: TablePageEvent): void;
  onSort(event: TableSortEvent): void;
}

export interface PagedTable<T, TSort extends string> {
  rows: Ref<T[]>;
  total: Ref<number>;
  page: Ref<number>;
  pageSize: Ref<number>;
  sort: Ref<TSort | undefined>;
  order: Ref<'asc' | 'desc'>;
  search: Ref<string>;
  isLoading: Ref<boolean>;
  error: Ref<unknown>;
  /** Index of the first row, as DataTable's `first` prop expects. */
  first: ComputedRef<number>;
  sortOrder: ComputedRef<1 | -1>;
  tableProps: ComputedRef<PagedTableProps<T>>;
  /** The last failed load in words for the page, or null. */
  loadError: ComputedRef<string | null>;
  onPage(event: TablePageEvent): void;
  onSort(event: TableSortEvent): void;
  reload(): Promise<void>;
}

export function usePagedTable<T, TSort extends string>(
  fetchPage: (request: PageRequest<TSort>) => Promise<Page<T>>,
  options: PagedTableOptions<TSort> = {},
): PagedTable<T, TSort> {
  const rows = ref<T[]>([]) as Ref<T[]>;
  const total = ref(0);
  const page = ref(1);
  const pageSize = ref(options.pageSize ?? 25);
  const sort = ref<TSort | undefined>(options.sort) as Ref<TSort | undefined>;
  const order = ref<'asc' | 'desc'>(options.order ?? 'asc');
  const search = ref('');
  const isLoading = ref(false);
  const error = shallowRef<unknown>(null);
  let latestRequest = 0;
  let debounceTimer: ReturnType<typeof setTimeout> | undefined;

  async function reload(): Promise<void> {
    const requestId = ++latestRequest;
    isLoading.value = true;
    error.value = null;
    try {
      const q = search.value.trim();
      const result = await fetchPage({
        page: page.value,
        pageSize: pageSize.value,
        sort: sort.value,
        order: order.value,
        q: q || undefined,
      });
      // A slow answer to an older search must not overwrite the newer one.
      if (requestId !== latestRequest) return;
      rows.value = result.items;
      total.value = result.total;
    } catch (caught) {
      if (requestId === latestRequest) error.value = caught;
    } finally {
      if (requestId === latestRequest) isLoading.value = false;
    }
  }

  function onPage(event: TablePageEvent): void {
    page.value = event.page + 1;
    pageSize.value = event.rows;
    void reload();
  }

  function onSort(event: TableSortEvent): void {
    sort.value = typeof event.sortField === 'string' ? (event.sortField as TSort) : undefined;
    order.value = event.sortOrder === -1 ? 'desc' : 'asc';
    page.value = 1;
    void reload();
  }

  watch(search, () => {
    clearTimeout(debounceTimer);
    debounceTimer = setTimeout(() => {
      page.value = 1;
      void reload();
    }, options.debounceMs ?? 300);
  });

  if (options.watchSources?.length) {
    watch(options.watchSources, () => {
      page.value = 1;
      void reload();
    });
  }

  onScopeDispose(() => clearTimeout(debounceTimer));

  if (options.immediate !== false) void reload();

  const first = computed(() => (page.value - 1) * pageSize.value);
  const sortOrder = computed<1 | -1>(() => (order.value === 'desc' ? -1 : 1));
  const rowsPerPageOptions = options.rowsPerPageOptions ?? [10, 25, 50];
  const tableProps = computed<PagedTableProps<T>>(() => ({
    value: rows.value,
    lazy: true,
    paginator: true,
    rows: pageSize.value,
    first: first.value,
    totalRecords: total.value,
    rowsPerPageOptions,
    loading: isLoading.value,
    sortField: sort.value,
    sortOrder: sortOrder.value,
    dataKey: options.dataKey ?? 'id',
    onPage,
    onSort,
  }));

  return {
    rows,
    total,
    page,
    pageSize,
    sort,
    order,
    search,
    isLoading,
    error,
    first,
    sortOrder,
    tableProps,
    loadError: computed(() => (error.value ? messageForError(error.value).detail : null)),
    onPage,
    onSort,
    reload,
  };
}
