import type { Page, SiteDto, SiteInput, SiteListQuery } from '@hodboard/shared';
import { http } from './http';

export type SiteQuery = Partial<SiteListQuery>;

export function listSites(query: SiteQuery = {}): Promise<Page<SiteDto>> {
  return http.get<Page<SiteDto>>('/sites', { query });
}

export function getSite(id: string): Promise<SiteDto> {
  return http.get<SiteDto>(`/sites/${encodeURIComponent(id)}`);
}

export function createSite(input: SiteInput): Promise<SiteDto> {
  return http.post<SiteDto>('/sites', input);
}

export function updateSite(id: string, input: SiteInput, version: number): Promise<SiteDto> {
  return http.put<SiteDto>(`/sites/${encodeURIComponent(id)}`, { ...input, version });
}

export function deleteSite(id: string): Promise<void> {
  return http.delete(`/sites/${encodeURIComponent(id)}`);
}
