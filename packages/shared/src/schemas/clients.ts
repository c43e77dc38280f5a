import { z } from 'zod';
import { idSchema, optionalEmailSchema, optionalText, pageQuerySchema, requiredText } from './common.js';

const phoneSchema = z
  .string()
  .trim()
  .max(40)
  .regex(/^[+()0-9 .-]*$/, { message: 'Use digits, spaces and + ( ) - only' })
  .optional()
  .nullable()
  .transform((value) => (value ? value : null));

export const clientInputSchema = z.object({
  name: requiredText(120, 'Client name'),
  contactName: optionalText(120),
  email: optionalEmailSchema,
  phone: phoneSchema,
  notes: optionalText(2000),
});
export type ClientInput = z.input<typeof clientInputSchema>;

export const clientListQuerySchema = pageQuerySchema(['name', 'createdAt', 'email']);
export type ClientListQuery = z.infer<typeof clientListQuerySchema>;

export interface ClientDto {
  id: string;
  name: string;
  contactName: string | null;
  email: string | null;
  phone: string | null;
  notes: string | null;
  siteCount: number;
  version: number;
  createdAt: string;
}

/** UK postcode shape (outward + inward code); normalised to upper case with one space. */
export const postcodeSchema = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^[A-Z]{1,2}[0-9][A-Z0-9]? ?[0-9][A-Z]{2}$/, { message: 'Enter a UK postcode like LS6 2AB' })
  .transform((value) => value.replace(/^(.+?) ?(\d[A-Z]{2})$/, '$1 $2'));

export const siteInputSchema = z.object({
  clientId: idSchema,
  addressLine1: requiredText(160, 'Address'),
  addressLine2: optionalText(160),
  town: requiredText(80, 'Town'),
  postcode: postcodeSchema,
  accessNotes: optionalText(2000),
  hazards: optionalText(2000),
  lat: z.number().min(-90).max(90).nullable().optional().transform((value) => value ?? null),
  lon: z.number().min(-180).max(180).nullable().optional().transform((value) => value ?? null),
});
export type SiteInput = z.input<typeof siteInputSchema>;

export const siteListQuerySchema = pageQuerySchema(['postcode', 'town', 'addressLine1', 'createdAt']).extend({
  clientId: idSchema.optional(),
});
export type SiteListQuery = z.infer<typeof siteListQuerySchema>;

export interface SiteDto {
  id: string;
  clientId: string;
  clientName: string;
  addressLine1: string;
  addressLine2: string | null;
  town: string;
  postcode: string;
  accessNotes: string | null;
  hazards: string | null;
  lat: number | null;
  lon: number | null;
  version: number;
  createdAt: string;
}
