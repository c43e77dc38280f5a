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

export const MAX_CLIENT_CONTACTS = 20;

/** One person at the client: a tenant, a clerk, the owner's partner. A contact needs at least one way to reach them or a name. */
export const clientContactSchema = z
  .object({
    name: optionalText(120),
    /** What they are to the client or the job, in the firm's words ("Tenant", "Clerk to the council"). */
    role: optionalText(80),
    email: optionalEmailSchema,
    phone: phoneSchema,
  })
  .refine((contact) => Boolean(contact.name || contact.email || contact.phone), {
    message: 'Give a name, e-mail or phone number, or remove this contact',
    path: ['name'],
  });
export type ClientContactInput = z.input<typeof clientContactSchema>;
export type ClientContact = z.output<typeof clientContactSchema>;

export const clientInputSchema = z.object({
  name: requiredText(120, 'Client name'),
  /** The first is the main contact (see mainContact). */
  contacts: z.array(clientContactSchema).max(MAX_CLIENT_CONTACTS, { message: `At most ${MAX_CLIENT_CONTACTS} contacts` }).default([]),
  notes: optionalText(2000),
});
export type ClientInput = z.input<typeof clientInputSchema>;

/** The contact quotes and notices are addressed to and the crew phone offers to ring: the first one listed. */
export function mainContact(contacts: readonly ClientContact[]): ClientContact | null {
  return contacts[0] ?? null;
}

export const clientListQuerySchema = pageQuerySchema(['name', 'createdAt', 'email']);
export type ClientListQuery = z.infer<typeof clientListQuerySchema>;

export interface ClientDto {
  id: string;
  name: string;
  contacts: ClientContact[];
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
