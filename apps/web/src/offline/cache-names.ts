/** The service worker's runtime caches (pwa.config.ts), named here too so a session's end can empty them. */
export const CREW_DAYS_CACHE = 'hodboard-crew-days';
export const PHOTOS_CACHE = 'hodboard-photos';
