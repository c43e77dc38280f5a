import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { scenarioHours, scenarioNames, type ScenarioName } from './weather-scenarios.js';
import type { Fake } from './fake.js';

/**
 * Local stand-in for the hosted forecast and postcode services. The forecast endpoint answers in the shape of
 * an hourly forecast API (`/v1/forecast?latitude&longitude&hourly=…&wind_speed_unit=ms`), the postcode
 * endpoint in the shape of a postcode lookup API (`/postcodes/:postcode`). `POST /scenario` switches the
 * weather everywhere, or for one latitude/longitude, so demos and tests are deterministic.
 */
export function createWeatherFake(options: { port: number; host?: string; scenario?: ScenarioName }): Fake & { url(): string } {
  let defaultScenario: ScenarioName = options.scenario ?? 'mixed';
  const perSite = new Map<string, ScenarioName>();
  let failing = false;
  let server: Server | undefined;

  const siteKey = (lat: number, lon: number) => `${lat.toFixed(3)},${lon.toFixed(3)}`;

  const handler = async (req: import('node:http').IncomingMessage, res: import('node:http').ServerResponse) => {
    const url = new URL(req.url ?? '/', 'http://fake');
    const send = (status: number, body: unknown) => {
      res.writeHead(status, { 'content-type': 'application/json' });
      res.end(JSON.stringify(body));
    };
    if (req.method === 'POST' && url.pathname === '/scenario') {
      const chunks: Buffer[] = [];
      for await (const chunk of req) chunks.push(chunk as Buffer);
      const body = JSON.parse(Buffer.concat(chunks).toString('utf8') || '{}') as { name?: string; lat?: number; lon?: number; failing?: boolean };
      if (typeof body.failing === 'boolean') failing = body.failing;
      if (body.name) {
        if (body.name !== 'mixed' && !scenarioNames.includes(body.name as never)) return send(400, { error: `unknown scenario ${body.name}` });
        if (typeof body.lat === 'number' && typeof body.lon === 'number') perSite.set(siteKey(body.lat, body.lon), body.name as ScenarioName);
        else {
          defaultScenario = body.name as ScenarioName;
          perSite.clear();
        }
      }
      return send(200, { scenario: defaultScenario, failing });
    }
    if (url.pathname === '/v1/forecast') {
      if (failing) return send(503, { error: true, reason: 'Forecast service unavailable (fake set to failing)' });
      const lat = Number(url.searchParams.get('latitude'));
      const lon = Number(url.searchParams.get('longitude'));
      if (!Number.isFinite(lat) || !Number.isFinite(lon)) return send(400, { error: true, reason: 'latitude and longitude are required' });
      const days = Math.min(16, Number(url.searchParams.get('forecast_days') ?? 7));
      const start = url.searchParams.get('start') ? Date.parse(url.searchParams.get('start')!) : Date.now() - 86_400_000;
      const hours = scenarioHours(perSite.get(siteKey(lat, lon)) ?? defaultScenario, lat, lon, start, days * 24);
      return send(200, {
        latitude: lat,
        longitude: lon,
        timezone: 'GMT',
        hourly_units: { time: 'iso8601', temperature_2m: '°C', wind_speed_10m: 'm/s', wind_gusts_10m: 'm/s', precipitation: 'mm', precipitation_probability: '%' },
        hourly: {
          time: hours.map((h) => h.time.slice(0, 16)),
          temperature_2m: hours.map((h) => h.tempC),
          wind_speed_10m: hours.map((h) => h.windMeanMs),
          wind_gusts_10m: hours.map((h) => h.windGustMs),
          precipitation: hours.map((h) => h.precipMm),
          precipitation_probability: hours.map((h) => Math.round(h.precipProbability * 100)),
        },
      });
    }
    const postcode = /^\/postcodes\/(.+)$/.exec(url.pathname);
    if (postcode?.[1]) {
      const code = decodeURIComponent(postcode[1]).toUpperCase().replace(/\s+/g, '');
      if (!/^[A-Z]{1,2}[0-9][A-Z0-9]?[0-9][A-Z]{2}$/.test(code)) return send(404, { status: 404, error: 'Invalid postcode' });
      let hash = 0;
      for (const c of code) hash = (hash * 31 + c.charCodeAt(0)) >>> 0;
      return send(200, { status: 200, result: { postcode: code, latitude: 50.6 + (hash % 3900) / 1000, longitude: -3.4 + ((hash >> 12) % 3600) / 1000 } });
    }
    send(404, { error: 'not found' });
  };

  return {
    name: 'weather',
    async start() {
      server = createServer((req, res) => void handler(req, res));
      await new Promise<void>((resolve) => server!.listen(options.port, options.host ?? '127.0.0.1', resolve));
      return [`forecasts and postcodes on ${this.url()} (scenario: ${defaultScenario}; POST /scenario to change)`];
    },
    url() {
      return `http://${options.host ?? '127.0.0.1'}:${(server!.address() as AddressInfo).port}`;
    },
    async stop() {
      await new Promise((resolve) => server?.close(resolve));
    },
  };
}
