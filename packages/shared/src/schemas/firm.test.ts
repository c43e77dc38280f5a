import { describe, expect, it } from 'vitest';
import { firmSettingsSchema } from './firm.js';

describe('firm settings', () => {
  // Source: IANA Time Zone Database zone names, as ECMA-402 Intl.DateTimeFormat's timeZone option accepts them.
  it.each([
    ['Europe/London', true],
    ['Europe/Dublin', true],
    ['UTC', true],
    ['34g', false],
    ['Europe/Lowmoor', false],
    ['GMT+25', false],
  ])('accepts %s as a time zone: %s', (timeZone, isAccepted) => {
    expect(firmSettingsSchema.safeParse({ name: 'Quarry Lane Masonry', timeZone }).success).toBe(isAccepted);
  });
});
