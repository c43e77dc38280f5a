import { z } from 'zod';
import { isoDateSchema } from './common.js';
import type { AccessState, AccessType } from '../terms/access.js';
import type { HoldReason } from '../terms/weather.js';
import type { InspectionStatusDto } from './access.js';
import type { AccessNeed, JobStatus, WorkType } from './jobs.js';
import type { PhotoDto } from './photos.js';
import type { SiteNoteDto } from './site-notes.js';
import type { DayWeatherDto } from './weather.js';

export const crewDaysQuerySchema = z
  .object({ from: isoDateSchema.optional(), days: z.coerce.number().int().min(1).max(21).default(8) })
  .strip();
export type CrewDaysQuery = z.input<typeof crewDaysQuerySchema>;

export interface CrewDayAccessDto {
  bookingId: string;
  accessType: AccessType;
  state: AccessState;
  supplierName: string;
  inspection: InspectionStatusDto;
}

export interface CrewDayHoldDto {
  id: string;
  reason: HoldReason;
  notes: string | null;
  status: 'open' | 'replanned' | 'withdrawn';
  raisedBy: string | null;
  raisedAt: string;
}

export interface CrewMaterialDto {
  description: string;
  quantity: number;
  unit: string;
}

/** One crew's work on one working day, with what the crew needs on site. */
export interface CrewDayDto {
  date: string;
  crewId: string;
  crewName: string;
  assignmentId: string;
  assignmentVersion: number;
  /** Which day of the job this is, counted in working days, and how many there are. */
  dayNumber: number;
  dayCount: number;
  startTime: string;
  endTime: string;
  job: {
    id: string;
    reference: string;
    title: string;
    description: string | null;
    status: JobStatus;
    workTypes: WorkType[];
    accessNeeds: AccessNeed[];
    officeNotes: string | null;
  };
  site: {
    address: string;
    postcode: string;
    /** Opens the phone's maps app; built from the address or the stored position, never fetched. */
    mapsUrl: string;
    /** The same place as a web page, for phones without a geo: handler. */
    mapsWebUrl: string;
    accessNotes: string | null;
    hazards: string | null;
  };
  /** Crew leads only: who to call on the day. */
  client: { firstName: string; phone: string | null } | null;
  weather: DayWeatherDto | null;
  access: CrewDayAccessDto[];
  /** The day's stand-downs, newest first. */
  holds: CrewDayHoldDto[];
  /** From the accepted quote, when there is one. */
  materials: CrewMaterialDto[] | null;
}

export interface CrewWorkingDayDto {
  date: string;
  isWorkingDay: boolean;
  offReason: string | null;
  jobs: Array<{ jobId: string; reference: string; title: string; isStoodDown: boolean }>;
}

export interface CrewDaysDto {
  today: string;
  /** The first working day after today: tomorrow, or the Monday after a Friday. The crew reads its jobs the evening before. */
  nextDay: string;
  timeZone: string;
  /** Job-days from today on, in date order. */
  days: CrewDayDto[];
  /** The next working days after today, for the week-ahead strip. */
  ahead: CrewWorkingDayDto[];
  notes: Record<string, SiteNoteDto[]>;
  photos: Record<string, PhotoDto[]>;
  isLead: boolean;
  lastEventId: number;
  generatedAt: string;
}
