import { z } from 'zod';
import { isoDateSchema, optionalEmailSchema, optionalText, requiredText } from './common.js';

export const holidayRegions = [
  { value: 'GB-ENG', label: 'England and Wales' },
  { value: 'GB-SCT', label: 'Scotland' },
  { value: 'GB-NIR', label: 'Northern Ireland' },
] as const;

/** A name the runtime's time-zone data knows (the IANA database, e.g. "Europe/London"); every date sum reads it. */
export function isTimeZone(value: string): boolean {
  try {
    new Intl.DateTimeFormat('en-GB', { timeZone: value });
    return true;
  } catch {
    return false;
  }
}

export const firmSettingsSchema = z.object({
  name: requiredText(120, 'Firm name'),
  email: optionalEmailSchema,
  phone: optionalText(40),
  address: optionalText(400),
  timeZone: z
    .string()
    .trim()
    .min(1)
    .max(64)
    .refine(isTimeZone, { message: 'Pick a time zone such as Europe/London' })
    .default('Europe/London'),
  holidayRegion: z.enum(['GB-ENG', 'GB-SCT', 'GB-NIR']).default('GB-ENG'),
  workingWeekdays: z
    .array(z.number().int().min(1).max(7))
    .min(1, { message: 'Pick at least one working day' })
    .max(7)
    .default([1, 2, 3, 4, 5]),
  dayStart: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, { message: 'Use a time like 08:00' }).default('08:00'),
  dayEnd: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, { message: 'Use a time like 16:30' }).default('16:30'),
  closures: z.array(isoDateSchema).max(366).default([]),
});
export type FirmSettingsInput = z.input<typeof firmSettingsSchema>;
export type FirmSettings = z.output<typeof firmSettingsSchema>;

export interface FirmDto extends FirmSettings {
  id: string;
  version: number;
}
