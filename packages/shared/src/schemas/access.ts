import { z } from 'zod';
import { idSchema, isoDateSchema, optionalEmailSchema, optionalText, pageQuerySchema, requiredText } from './common.js';
import type { PhotoDto } from './photos.js';
import { accessStates, accessTypes, type AccessCancelReason, type AccessState, type AccessType } from '../terms/access.js';

export const accessTypeSchema = z.enum(accessTypes);

const penceSchema = z.number().int({ message: 'Whole pence only' }).min(0).max(100_000_000);

export const supplierInputSchema = z.object({
  name: requiredText(120, 'Supplier name'),
  contactName: optionalText(120),
  email: optionalEmailSchema,
  phone: optionalText(40),
  leadTimeWorkingDays: z.number().int().min(0).max(60).default(3),
  minimumWeeks: z.number().int().min(0).max(52).default(1),
  /** Weekly hire rate per access type, in pence. */
  weeklyRates: z.partialRecord(accessTypeSchema, penceSchema).default({}),
});
export type SupplierInput = z.input<typeof supplierInputSchema>;
export type SupplierValues = z.output<typeof supplierInputSchema>;

export interface SupplierDto extends SupplierValues {
  id: string;
  version: number;
}

export const supplierListQuerySchema = pageQuerySchema(['name']);

export const accessBookingInputSchema = z.object({
  jobIds: z.array(idSchema).min(1, { message: 'Pick at least one job' }).max(10),
  accessType: accessTypeSchema,
  supplierId: idSchema,
  /** Left empty, the dates follow the jobs' days. */
  requestedErect: isoDateSchema.nullable().optional().transform((v) => v ?? null),
  requestedStrike: isoDateSchema.nullable().optional().transform((v) => v ?? null),
  weeklyRate: penceSchema.nullable().optional().transform((v) => v ?? null),
  minimumWeeks: z.number().int().min(0).max(52).nullable().optional().transform((v) => v ?? null),
  /** Weeks of hire the quote priced; later extensions are measured against it. */
  pricedWeeks: z.number().int().min(0).max(520).nullable().optional().transform((v) => v ?? null),
  curingDays: z.number().int().min(0).max(60).default(0),
  reference: optionalText(80),
  notes: optionalText(2000),
});
export type AccessBookingInput = z.input<typeof accessBookingInputSchema>;
export type AccessBookingValues = z.output<typeof accessBookingInputSchema>;

/**
 * The supplier handing the access over as ready to use: when, by whom, the competent person who signed it off, and
 * the tag or register entry it carries.
 */
export const handoverInputSchema = z.object({
  handedOverOn: isoDateSchema,
  handedOverBy: requiredText(120, 'Handed over by'),
  competentPersonName: requiredText(120, "The supplier's competent person"),
  tagReference: optionalText(80),
  notes: optionalText(2000),
});
export type HandoverInput = z.input<typeof handoverInputSchema>;
export type HandoverDto = z.output<typeof handoverInputSchema>;

/** Recording or correcting the handover of access already up (or since struck). */
export const handoverUpdateSchema = handoverInputSchema.extend({ version: z.number().int().min(1) });

export const accessStateChangeSchema = z.object({
  state: z.enum(accessStates),
  /** For confirmed: the dates the supplier confirmed; defaults to the requested ones. */
  confirmedErect: isoDateSchema.optional(),
  confirmedStrike: isoDateSchema.optional(),
  /** For erected: the supplier's handover; its date is the day the access went up. */
  handover: handoverInputSchema.optional(),
  version: z.number().int().min(1),
}).refine((change) => !change.handover || change.state === 'erected', { message: 'A handover goes with marking the access as up', path: ['handover'] });

export const accessListQuerySchema = z.object({
  jobId: idSchema.optional(),
  state: z.enum(accessStates).optional(),
});

/** The jobs of a booking being made, as `jobIds=a,b`, and the kind of access. */
export const accessQuotedWeeksQuerySchema = z.object({
  jobIds: z
    .string()
    .transform((value) => value.split(',').filter(Boolean))
    .pipe(z.array(idSchema).min(1, { message: 'Pick at least one job' }).max(10)),
  accessType: accessTypeSchema,
});

/** Weeks of this kind of access the jobs' accepted quotes priced; a booking left without weeks priced takes these. */
export interface QuotedHireWeeksDto {
  pricedWeeks: number | null;
  quoteReferences: string[];
}

export interface HireCostDto {
  erect: string;
  strike: string;
  hireDays: number;
  chargedWeeks: number;
  pence: number;
  pricedWeeks: number | null;
  /** Extra weeks beyond what was priced, times the weekly rate; 0 when within the price. */
  overPricedPence: number;
}

export interface InspectionStatusDto {
  /** none: not up yet; ok: inspected and in date; due: inspect today before work; overdue: missed. */
  status: 'none' | 'ok' | 'due' | 'overdue' | 'unsafe';
  nextDue: string | null;
  lastInspectedOn: string | null;
  reasons: string[];
  source: string | null;
  /** Days while it was up (or is forecast to be) whose wind reached a stop limit, or that were stood down for wind. */
  adverseDays: string[];
}

export interface AccessChangeRequestDto {
  id: string;
  /** superseded: replaced by a newer request; withdrawn: the booking was cancelled, struck or taken back to a request. */
  status: 'pending' | 'accepted' | 'countered' | 'superseded' | 'withdrawn';
  oldErect: string | null;
  oldStrike: string | null;
  newErect: string;
  newStrike: string;
  counterErect: string | null;
  counterStrike: string | null;
  supplierNote: string | null;
  createdAt: string;
  answeredAt: string | null;
}

export interface ScaffoldInspectionDto {
  id: string;
  inspectedAt: string;
  inspectorName: string;
  result: 'safe' | 'unsafe';
  defects: string | null;
  notes: string | null;
  recordedBy: string | null;
  photos: PhotoDto[];
  /** Null while the access is up: kept for the life of the booking, then until this date. */
  keepUntil: string | null;
  /** The retention period is over, so the record may be discarded. */
  isDiscardable: boolean;
}

export interface AccessBookingDto {
  id: string;
  jobIds: string[];
  jobReferences: string[];
  accessType: AccessType;
  supplierId: string;
  supplierName: string;
  state: AccessState;
  requestedErect: string | null;
  requestedStrike: string | null;
  confirmedErect: string | null;
  confirmedStrike: string | null;
  /** What the jobs' days need now: up by, down from. */
  neededErect: string | null;
  neededStrike: string | null;
  weeklyRate: number;
  minimumWeeks: number;
  curingDays: number;
  reference: string | null;
  notes: string | null;
  hire: HireCostDto | null;
  inspection: InspectionStatusDto;
  pendingChange: AccessChangeRequestDto | null;
  /** The supplier's handover when the access went up; null until recorded. */
  handover: HandoverDto | null;
  /** Still booked, but none of its jobs has days on the board (or all were cancelled): the supplier needs telling. */
  hasNoWork: boolean;
  /** Cancelled by Hodboard when its jobs left the board or were cancelled; null if the office cancelled it, or it is live. */
  cancelledBecause: AccessCancelReason | null;
  version: number;
}

export const inspectionInputSchema = z.object({
  inspectedAt: z.iso.datetime({ offset: true, message: 'Use a date and time' }),
  inspectorName: requiredText(120, 'Inspector'),
  result: z.enum(['safe', 'unsafe']),
  defects: optionalText(2000),
  notes: optionalText(2000),
  /** Photos already sent through the photo upload, to one of the booking's jobs. */
  photoIds: z.array(idSchema).max(12, { message: 'Attach at most 12 photos' }).default([]),
}).refine((i) => i.result === 'safe' || Boolean(i.defects), { message: 'Describe the defects', path: ['defects'] });
export type InspectionInput = z.input<typeof inspectionInputSchema>;

export const inspectionParamsSchema = z.object({ id: idSchema, inspectionId: idSchema });

export const supplierResponseSchema = z.discriminatedUnion('answer', [
  z.object({ answer: z.literal('accept') }),
  z.object({
    answer: z.literal('propose'),
    erectDate: isoDateSchema,
    strikeDate: isoDateSchema,
    note: optionalText(1000),
  }).refine((p) => p.erectDate <= p.strikeDate, { message: 'The strike date must be on or after the erect date', path: ['strikeDate'] }),
]);
export type SupplierResponseInput = z.input<typeof supplierResponseSchema>;

export interface SupplierLinkDto {
  firmName: string;
  supplierName: string;
  accessType: AccessType;
  jobReferences: string[];
  siteAddress: string;
  oldErect: string | null;
  oldStrike: string | null;
  newErect: string;
  newStrike: string;
  status: AccessChangeRequestDto['status'];
  expiresAt: string;
}

/** The band the board draws under a job: when the access is (or should be) up. */
export interface AccessBandDto {
  bookingId: string;
  jobIds: string[];
  accessType: AccessType;
  state: AccessState;
  erect: string;
  strike: string;
  inspection: InspectionStatusDto['status'];
}
