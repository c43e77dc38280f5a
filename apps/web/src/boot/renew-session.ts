// Imported first by main.ts, so the session's round trip to the server starts before the rest of the app has
// even been evaluated, let alone mounted: on a slow phone that overlap is most of the wait for the first screen.
import { startSessionRenewal } from '@/api/auth';

startSessionRenewal();
