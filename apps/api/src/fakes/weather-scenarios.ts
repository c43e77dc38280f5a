import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { ForecastHour } from '@hodboard/shared';
import { z } from 'zod';

const scenarioSchema = z.object({
  name: z.string(),
  description: z.string(),
  tempMinC: z.number(),
  tempMaxC: z.number(),
  windMeanMs: z.number().min(0),
  gustMs: z.number().min(0),
  showers: z.array(z.object({ fromHour: z.number().int().min(0).max(23), toHour: z.number().int().min(1).max(24), mm: z.number().min(0), probability: z.number().min(0).max(1) })),
});
export type WeatherScenario = z.infer<typeof scenarioSchema>;

export const scenarioNames = ['calm-week', 'gale', 'hard-frost', 'heatwave', 'showers'] as const;
export type ScenarioName = (typeof scenarioNames)[number] | 'mixed';

const scenarios = new Map<string, WeatherScenario>(
  scenarioNames.map((name) => [
    name,
    scenarioSchema.parse(JSON.parse(readFileSync(fileURLToPath(new URL(`./weather-scenarios/${name}.json`, import.meta.url)), 'utf8'))),
  ]),
);

// A week that has a bit of everything, so the demo board shows every verdict.
const MIXED_WEEK: Array<(typeof scenarioNames)[number]> = ['calm-week', 'showers', 'calm-week', 'gale', 'calm-week', 'hard-frost', 'showers'];

function scenarioFor(name: ScenarioName, dayNumber: number): WeatherScenario {
  const key = name === 'mixed' ? MIXED_WEEK[((dayNumber % 7) + 7) % 7]! : name;
  return scenarios.get(key)!;
}

/**
 * Hourly weather for a scenario, in UTC hours. Temperature follows a daily curve (coldest at 05:00, warmest at
 * 14:00); wind builds from mid-morning; a small per-site offset keeps neighbouring sites from being identical.
 */
export function scenarioHours(name: ScenarioName, lat: number, lon: number, fromMs: number, hours: number): ForecastHour[] {
  const siteOffset = Math.abs(Math.sin(lat * 12.9898 + lon * 78.233)) * 0.6;
  const start = Math.floor(fromMs / 3_600_000) * 3_600_000;
  const result: ForecastHour[] = [];
  for (let i = 0; i < hours; i += 1) {
    const time = start + i * 3_600_000;
    const dayNumber = Math.floor(time / 86_400_000);
    const hour = new Date(time).getUTCHours();
    const s = scenarioFor(name, dayNumber);
    const warmth = (1 - Math.cos(((hour - 5 + 24) % 24) / 18 * Math.PI)) / 2;
    const curve = hour >= 5 && hour <= 14 ? (1 - Math.cos(((hour - 5) / 9) * Math.PI)) / 2 : hour > 14 ? 1 - (hour - 14) / 15 : warmth * 0.2;
    const tempC = s.tempMinC + (s.tempMaxC - s.tempMinC) * Math.max(0, Math.min(1, curve)) + siteOffset;
    const windShape = hour >= 9 && hour <= 18 ? 1 : 0.7;
    const shower = s.showers.find((band) => hour >= band.fromHour && hour < band.toHour);
    result.push({
      time: new Date(time).toISOString(),
      tempC: round(tempC),
      windMeanMs: round(s.windMeanMs * windShape),
      windGustMs: round(s.gustMs * windShape),
      precipMm: shower ? shower.mm : 0,
      precipProbability: shower ? shower.probability : 0.05,
    });
  }
  return result;
}

function round(n: number): number {
  return Math.round(n * 10) / 10;
}
