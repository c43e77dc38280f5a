import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { ClientDto, Problem } from '@hodboard/shared';
import { ApiError } from '@/api/http';
import { useClientOptions } from './use-client-options';

const api = vi.hoisted(() => ({ listClients: vi.fn() }));
const toast = vi.hoisted(() => ({ showProblem: vi.fn(), showSaved: vi.fn() }));
vi.mock('@/api/clients', () => api);
vi.mock('./use-problem-toast', () => ({ useProblemToast: () => toast }));

const client = (id: string, name: string): ClientDto => ({
  id, name, contacts: [], notes: null, siteCount: 0, version: 1, createdAt: '2027-01-04T08:00:00.000Z',
});

describe('useClientOptions', () => {
  beforeEach(() => vi.clearAllMocks());

  it('offers the first clients by name, then those matching the filter text', async () => {
    api.listClients.mockResolvedValueOnce({ items: [client('c1', 'Ashworth Trust'), client('c2', 'Brindle Homes')], total: 2, page: 1, pageSize: 50 });
    const { clientOptions, loadClients } = useClientOptions();
    await loadClients();
    expect(api.listClients).toHaveBeenLastCalledWith({ pageSize: 50, sort: 'name', q: undefined });
    expect(clientOptions.value).toEqual([
      { value: 'c1', label: 'Ashworth Trust' },
      { value: 'c2', label: 'Brindle Homes' },
    ]);

    api.listClients.mockResolvedValueOnce({ items: [client('c2', 'Brindle Homes')], total: 1, page: 1, pageSize: 50 });
    await loadClients('brin');
    expect(api.listClients).toHaveBeenLastCalledWith({ pageSize: 50, sort: 'name', q: 'brin' });
    expect(clientOptions.value).toEqual([{ value: 'c2', label: 'Brindle Homes' }]);
  });

  it('toasts a failed load and keeps the picks it had', async () => {
    api.listClients.mockResolvedValueOnce({ items: [client('c1', 'Ashworth Trust')], total: 1, page: 1, pageSize: 50 });
    const refusal = new ApiError({ type: 'about:blank', title: 'Not allowed', status: 403, code: 'forbidden' } satisfies Problem);
    const { clientOptions, loadClients } = useClientOptions();
    await loadClients();
    api.listClients.mockRejectedValueOnce(refusal);
    await loadClients('ash');
    expect(toast.showProblem).toHaveBeenCalledWith(refusal);
    expect(clientOptions.value).toEqual([{ value: 'c1', label: 'Ashworth Trust' }]);
  });
});
