import { z } from 'zod';
import { idSchema, isoDateSchema, optionalText, pageQuerySchema, requiredText } from './common.js';

export const workTypes = [
  'chimney',
  'repointing',
  'brickwork',
  'garden-wall',
  'extension',
  'rendering',
  'roofing',
  'groundworks',
  'concrete',
  'repairs',
] as const;
export const workTypeSchema = z.enum(workTypes);
export type WorkType = z.infer<typeof workTypeSchema>;

export const accessNeeds = ['scaffold', 'tower', 'mewp', 'roof-ladder', 'edge-protection'] as const;
export const accessNeedSchema = z.enum(accessNeeds);
export type AccessNeed = z.infer<typeof accessNeedSchema>;

export const jobStatuses = [
  'enquiry',
  'quoted',
  'booked',
  'scheduled',
  'on-site',
  'complete',
  'invoiced',
  'cancelled',
  'stood-down',
] as const;
export const jobStatusSchema = z.enum(jobStatuses);
export type JobStatus = z.infer<typeof jobStatusSchema>;

export const jobStatusLabels: Record<JobStatus, string> = {
  enquiry: 'Enquiry',
  quoted: 'Quoted',
  booked: 'Booked',
  scheduled: 'Scheduled',
  'on-site': 'On site',
  complete: 'Complete',
  invoiced: 'Invoiced',
  cancelled: 'Cancelled',
  'stood-down': 'Stood down',
};

export const jobPriorities = ['low', 'normal', 'high', 'urgent'] as const;
export const jobPrioritySchema = z.enum(jobPriorities);
export type JobPriority = z.infer<typeof jobPrioritySchema>;

export const jobInputSchema = z
  .object({
    clientId: idSchema,
    siteId: idSchema,
    title: requiredText(160, 'Title'),
    description: optionalText(5000),
    workTypes: z.array(workTypeSchema).min(1, { message: 'Pick at least one work type' }).max(10),
    estimatedWorkingDays: z.number().int().min(1, { message: 'At least 1 day' }).max(250),
    accessNeeds: z.array(accessNeedSchema).max(5).default([]),
    earliestStart: isoDateSchema.nullable().optional().transform((value) => value ?? null),
    targetFinish: isoDateSchema.nullable().optional().transform((value) => value ?? null),
    priority: jobPrioritySchema.default('normal'),
    siteNotes: optionalText(5000),
  })
  .refine((job) => !job.earliestStart || !job.targetFinish || job.earliestStart <= job.targetFinish, {
    message: 'Target finish must be on or after the earliest start',
    path: ['targetFinish'],
  });
export type JobInput = z.input<typeof jobInputSchema>;

export const jobListQuerySchema = pageQuerySchema(['reference', 'title', 'status', 'createdAt', 'earliestStart', 'startDate']).extend({
  status: jobStatusSchema.optional(),
  clientId: idSchema.optional(),
  crewId: idSchema.optional(),
  workType: workTypeSchema.optional(),
  /** Jobs whose scheduled days overlap this range. */
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
});
export type JobListQuery = z.infer<typeof jobListQuerySchema>;

export interface JobDto {
  id: string;
  reference: string;
  clientId: string;
  clientName: string;
  siteId: string;
  siteAddress: string;
  title: string;
  description: string | null;
  workTypes: WorkType[];
  estimatedWorkingDays: number;
  accessNeeds: AccessNeed[];
  earliestStart: string | null;
  targetFinish: string | null;
  priority: JobPriority;
  siteNotes: string | null;
  status: JobStatus;
  /** Where the job sits on the board, if it has been placed. */
  assignment: { id: string; crewId: string; crewName: string; startDate: string; endDate: string; workingDays: number; version: number } | null;
  version: number;
  createdAt: string;
}

export interface JobHistoryEntryDto {
  id: string;
  at: string;
  actorName: string | null;
  /** The job itself, or access booked for it. */
  about: 'job' | 'access';
  action: string;
  summary: string;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
}

/** Status moves the office may make by hand; scheduling moves (booked ⇄ scheduled) come from the board. */
export const jobTransitions: Record<JobStatus, readonly JobStatus[]> = {
  enquiry: ['quoted', 'booked', 'cancelled'],
  quoted: ['booked', 'enquiry', 'cancelled'],
  booked: ['scheduled', 'quoted', 'cancelled'],
  scheduled: ['on-site', 'booked', 'stood-down', 'cancelled'],
  'on-site': ['complete', 'stood-down', 'scheduled'],
  'stood-down': ['scheduled', 'on-site', 'booked', 'cancelled'],
  complete: ['invoiced', 'on-site'],
  invoiced: [],
  cancelled: ['enquiry'],
};

export function canTransition(from: JobStatus, to: JobStatus): boolean {
  return jobTransitions[from].includes(to);
}

export const jobStatusChangeSchema = z.object({
  status: jobStatusSchema,
  version: z.number().int().min(1).optional(),
});
export type JobStatusChangeInput = z.infer<typeof jobStatusChangeSchema>;
