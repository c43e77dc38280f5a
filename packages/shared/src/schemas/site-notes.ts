import { z } from 'zod';
import { idSchema, requiredText } from './common.js';

/** Set by the phone so a note queued offline and sent twice is stored once. */
export const idempotencyKeySchema = z.string().trim().min(8).max(80);

export const siteNoteInputSchema = z.object({
  jobId: idSchema,
  body: requiredText(2000, 'The note'),
  idempotencyKey: idempotencyKeySchema.optional(),
});
export type SiteNoteInput = z.input<typeof siteNoteInputSchema>;
export type SiteNoteValues = z.output<typeof siteNoteInputSchema>;

export const siteNoteListQuerySchema = z.object({ jobId: idSchema });

export interface SiteNoteDto {
  id: string;
  jobId: string;
  body: string;
  authorName: string;
  /** Where the note was written: on a crew's phone or in the office. */
  authorRole: 'office' | 'crew';
  createdAt: string;
}
