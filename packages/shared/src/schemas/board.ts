import { z } from 'zod';
import { idSchema, isoDateSchema, optionalText, requiredText } from './common.js';
import type { JobDto } from './jobs.js';
import type { AccessBandDto } from './access.js';
import type { DayWeatherDto } from './weather.js';
import type { HoldReason } from '../terms/weather.js';

export const boardQuerySchema = z
  .object({
    from: isoDateSchema,
    to: isoDateSchema,
    crewId: idSchema.optional(),
  })
  .refine((q) => q.from <= q.to, { message: 'The end must be on or after the start', path: ['to'] })
  .refine((q) => Date.parse(q.to) - Date.parse(q.from) <= 370 * 86_400_000, {
    message: 'Ask for at most a year at a time',
    path: ['to'],
  });
export type BoardQuery = z.infer<typeof boardQuerySchema>;

export const assignmentCreateSchema = z.object({
  jobId: idSchema,
  crewId: idSchema,
  startDate: isoDateSchema,
  /** Defaults to the job's estimated working days. */
  workingDays: z.number().int().min(1).max(250).optional(),
  /** The office has seen that this double-books the crew and wants it anyway. */
  confirmDoubleBooking: z.boolean().default(false),
});
export type AssignmentCreateInput = z.input<typeof assignmentCreateSchema>;

export const assignmentUpdateSchema = z.object({
  crewId: idSchema,
  startDate: isoDateSchema,
  workingDays: z.number().int().min(1).max(250),
  version: z.number().int().min(1),
  confirmDoubleBooking: z.boolean().default(false),
});
export type AssignmentUpdateInput = z.input<typeof assignmentUpdateSchema>;

/** A crew lead's end-of-day report: the days up to `date` are done and this many working days remain. */
export const assignmentProgressSchema = z.object({
  date: isoDateSchema,
  remainingWorkingDays: z.number().int().min(0).max(250),
  version: z.number().int().min(1),
  idempotencyKey: z.string().trim().min(8).max(80).optional(),
});
export type AssignmentProgressInput = z.input<typeof assignmentProgressSchema>;

export const assignmentRemoveSchema = z.object({ version: z.coerce.number().int().min(1) });

export interface AssignmentDto {
  id: string;
  jobId: string;
  crewId: string;
  startDate: string;
  workingDays: number;
  /** The working dates the crew is booked, in order. */
  days: string[];
  version: number;
  updatedBy: string | null;
  updatedAt: string;
}

/** An assignment as a board card carries it: who changed it last is on the job's history, not on every card. */
export type BoardAssignmentDto = Omit<AssignmentDto, 'updatedBy' | 'updatedAt'>;

export const conflictKinds = [
  'double-booked',
  'member-on-leave',
  'before-earliest-start',
  'after-target-finish',
  'outside-access-window',
  'weather-stop',
  'inspection-overdue',
  'access-not-confirmed',
  'hire-extended',
] as const;
export type ConflictKind = (typeof conflictKinds)[number];

export interface ConflictDto {
  kind: ConflictKind;
  assignmentId: string;
  jobId: string;
  crewId: string;
  /** The day concerned, when the conflict is about one day. */
  date: string | null;
  severity: 'warning' | 'stop';
  message: string;
}

export interface BoardDayDto {
  date: string;
  isWorkingDay: boolean;
  /** Why the firm does not work it: a public holiday's name, a closure's label, or the weekend. */
  offReason: string | null;
}

export interface BoardCrewDto {
  id: string;
  name: string;
  colour: string;
  /** Days the whole crew is off within the range, with the leave's label. */
  leave: Array<{ date: string; label: string }>;
  /** Days a member is off while the crew works. */
  memberLeave: Array<{ date: string; memberId: string; name: string; label: string }>;
}

export type BoardJobDto = Pick<
  JobDto,
  'id' | 'reference' | 'title' | 'clientName' | 'siteAddress' | 'status' | 'estimatedWorkingDays' | 'workTypes' | 'accessNeeds' | 'earliestStart' | 'targetFinish' | 'priority' | 'version'
>;

/** A job-day stood down for the weather, as the board marks it. */
export interface BoardHoldDayDto {
  holdId: string;
  jobId: string;
  date: string;
  reason: HoldReason;
  /** Open: waiting for the office to re-plan; replanned: settled, kept so the lost day still shows. */
  status: 'open' | 'replanned';
}

export interface BoardDto {
  from: string;
  to: string;
  days: BoardDayDto[];
  crews: BoardCrewDto[];
  assignments: BoardAssignmentDto[];
  /** Jobs of the assignments in range, and the tray's jobs, by id. */
  jobs: Record<string, BoardJobDto>;
  /** Booked jobs not yet on a crew. */
  trayJobIds: string[];
  conflicts: ConflictDto[];
  /** Access bookings of the jobs in range, drawn as bands under their jobs. */
  accessBands: AccessBandDto[];
  /** The weather verdict of each scheduled job-day that has a forecast. */
  weather: DayWeatherDto[];
  /** Days in range stood down on the jobs shown (withdrawn stand-downs left out), one per job and day. */
  holdDays: BoardHoldDayDto[];
  /** The newest schedule event included; a reconnecting client asks for changes after it. */
  lastEventId: number;
}

export interface ScheduleChangeDto {
  assignment: AssignmentDto | null;
  removedAssignmentId?: string;
  job: BoardJobDto;
  /** Assignments whose conflicts were recomputed; the client replaces its conflicts for these with `conflicts`. */
  affectedAssignmentIds: string[];
  conflicts: ConflictDto[];
  /** Current bands of the bookings tied to the changed job. */
  accessBands: AccessBandDto[];
  /** Weather verdicts of the changed job's days. */
  weather: DayWeatherDto[];
  crewIds: string[];
  actorName: string;
}

export const timeOffScopes = ['firm', 'crew', 'member'] as const;
export const timeOffRepeats = ['none', 'weekly', 'fortnightly', 'monthly'] as const;

export const timeOffInputSchema = z
  .object({
    scope: z.enum(timeOffScopes),
    crewId: idSchema.nullable().optional().transform((v) => v ?? null),
    memberId: idSchema.nullable().optional().transform((v) => v ?? null),
    label: requiredText(80, 'Label'),
    startDate: isoDateSchema,
    endDate: isoDateSchema,
    repeats: z.enum(timeOffRepeats).default('none'),
    /** Last date a repeating entry recurs; open-ended when absent. */
    repeatUntil: isoDateSchema.nullable().optional().transform((v) => v ?? null),
    notes: optionalText(500),
  })
  .refine((t) => t.startDate <= t.endDate, { message: 'The last day must be on or after the first', path: ['endDate'] })
  .refine((t) => Date.parse(t.endDate) - Date.parse(t.startDate) <= 62 * 86_400_000, {
    message: 'One entry covers at most two months',
    path: ['endDate'],
  })
  .refine((t) => t.scope !== 'crew' || t.crewId, { message: 'Pick the crew', path: ['crewId'] })
  .refine((t) => t.scope !== 'member' || t.memberId, { message: 'Pick the person', path: ['memberId'] })
  .refine((t) => !t.repeatUntil || t.repeatUntil >= t.startDate, { message: 'Repeat until must be after the first day', path: ['repeatUntil'] });
export type TimeOffInput = z.input<typeof timeOffInputSchema>;
export type TimeOffValues = z.output<typeof timeOffInputSchema>;

export const timeOffListQuerySchema = z.object({
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
  crewId: idSchema.optional(),
});

export interface TimeOffDto {
  id: string;
  scope: (typeof timeOffScopes)[number];
  crewId: string | null;
  memberId: string | null;
  label: string;
  startDate: string;
  endDate: string;
  repeats: (typeof timeOffRepeats)[number];
  repeatUntil: string | null;
  notes: string | null;
  /** The entry as RFC 5545 text (DTSTART + RRULE), as the calendar reads it. */
  rule: string;
  version: number;
}

export const scheduleSinceSchema = z.object({ afterEventId: z.number().int().min(0) });

export interface ScheduleEventDto {
  id: number;
  type: string;
  payload: ScheduleChangeDto;
}
