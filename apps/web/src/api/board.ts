import type {
  AssignmentCreateInput,
  AssignmentUpdateInput,
  BoardDto,
  ScheduleChangeDto,
  ScheduleEventDto,
} from '@hodboard/shared';
import { http } from './http';

export interface BoardRange {
  from: string;
  to: string;
  crewId?: string;
}

export function getBoard(range: BoardRange, signal?: AbortSignal): Promise<BoardDto> {
  return http.get<BoardDto>('/board', { query: { ...range }, signal });
}

export function getBoardChanges(afterEventId: number): Promise<ScheduleEventDto[]> {
  return http.get<ScheduleEventDto[]>('/board/changes', { query: { afterEventId } });
}

export function placeAssignment(input: AssignmentCreateInput): Promise<ScheduleChangeDto> {
  return http.post<ScheduleChangeDto>('/assignments', input);
}

export function updateAssignment(id: string, input: AssignmentUpdateInput): Promise<ScheduleChangeDto> {
  return http.put<ScheduleChangeDto>(`/assignments/${encodeURIComponent(id)}`, input);
}

export function removeAssignment(id: string, version: number): Promise<ScheduleChangeDto> {
  return http.delete<ScheduleChangeDto>(`/assignments/${encodeURIComponent(id)}`, { query: { version } });
}
