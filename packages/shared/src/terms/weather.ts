/** Why a crew stood a job down. */
export const holdReasons = ['wind', 'rain', 'frost-cold', 'heat', 'other'] as const;
export type HoldReason = (typeof holdReasons)[number];
export const holdReasonLabels: Record<HoldReason, string> = {
  wind: 'Wind',
  rain: 'Rain',
  'frost-cold': 'Frost or cold',
  heat: 'Heat',
  other: 'Other',
};

/** Why a day was stood down, as a sentence ends it: "for wind", "for frost or cold", "for another reason". */
export function stoodDownFor(reason: HoldReason): string {
  return reason === 'other' ? 'for another reason' : `for ${holdReasonLabels[reason].toLowerCase()}`;
}

export const WEATHER_SAFETY_NOTE =
  'Weather verdicts are guidance from the forecast, not a permit. The competent person on site decides whether work is safe, following local regulations, the manufacturer\'s limits and readings taken on site.';
