import { z } from 'zod';
import { idSchema, isoDateSchema, optionalText } from './common.js';
import { holdReasons, type HoldReason } from '../terms/weather.js';
import type { ForecastGap, ReasonUnit } from '../rules/forecast.js';
import type { AccessState, AccessType } from '../terms/access.js';

export const holdReasonSchema = z.enum(holdReasons);

export const weatherHoldInputSchema = z.object({
  jobId: idSchema,
  /** The job-days stood down; each must be one of the job's scheduled days. */
  dates: z.array(isoDateSchema).min(1, { message: 'Pick at least one day' }).max(30),
  reason: holdReasonSchema,
  notes: optionalText(1000),
  /** Set by the phone so a stand-down queued offline and sent twice is stored once. */
  idempotencyKey: z.string().trim().min(8).max(80).optional(),
});
export type WeatherHoldInput = z.input<typeof weatherHoldInputSchema>;
export type WeatherHoldValues = z.output<typeof weatherHoldInputSchema>;

export const replanModes = ['push', 'push-and-ripple', 'move-crew', 'none'] as const;
export type ReplanMode = (typeof replanModes)[number];
export const replanSchema = z
  .object({
    mode: z.enum(replanModes),
    /** For move-crew: the crew to take the job. */
    crewId: idSchema.optional(),
    /** For move-crew: the day the new crew starts; defaults to the first day stood down. */
    startDate: isoDateSchema.optional(),
    version: z.number().int().min(1),
    /** The preview's planKey: the commit is refused (409) if the plan would no longer be the one previewed. */
    planKey: z.string().trim().min(1).max(128).optional(),
  })
  .refine((r) => r.mode !== 'move-crew' || r.crewId, { message: 'Pick the crew to take the job', path: ['crewId'] });
export type ReplanInput = z.input<typeof replanSchema>;
export type ReplanValues = z.output<typeof replanSchema>;

/** Takes back a stand-down raised by mistake or overtaken by a better forecast. */
export const holdWithdrawSchema = z.object({
  version: z.number().int().min(1),
  reason: optionalText(500),
});
export type HoldWithdrawInput = z.input<typeof holdWithdrawSchema>;
export type HoldWithdrawValues = z.output<typeof holdWithdrawSchema>;

export interface ForecastSnapshotHour {
  time: string;
  tempC: number;
  windMeanMs: number;
  windGustMs: number;
  precipMm: number;
  precipProbability: number;
}

export interface WeatherHoldDto {
  id: string;
  jobId: string;
  jobReference: string;
  crewId: string | null;
  dates: string[];
  reason: HoldReason;
  notes: string | null;
  raisedBy: string | null;
  raisedFrom: 'office' | 'crew';
  raisedAt: string;
  status: 'open' | 'replanned' | 'withdrawn';
  forecastSeen: ForecastSnapshotHour[];
  /** When the forecast seen was fetched from the provider; null when the site had none. */
  forecastFetchedAt: string | null;
  /** The forecast seen was already past its refresh (the provider was failing) when the stand-down was raised. */
  forecastWasStale: boolean;
  /** How it was re-planned, once it has been. */
  replanMode: ReplanMode | null;
  version: number;
}

export interface ReplanMoveDto {
  jobId: string;
  reference: string;
  title: string;
  clientName: string;
  fromCrewId: string;
  toCrewId: string;
  fromDays: string[];
  toDays: string[];
}

export interface ReplanAccessChangeDto {
  bookingId: string;
  accessType: string;
  state: string;
  fromErect: string | null;
  fromStrike: string | null;
  toErect: string;
  toStrike: string;
  /** What happens: a requested booking follows; a confirmed one asks the supplier. */
  effect: 'follows' | 'asks-supplier';
}

export interface ReplanPreviewDto {
  holdId: string;
  mode: ReplanValues['mode'];
  lostWorkingDays: number;
  /** For move-crew: the job's days before the first day stood down, worked by its first crew; they stay in the job's history. */
  workedDays: string[];
  moves: ReplanMoveDto[];
  accessChanges: ReplanAccessChangeDto[];
  /** Clients who will be e-mailed their new dates. */
  clientsToTell: string[];
  warnings: string[];
  /** Names this plan; sent back with the commit so it applies only what was previewed. */
  planKey: string;
}

/** One rule's finding on a job-day, with the figures it was judged on. */
export interface DayWeatherReasonDto {
  activity: string;
  ruleId: string;
  verdict: 'go' | 'caution' | 'stop';
  message: string;
  source: string;
  /** Start of the forecast hour the observed value comes from; null for whole-day figures. */
  at: string | null;
  /** The limit the rule compares against, in `unit`. */
  threshold: number;
  unit: ReasonUnit;
  /** The worst forecast value the rule saw (highest wind or rain, lowest temperature, fewest usable hours). */
  observed: number;
  /** Wind reasons: the Beaufort force of the forecast mean wind in the `at` hour. */
  beaufort: { force: number; name: string } | null;
}

/**
 * Something to know about a job-day that does not change its verdict: the part of a look-ahead rule's period
 * past the day and the next 48 h, which the forecast does not reach yet. Once per rule, with the activities that gave it.
 */
export interface DayWeatherNoteDto {
  activities: string[];
  ruleId: string;
  message: string;
  source: string;
  /** The spans of the period with no forecast yet, [from, to). */
  uncovered: ForecastGap[];
}

export interface DayWeatherDto {
  assignmentId: string;
  jobId: string;
  date: string;
  verdict: 'go' | 'caution' | 'stop';
  /** Short reasons for the board's panel; the job page has the full assessment. */
  reasons: DayWeatherReasonDto[];
  notes: DayWeatherNoteDto[];
  advice: string[];
  forecastFetchedAt: string | null;
  isStale: boolean;
}

export const forecastRefreshSchema = z.object({ siteId: idSchema.optional() });

/** What losing one at-risk day would do to a live access booking, were the job pushed. */
export interface OutlookAccessKnockOnDto {
  bookingId: string;
  accessType: AccessType;
  state: AccessState;
  /** Confirmed or up: the supplier would be asked for new dates. A requested booking just follows the job. */
  needsChangeRequest: boolean;
  fromErect: string | null;
  fromStrike: string | null;
  toErect: string;
  toStrike: string;
  /** Extra weeks charged over the hire as it stands, and what they cost in pence; null while the hire has no dates. */
  extraHireWeeks: number | null;
  extraHirePence: number | null;
}

/** A job whose dates a one-day push would change: the one stood down, or a later job of its crew rippled along. */
export interface OutlookJobKnockOnDto {
  jobId: string;
  reference: string;
  finishNow: string;
  finishAfterPush: string;
  targetFinish: string | null;
  /** The new finish is after the finish promised to the client; compare `finishNow` to tell whether it already was. */
  passesTargetFinish: boolean;
}

/** A one-day push of the job from an at-risk day, worked out with the same re-plan rules a stand-down uses. */
export interface OutlookKnockOnDto {
  job: OutlookJobKnockOnDto;
  /** The same crew's later jobs that would ripple along, in start order. */
  laterJobs: OutlookJobKnockOnDto[];
  access: OutlookAccessKnockOnDto[];
  /** The extra hire of every booking with dated hire, in pence. */
  extraHirePence: number;
}

export interface WeatherOutlookDto {
  from: string;
  to: string;
  days: DayWeatherDto[];
  atRisk: Array<{
    jobId: string; reference: string; date: string; verdict: 'caution' | 'stop'; crewId: string; hasConfirmedAccess: boolean; targetFinish: string | null;
    /** Null when the day is not one of the job's working days, so losing it moves nothing. */
    knockOn: OutlookKnockOnDto | null;
  }>;
}

export * from './weather-limits.js';
