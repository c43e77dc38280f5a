import type { TimeOffDto, TimeOffInput } from '@hodboard/shared';
import { http } from './http';

export interface TimeOffQuery {
  from?: string;
  to?: string;
  crewId?: string;
}

export function listTimeOff(query: TimeOffQuery = {}): Promise<TimeOffDto[]> {
  return http.get<TimeOffDto[]>('/time-off', { query: { ...query } });
}

export function createTimeOff(input: TimeOffInput): Promise<TimeOffDto> {
  return http.post<TimeOffDto>('/time-off', input);
}

export function updateTimeOff(id: string, input: TimeOffInput, version: number): Promise<TimeOffDto> {
  return http.put<TimeOffDto>(`/time-off/${encodeURIComponent(id)}`, { ...input, version });
}

export function deleteTimeOff(id: string): Promise<void> {
  return http.delete(`/time-off/${encodeURIComponent(id)}`);
}
