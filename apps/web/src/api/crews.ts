import type { CrewDto, CrewInput, CrewListQuery, Page } from '@hodboard/shared';
import { http } from './http';

export type CrewQuery = Partial<CrewListQuery>;

export function listCrews(query: CrewQuery = {}): Promise<Page<CrewDto>> {
  return http.get<Page<CrewDto>>('/crews', { query });
}

export function getCrew(id: string): Promise<CrewDto> {
  return http.get<CrewDto>(`/crews/${encodeURIComponent(id)}`);
}

export function createCrew(input: CrewInput): Promise<CrewDto> {
  return http.post<CrewDto>('/crews', input);
}

export function updateCrew(id: string, input: CrewInput, version: number): Promise<CrewDto> {
  return http.put<CrewDto>(`/crews/${encodeURIComponent(id)}`, { ...input, version });
}

export function deleteCrew(id: string): Promise<void> {
  return http.delete(`/crews/${encodeURIComponent(id)}`);
}
