import type { VitePWAOptions } from 'vite-plugin-pwa';
import { CREW_DAYS_CACHE, PHOTOS_CACHE } from './src/offline/cache-names.ts';

/**
 * The installable app for crews: the shell and its code are precached, the crew's days answer from the
 * network first and from the cache with no signal, and photos, whose signed links change daily, are
 * matched without their query so a cached thumbnail still shows offline.
 */
export const crewPwa: Partial<VitePWAOptions> = {
  registerType: 'autoUpdate',
  // Registered from the crew's pages (src/offline/pwa.ts), not injected into every page.
  injectRegister: false,
  includeAssets: ['favicon.svg', 'icons/apple-touch-icon.png', 'push-sw.js'],
  manifest: {
    name: 'Hodboard',
    short_name: 'Hodboard',
    description: "Your crew's days: today's and tomorrow's jobs, site notes and photos, even without a signal.",
    lang: 'en-GB',
    start_url: '/',
    scope: '/',
    display: 'standalone',
    orientation: 'portrait',
    background_color: '#f8f5f3',
    theme_color: '#8b3524',
    icons: [
      { src: '/icons/hodboard-192.png', sizes: '192x192', type: 'image/png' },
      { src: '/icons/hodboard-512.png', sizes: '512x512', type: 'image/png' },
      { src: '/icons/hodboard-maskable-192.png', sizes: '192x192', type: 'image/png', purpose: 'maskable' },
      { src: '/icons/hodboard-maskable-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
    ],
  },
  workbox: {
    globPatterns: ['**/*.{js,css,html,svg,png,woff2}'],
    maximumFileSizeToCacheInBytes: 3 * 1024 * 1024,
    navigateFallback: '/index.html',
    navigateFallbackDenylist: [/^\/api\//, /^\/socket\.io\//],
    importScripts: ['/push-sw.js'],
    cleanupOutdatedCaches: true,
    runtimeCaching: [
      {
        urlPattern: ({ url }) => url.pathname === '/api/crew-days',
        handler: 'NetworkFirst',
        options: { cacheName: CREW_DAYS_CACHE, networkTimeoutSeconds: 6, expiration: { maxEntries: 4 }, cacheableResponse: { statuses: [200] } },
      },
      {
        urlPattern: ({ url }) => url.pathname.startsWith('/api/public/photos/'),
        handler: 'CacheFirst',
        options: {
          cacheName: PHOTOS_CACHE,
          matchOptions: { ignoreSearch: true },
          expiration: { maxEntries: 300, maxAgeSeconds: 30 * 24 * 3600 },
          cacheableResponse: { statuses: [200] },
        },
      },
    ],
  },
};
