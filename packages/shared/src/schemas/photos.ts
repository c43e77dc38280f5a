import { z } from 'zod';
import { idSchema, optionalText } from './common.js';
import { idempotencyKeySchema } from './site-notes.js';

/** The largest original accepted; a phone's full-size JPEG is usually 2–6 MB. */
export const PHOTO_MAX_BYTES = 12 * 1024 * 1024;
export const photoContentTypes = ['image/jpeg', 'image/png', 'image/webp'] as const;
export type PhotoContentType = (typeof photoContentTypes)[number];
export const photoVariants = ['thumb', 'original'] as const;
export type PhotoVariant = (typeof photoVariants)[number];

/** The text fields sent beside the file in the multipart upload. */
export const photoUploadFieldsSchema = z.object({
  jobId: idSchema,
  caption: optionalText(300),
  idempotencyKey: idempotencyKeySchema.optional(),
});
export type PhotoUploadFields = z.output<typeof photoUploadFieldsSchema>;

export const photoListQuerySchema = z.object({ jobId: idSchema });

export interface PhotoDto {
  id: string;
  jobId: string;
  caption: string | null;
  contentType: PhotoContentType;
  sizeBytes: number;
  width: number;
  height: number;
  /** When the camera took it (from the photo's EXIF), if it says. */
  takenAt: string | null;
  uploadedAt: string;
  uploadedBy: string;
  /** The firm's setting removed the photo's location before it was stored. */
  isLocationRemoved: boolean;
  /** Signed links that work without a session for about a day, so an <img> and the offline cache can load them. */
  thumbUrl: string;
  originalUrl: string;
}

export const photoSettingsSchema = z.object({
  /** Remove GPS position from originals before storing them. */
  removeLocation: z.boolean(),
});
export type PhotoSettings = z.output<typeof photoSettingsSchema>;
