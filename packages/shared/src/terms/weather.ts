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

export const WEATHER_SAFETY_NOTE =
  'Weather verdicts are guidance from the forecast, not a permit. The competent person on site decides whether work is safe, following local regulations, the manufacturer\'s limits and readings taken on site.';
