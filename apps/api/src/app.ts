import 'reflect-metadata';
import { existsSync } from 'node:fs';
import path from 'node:path';
import compression from 'compression';
import cookieParser from 'cookie-parser';
import express, { Router, type Express, type RequestHandler } from 'express';
import helmet from 'helmet';
import type { Logger } from 'pino';
import type { DataSource } from 'typeorm';
import type { Clock } from './lib/clock.js';
import { EventBus } from './lib/event-bus.js';
import { authenticate } from './middleware/authenticate.js';
import { notFoundHandler, problemHandler } from './middleware/problem.js';
import { publicLinkLimiters, type LinkLimits } from './middleware/rate-limit.js';
import { requestLogger } from './middleware/request-log.js';
import { validationSpecOf, type ValidationSpec } from './middleware/validate.js';
import { openApiRouter } from './openapi/router.js';
import { accessBookingsRouter, suppliersRouter, supplierLinksRouter } from './routes/access.js';
import { authRouter } from './routes/auth.js';
import { assignmentsRouter, boardRouter } from './routes/board.js';
import { clientsRouter } from './routes/clients.js';
import { crewsRouter } from './routes/crews.js';
import { firmRouter } from './routes/firm.js';
import { jobsRouter } from './routes/jobs.js';
import { peopleRouter } from './routes/people.js';
import { sitesRouter } from './routes/sites.js';
import { timeOffRouter } from './routes/time-off.js';
import { weatherHoldsRouter, weatherRouter } from './routes/weather.js';
import { costingRouter } from './routes/costing.js';
import { materialsRouter } from './routes/materials.js';
import { publicQuotesRouter, quotesRouter, stripeWebhookRouter } from './routes/quotes.js';
import { AccessService } from './services/access-service.js';
import { AuthService } from './services/auth-service.js';
import { BoardCache } from './services/board-cache.js';
import { ClientService } from './services/client-service.js';
import { CrewService } from './services/crew-service.js';
import { FirmService } from './services/firm-service.js';
import { JobService } from './services/job-service.js';
import type { Mailer } from './services/mailer.js';
import { PeopleService } from './services/people-service.js';
import { ScheduleService } from './services/schedule-service.js';
import { TimeOffService } from './services/time-off-service.js';
import { ForecastService } from './services/weather/forecast-service.js';
import { HttpForecastProvider, HttpGeocoder, type ForecastProvider, type Geocoder } from './services/weather/forecast-provider.js';
import { WeatherService } from './services/weather/weather-service.js';
import { SiteService } from './services/site-service.js';
import { calendarFeedsRouter, publicCalendarRouter } from './routes/calendar-feeds.js';
import { crewDaysRouter } from './routes/crew-days.js';
import { photosRouter, publicPhotosRouter } from './routes/photos.js';
import { pushRouter } from './routes/push.js';
import { siteNotesRouter } from './routes/site-notes.js';
import { CalendarFeedService } from './services/calendar-feed-service.js';
import { CrewDayService } from './services/crew-day-service.js';
import { PhotoService } from './services/photo-service.js';
import { PushService, type PushSender, type VapidOptions } from './services/push-service.js';
import { SiteNoteService } from './services/site-note-service.js';
import { MemoryStorage, type ObjectStorage } from './services/storage-service.js';
import { CostingReportService } from './services/costing-report-service.js';
import { CostingSettingsService } from './services/costing-settings-service.js';
import { MaterialService } from './services/material-service.js';
import { PaymentService, type StripeOptions } from './services/payment-service.js';
import { QuoteService } from './services/quote-service.js';

export interface AppDeps {
  dataSource: DataSource;
  mailer: Mailer;
  clock: Clock;
  logger: Logger;
  events?: EventBus;
  jwtSecret: string;
  appUrl: string;
  accessTokenTtlSeconds?: number;
  refreshTokenTtlDays?: number;
  authAttemptsPerWindow?: number;
  authAttemptsPerAddress?: number;
  /** Limits on the e-mailed links reached without an account; config.ts holds the defaults. */
  publicLinkLimits?: LinkLimits;
  webDist?: string;
  /** Where photos go; without it they are kept in memory, which only suits tests. */
  storage?: ObjectStorage;
  /** Web Push keys; without them the phone simply is not offered notifications. */
  vapid?: VapidOptions;
  pushSender?: PushSender;
  /** Card deposits; without it quotes still work and deposits are settled outside Hodboard. */
  stripe?: StripeOptions;
  /** Forecasts and postcodes: injected in tests, else HTTP adapters on these URLs. */
  forecastProvider?: ForecastProvider;
  geocoder?: Geocoder;
  weatherApiUrl?: string;
  weatherApiKey?: string;
  geocoderUrl?: string;
}

export interface AppServices {
  auth: AuthService;
  people: PeopleService;
  crews: CrewService;
  clients: ClientService;
  sites: SiteService;
  jobs: JobService;
  firms: FirmService;
  schedule: ScheduleService;
  boards: BoardCache;
  timeOff: TimeOffService;
  access: AccessService;
  forecasts: ForecastService;
  weather: WeatherService;
  events: EventBus;
  siteNotes: SiteNoteService;
  photos: PhotoService;
  crewDays: CrewDayService;
  calendarFeeds: CalendarFeedService;
  push: PushService;
  costing: CostingSettingsService;
  costingReports: CostingReportService;
  materials: MaterialService;
  payments: PaymentService;
  quotes: QuoteService;
}

export function createServices(deps: AppDeps): AppServices {
  const events = deps.events ?? new EventBus();
  const auth = new AuthService(deps.dataSource, deps.mailer, events, deps.clock, {
    jwtSecret: deps.jwtSecret,
    accessTokenTtlSeconds: deps.accessTokenTtlSeconds ?? 900,
    refreshTokenTtlDays: deps.refreshTokenTtlDays ?? 30,
    appUrl: deps.appUrl,
  });
  const photos = new PhotoService(deps.dataSource, deps.storage ?? new MemoryStorage(), events, deps.clock, deps.jwtSecret);
  const access = new AccessService(deps.dataSource, deps.mailer, events, deps.clock, deps.appUrl, photos);
  const forecasts = new ForecastService(
    deps.dataSource,
    deps.forecastProvider ?? new HttpForecastProvider(deps.weatherApiUrl ?? 'http://127.0.0.1:1090', deps.weatherApiKey),
    deps.geocoder ?? new HttpGeocoder(deps.geocoderUrl ?? 'http://127.0.0.1:1090'),
    events,
    deps.clock,
    deps.logger,
  );
  const weather = new WeatherService(deps.dataSource, forecasts, deps.mailer, events, deps.clock);
  const schedule = new ScheduleService(deps.dataSource, events, access, deps.logger, weather);
  weather.attachSchedule(schedule, access);
  const costing = new CostingSettingsService(deps.dataSource, events);
  const payments = new PaymentService(deps.dataSource, deps.clock, events, deps.stripe);
  const siteNotes = new SiteNoteService(deps.dataSource, events);
  return {
    auth,
    siteNotes,
    photos,
    crewDays: new CrewDayService(deps.dataSource, deps.clock, schedule, access, siteNotes, photos),
    calendarFeeds: new CalendarFeedService(deps.dataSource, deps.clock, deps.appUrl),
    push: new PushService(deps.dataSource, events, deps.vapid, deps.pushSender, deps.logger),
    access,
    people: new PeopleService(deps.dataSource, auth, events),
    crews: new CrewService(deps.dataSource, events),
    clients: new ClientService(deps.dataSource, events),
    sites: new SiteService(deps.dataSource, events),
    jobs: new JobService(deps.dataSource, events, access),
    firms: new FirmService(deps.dataSource, events),
    schedule,
    boards: new BoardCache(schedule, events, deps.clock),
    forecasts,
    weather,
    timeOff: new TimeOffService(deps.dataSource, events),
    events,
    costing,
    costingReports: new CostingReportService(deps.dataSource, events, weather),
    materials: new MaterialService(deps.dataSource, events),
    payments,
    quotes: new QuoteService(deps.dataSource, deps.mailer, deps.clock, events, costing, payments, { appUrl: deps.appUrl }),
  };
}

/**
 * Every signed-in resource, by mount path; the tenancy sweep enumerates routes from this list. `keepsBoards`: every
 * change its routes make to what a board shows is published on the event bus (a schedule change, which the cached
 * boards take in place, or a change that drops them), so a write there does not drop the firm's boards by itself.
 */
export function resourceRouters(services: AppServices): Array<{ path: string; router: Router; keepsBoards?: true }> {
  return [
    { path: '/api/people', router: peopleRouter(services.people) },
    { path: '/api/crews', router: crewsRouter(services.crews) },
    { path: '/api/clients', router: clientsRouter(services.clients) },
    { path: '/api/sites', router: sitesRouter(services.sites) },
    { path: '/api/jobs', router: jobsRouter(services.jobs), keepsBoards: true },
    { path: '/api/firm', router: firmRouter(services.firms) },
    { path: '/api/board', router: boardRouter(services.schedule, services.boards) },
    { path: '/api/assignments', router: assignmentsRouter(services.schedule), keepsBoards: true },
    { path: '/api/time-off', router: timeOffRouter(services.timeOff) },
    { path: '/api/suppliers', router: suppliersRouter(services.access) },
    { path: '/api/access-bookings', router: accessBookingsRouter(services.access) },
    { path: '/api/crew-days', router: crewDaysRouter(services.crewDays) },
    { path: '/api/site-notes', router: siteNotesRouter(services.siteNotes), keepsBoards: true },
    { path: '/api/photos', router: photosRouter(services.photos), keepsBoards: true },
    { path: '/api/calendar-feeds', router: calendarFeedsRouter(services.calendarFeeds), keepsBoards: true },
    { path: '/api/push', router: pushRouter(services.push), keepsBoards: true },
    { path: '/api/weather-holds', router: weatherHoldsRouter(services.weather) },
    { path: '/api/weather', router: weatherRouter(services.weather, services.forecasts, services.forecasts.dataSource) },
    { path: '/api/quotes', router: quotesRouter(services.quotes), keepsBoards: true },
    { path: '/api/materials', router: materialsRouter(services.materials), keepsBoards: true },
    { path: '/api/costing', router: costingRouter(services.costing, services.costingReports), keepsBoards: true },
  ];
}

/**
 * Routes reached without a session (sign-in, e-mailed links, calendar apps, webhooks), by mount path.
 * `rawBody` ones are mounted before the JSON parser.
 */
export function publicRouters(services: AppServices, deps: Pick<AppDeps, 'appUrl' | 'authAttemptsPerWindow' | 'authAttemptsPerAddress' | 'publicLinkLimits'>, signedIn: RequestHandler = authenticate(services.auth)): Array<{ path: string; router: Router; rawBody?: boolean; guards?: RequestHandler[] }> {
  const health = Router();
  health.get('/', (_req, res) => {
    res.json({ status: 'ok' });
  });
  const linkLimits = publicLinkLimiters(deps.publicLinkLimits ?? { requests: 120, misses: 20 });
  const routers: Array<{ path: string; router: Router; rawBody?: boolean; guards?: RequestHandler[] }> = [
    // The signature covers the raw bytes.
    { path: '/api/payments/stripe-webhook', router: stripeWebhookRouter(services.payments), rawBody: true },
    { path: '/api/health', router: health },
    { path: '/api/auth', router: authRouter(services.auth, signedIn, {
      secureCookies: deps.appUrl.startsWith('https://'),
      attemptsPerWindow: deps.authAttemptsPerWindow ?? 20,
      attemptsPerAddress: deps.authAttemptsPerAddress ?? 100,
    }) },
    { path: '/api/public/supplier-links', router: supplierLinksRouter(services.access), guards: linkLimits },
    { path: '/api/public/calendar', router: publicCalendarRouter(services.calendarFeeds) },
    { path: '/api/public/photos', router: publicPhotosRouter(services.photos) },
    { path: '/api/public/quotes', router: publicQuotesRouter(services.quotes), guards: linkLimits },
  ];
  // Read from these very routers when first asked: building new ones then would create rate limiters mid-request.
  routers.push({ path: '/api/openapi.json', router: openApiRouter(() => [...routesOf(routers), ...listResourceRoutes(services)]) });
  return routers;
}

export interface RouteInfo {
  method: string;
  path: string;
  /** The zod schemas the route validates with; absent for routes that read no input. */
  spec?: ValidationSpec;
}

function routesOf(mounts: Array<{ path: string; router: Router }>): RouteInfo[] {
  const routes: RouteInfo[] = [];
  for (const { path: mount, router } of mounts) {
    for (const layer of router.stack as Array<{ route?: { path: string; methods: Record<string, boolean>; stack: Array<{ handle: unknown }> } }>) {
      if (!layer.route) continue;
      const spec = validationSpecOf(layer.route.stack.map((handler) => handler.handle));
      for (const method of Object.keys(layer.route.methods)) {
        routes.push({ method: method.toUpperCase(), path: `${mount}${layer.route.path === '/' ? '' : layer.route.path}`, ...(spec ? { spec } : {}) });
      }
    }
  }
  return routes;
}

/** Lists method + full path (and schemas) of every route under the resource routers. */
export function listResourceRoutes(services: AppServices): RouteInfo[] {
  return routesOf(resourceRouters(services));
}

/** The same for the routes reached without a session. */
export function listPublicRoutes(services: AppServices, deps: Pick<AppDeps, 'appUrl' | 'authAttemptsPerWindow' | 'authAttemptsPerAddress' | 'publicLinkLimits'>): RouteInfo[] {
  return routesOf(publicRouters(services, deps));
}

export function createApp(deps: AppDeps, services: AppServices = createServices(deps)): Express {
  const app = express();
  const signedIn = authenticate(services.auth);

  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(helmet({ contentSecurityPolicy: { directives: { 'upgrade-insecure-requests': null } } }));
  // Phones on a weak signal: the app's scripts and the API's JSON shrink to about a quarter. Level 1 keeps nearly all of
  // that on repetitive JSON at a third of the CPU of the default level, which matters on the board's large reads.
  app.use(compression({ level: 1 }));
  app.use(requestLogger(deps.logger, (req) => req.url === '/api/health'));
  app.use(services.boards.invalidateOnWrite);
  const open = publicRouters(services, deps, signedIn);
  for (const { path: mount, router } of open.filter((entry) => entry.rawBody)) app.use(mount, router);
  app.use('/api', express.json({ limit: '100kb' }), cookieParser());
  for (const { path: mount, router, guards } of open.filter((entry) => !entry.rawBody)) app.use(mount, ...(guards ?? []), router);
  for (const { path: mount, router, keepsBoards } of resourceRouters(services)) {
    app.use(mount, signedIn, ...(keepsBoards ? [services.boards.keepsBoardsOnWrite] : []), router);
  }
  app.use('/api', notFoundHandler);

  if (deps.webDist && existsSync(deps.webDist)) {
    const webDist = deps.webDist;
    app.use(express.static(webDist, { index: false, maxAge: '1h' }));
    // Client-side routes: every other GET gets the app shell.
    app.get(/^(?!\/api\/).*/, (_req, res) => {
      res.sendFile(path.join(webDist, 'index.html'));
    });
  }

  app.use(notFoundHandler);
  app.use(problemHandler(deps.logger));
  return app;
}
