import type { ClientDto, ClientInput, ClientListQuery, Page } from '@hodboard/shared';
import { http } from './http';

export type ClientQuery = Partial<ClientListQuery>;

export function listClients(query: ClientQuery = {}): Promise<Page<ClientDto>> {
  return http.get<Page<ClientDto>>('/clients', { query });
}

export function getClient(id: string): Promise<ClientDto> {
  return http.get<ClientDto>(`/clients/${encodeURIComponent(id)}`);
}

export function createClient(input: ClientInput): Promise<ClientDto> {
  return http.post<ClientDto>('/clients', input);
}

export function updateClient(id: string, input: ClientInput, version: number): Promise<ClientDto> {
  return http.put<ClientDto>(`/clients/${encodeURIComponent(id)}`, { ...input, version });
}

export function deleteClient(id: string): Promise<void> {
  return http.delete(`/clients/${encodeURIComponent(id)}`);
}
