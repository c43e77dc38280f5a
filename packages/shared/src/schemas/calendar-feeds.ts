import { z } from 'zod';

export interface CalendarFeedDto {
  id: string;
  createdAt: string;
  lastFetchedAt: string | null;
  /** Only in the answer that creates the feed: the secret link is never stored in the clear. */
  url?: string;
}

export const calendarFeedTokenParamsSchema = z.object({
  token: z.string().regex(/^[A-Za-z0-9_-]{30,100}\.ics$/, { message: 'Not a calendar link' }),
});

/** How far the feed reaches, in days around today. */
export const CALENDAR_FEED_PAST_DAYS = 14;
export const CALENDAR_FEED_FUTURE_DAYS = 120;
