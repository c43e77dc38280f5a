import type { CalendarFeedDto } from '@hodboard/shared';
import { http } from './http';

export function listCalendarFeeds(): Promise<CalendarFeedDto[]> {
  return http.get<CalendarFeedDto[]>('/calendar-feeds');
}

export function createCalendarFeed(): Promise<CalendarFeedDto> {
  return http.post<CalendarFeedDto>('/calendar-feeds');
}

export function revokeCalendarFeed(id: string): Promise<void> {
  return http.delete(`/calendar-feeds/${encodeURIComponent(id)}`);
}
