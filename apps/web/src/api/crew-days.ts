import type {
  CrewDaysDto,
  InspectionInput,
  ScaffoldInspectionDto,
  ScheduleChangeDto,
  WeatherHoldDto,
  WeatherHoldInput,
} from '@hodboard/shared';
import { http } from './http';

export function getCrewDays(signal?: AbortSignal): Promise<CrewDaysDto> {
  return http.get<CrewDaysDto>('/crew-days', { signal });
}

/** An answer older than this was asked for on a visit that never showed it; it is not handed to a later one. */
const PREFETCH_FRESH_MS = 20_000;
let prefetched: { answer: Promise<CrewDaysDto>; at: number } | null = null;

/**
 * Asks for the crew's days as the crew home is being opened, while its code is still downloading and starting:
 * on a slow phone the two waits then overlap instead of following each other.
 */
export function prefetchCrewDays(): void {
  if (prefetched && Date.now() - prefetched.at < PREFETCH_FRESH_MS) return;
  const answer = getCrewDays();
  // Read by takePrefetchedCrewDays(); this stops a failure counting as unhandled meanwhile.
  answer.catch(() => undefined);
  prefetched = { answer, at: Date.now() };
}

/** The prefetched answer, once, if it is recent. */
export function takePrefetchedCrewDays(): Promise<CrewDaysDto> | null {
  const taken = prefetched;
  prefetched = null;
  return taken && Date.now() - taken.at < PREFETCH_FRESH_MS ? taken.answer : null;
}

/** Raises a weather hold for the job's days; the office re-plans from it. */
export function raiseStandDown(input: WeatherHoldInput): Promise<WeatherHoldDto> {
  return http.post<WeatherHoldDto>('/weather-holds', input);
}

export interface ProgressInput {
  date: string;
  remainingWorkingDays: number;
  version: number;
  idempotencyKey?: string;
}

/** Marks the day's work done (0 days left) or partly done; the remaining days reshape the job on the board. */
export function recordProgress(assignmentId: string, input: ProgressInput): Promise<ScheduleChangeDto> {
  return http.post<ScheduleChangeDto>(`/assignments/${encodeURIComponent(assignmentId)}/progress`, input);
}

export function recordInspection(bookingId: string, input: InspectionInput): Promise<ScaffoldInspectionDto> {
  return http.post<ScaffoldInspectionDto>(`/access-bookings/${encodeURIComponent(bookingId)}/inspections`, input);
}
