import { z } from 'zod';

export const idSchema = z.uuid({ message: 'Must be a valid id' });
export const idParamsSchema = z.object({ id: idSchema });

const trimmed = (max: number) => z.string().trim().max(max, { message: `At most ${max} characters` });
export const requiredText = (max: number, label = 'This field') =>
  trimmed(max).min(1, { message: `${label} is required` });
export const optionalText = (max: number) =>
  trimmed(max)
    .optional()
    .nullable()
    .transform((value) => (value ? value : null));

export const emailSchema = z
  .string()
  .trim()
  .toLowerCase()
  .max(254, { message: 'At most 254 characters' })
  .pipe(z.email({ message: 'Enter a valid e-mail address' }));

export const optionalEmailSchema = z
  .union([z.literal(''), emailSchema])
  .optional()
  .nullable()
  .transform((value) => (value ? value : null));

export const passwordSchema = z
  .string()
  .min(10, { message: 'Use at least 10 characters' })
  .max(200, { message: 'At most 200 characters' });

export const isoDateSchema = z.iso.date({ message: 'Use a date like 2027-03-14' });

export const sortOrderSchema = z.enum(['asc', 'desc']);

export function pageQuerySchema<const TSort extends readonly [string, ...string[]]>(sortFields: TSort) {
  return z.object({
    page: z.coerce.number().int().min(1).max(100_000).default(1),
    pageSize: z.coerce.number().int().min(1).max(200).default(25),
    sort: z.enum(sortFields).optional(),
    order: sortOrderSchema.default('asc'),
    q: z.string().trim().max(200).optional(),
  });
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

/** Optional optimistic-concurrency guard carried by update payloads. */
export const versionSchema = z.object({ version: z.number().int().min(1).optional() });
