import { createServer } from 'node:http';
import { pino } from 'pino';
import { createApp, createServices } from './app.js';
import { loadConfig, stripeOptionsFrom } from './config.js';
import { createDataSource } from './db/data-source.js';
import { systemClock } from './lib/clock.js';
import { SmtpMailer } from './services/mailer.js';
import { attachRealtime } from './realtime/socket-server.js';
import { S3Storage } from './services/storage-service.js';
import { storageOptionsFrom, vapidFrom } from './config.js';

const config = loadConfig();
const logger = pino({ level: config.LOG_LEVEL });
const dataSource = createDataSource(config.DATABASE_URL);
await dataSource.initialize();

const deps = {
  dataSource,
  mailer: new SmtpMailer({ host: config.SMTP_HOST, port: config.SMTP_PORT }, config.MAIL_FROM),
  clock: systemClock,
  logger,
  jwtSecret: config.JWT_SECRET,
  appUrl: config.APP_URL,
  accessTokenTtlSeconds: config.ACCESS_TOKEN_TTL_SECONDS,
  refreshTokenTtlDays: config.REFRESH_TOKEN_TTL_DAYS,
  authAttemptsPerWindow: config.AUTH_RATE_LIMIT,
  authAttemptsPerAddress: config.AUTH_ADDRESS_RATE_LIMIT,
  publicLinkLimits: { requests: config.PUBLIC_LINK_RATE_LIMIT, misses: config.PUBLIC_LINK_MISS_LIMIT },
  webDist: config.WEB_DIST,
  storage: new S3Storage(storageOptionsFrom(config)),
  vapid: vapidFrom(config),
  stripe: stripeOptionsFrom(config),
  weatherApiUrl: config.WEATHER_API_URL,
  weatherApiKey: config.WEATHER_API_KEY,
  geocoderUrl: config.GEOCODER_URL,
};
const services = createServices(deps);
const server = createServer(createApp(deps, services));
const io = attachRealtime(server, services.auth, services.events, logger);

server.listen(config.PORT, config.HOST, () => {
  logger.info({ url: config.APP_URL }, 'Hodboard is listening');
});

// Forecasts for sites with work this week, soon after start and then on a schedule; failures keep the last one.
// On the same beat, jobs whose stand-down days have passed with nothing moved go back to work.
const refreshForecasts = async () => {
  await services.forecasts.refreshAll().catch((error: unknown) => logger.error({ err: error }, 'forecast refresh failed'));
  await services.weather.releasePassedStandDowns().catch((error: unknown) => logger.error({ err: error }, 'stand-down release failed'));
};
const firstRefresh = setTimeout(refreshForecasts, 2_000);
// A job placed this week at a site never forecast gets its forecast now, not at the next beat.
const stopFollowingPlacements = services.forecasts.followPlacements(services.events);
const forecastTimer = setInterval(refreshForecasts, config.FORECAST_REFRESH_MINUTES * 60_000);
forecastTimer.unref();

async function shutdown(signal: string): Promise<void> {
  logger.info({ signal }, 'shutting down');
  clearTimeout(firstRefresh);
  clearInterval(forecastTimer);
  stopFollowingPlacements();
  // Closes the HTTP server too.
  await io.close();
  await dataSource.destroy().catch(() => undefined);
  process.exit(0);
}
process.once('SIGINT', () => void shutdown('SIGINT'));
process.once('SIGTERM', () => void shutdown('SIGTERM'));
