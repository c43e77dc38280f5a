import { z } from 'zod';
import type { ForecastHour } from '@hodboard/shared';

/** Where hourly forecasts come from; the app never talks to a weather service any other way. */
export interface ForecastProvider {
  hourly(lat: number, lon: number, days: number): Promise<ForecastHour[]>;
}

const responseSchema = z.object({
  hourly: z.object({
    time: z.array(z.string()),
    temperature_2m: z.array(z.number().nullable()),
    wind_speed_10m: z.array(z.number().nullable()),
    wind_gusts_10m: z.array(z.number().nullable()),
    precipitation: z.array(z.number().nullable()),
    precipitation_probability: z.array(z.number().nullable()),
  }),
});

/**
 * Adapter for a hosted hourly forecast API with the common `/v1/forecast` query shape (hourly variables by
 * name, wind in m/s, times in GMT). Hours with a missing value are dropped rather than guessed.
 */
export class HttpForecastProvider implements ForecastProvider {
  constructor(
    private readonly baseUrl: string,
    private readonly apiKey?: string,
    private readonly timeoutMs = 8000,
  ) {}

  async hourly(lat: number, lon: number, days: number): Promise<ForecastHour[]> {
    const url = new URL('/v1/forecast', this.baseUrl);
    url.searchParams.set('latitude', lat.toFixed(4));
    url.searchParams.set('longitude', lon.toFixed(4));
    url.searchParams.set('hourly', 'temperature_2m,wind_speed_10m,wind_gusts_10m,precipitation,precipitation_probability');
    url.searchParams.set('wind_speed_unit', 'ms');
    url.searchParams.set('timezone', 'GMT');
    url.searchParams.set('past_days', '1');
    url.searchParams.set('forecast_days', String(days));
    if (this.apiKey) url.searchParams.set('apikey', this.apiKey);
    const res = await fetch(url, { signal: AbortSignal.timeout(this.timeoutMs) });
    if (!res.ok) throw new Error(`forecast service answered ${res.status}`);
    const { hourly } = responseSchema.parse(await res.json());
    const hours: ForecastHour[] = [];
    hourly.time.forEach((time, i) => {
      const values = [hourly.temperature_2m[i], hourly.wind_speed_10m[i], hourly.wind_gusts_10m[i], hourly.precipitation[i], hourly.precipitation_probability[i]];
      if (values.some((v) => v === null || v === undefined)) return;
      const [tempC, windMeanMs, windGustMs, precipMm, probability] = values as number[];
      hours.push({
        time: new Date(`${time.length === 16 ? `${time}:00` : time}Z`).toISOString(),
        tempC: tempC!, windMeanMs: windMeanMs!, windGustMs: Math.max(windGustMs!, windMeanMs!), precipMm: precipMm!,
        precipProbability: Math.min(1, Math.max(0, probability! / 100)),
      });
    });
    return hours;
  }
}

/** Postcode → position, for sites entered without coordinates. */
export interface Geocoder {
  locate(postcode: string): Promise<{ lat: number; lon: number } | null>;
}

const postcodeSchema = z.object({ result: z.object({ latitude: z.number(), longitude: z.number() }).nullable() });

/** Adapter for a postcode lookup API answering `GET /postcodes/:postcode` with `{ result: { latitude, longitude } }`. */
export class HttpGeocoder implements Geocoder {
  constructor(
    private readonly baseUrl: string,
    private readonly timeoutMs = 5000,
  ) {}

  async locate(postcode: string): Promise<{ lat: number; lon: number } | null> {
    const res = await fetch(new URL(`/postcodes/${encodeURIComponent(postcode)}`, this.baseUrl), { signal: AbortSignal.timeout(this.timeoutMs) });
    if (res.status === 404) return null;
    if (!res.ok) throw new Error(`postcode service answered ${res.status}`);
    const body = postcodeSchema.parse(await res.json());
    return body.result ? { lat: body.result.latitude, lon: body.result.longitude } : null;
  }
}
