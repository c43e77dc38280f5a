import { START_LOCATION, createRouter, createWebHistory, type RouteLocationNormalized, type Router } from 'vue-router';
import { useSessionStore } from '@/stores/session-store';
import { routes } from './routes';
import { runGuards } from './guards';

export function createAppRouter(): Router {
  const router = createRouter({
    history: createWebHistory(import.meta.env.BASE_URL),
    routes,
    // Nothing to scroll on a fresh start, and asking would force a layout before the first screen is ready.
    scrollBehavior: (_to, from, saved) => saved ?? (from === START_LOCATION ? false : { top: 0 }),
  });

  router.beforeEach(async (to) => {
    const session = useSessionStore();
    // The router fetches a view's code only after the guards; on the first visit they wait on the server,
    // so start the download now and let both waits overlap.
    if (!session.isRestored) preloadViews(to);
    // A profile saved on this phone opens the app at once; a page for signed-out visitors waits for the server, so a
    // stale profile cannot redirect an e-mailed link away before the server has said it is stale.
    await (to.meta.isGuestOnly ? session.restoreConfirmed() : session.restore());
    return runGuards(to, session) ?? true;
  });

  router.afterEach((to) => {
    document.title = `${to.meta.title} · Hodboard`;
  });

  return router;
}

/** Starts loading the lazy views of a location; the router's own import of them then finds them loaded. */
function preloadViews(to: RouteLocationNormalized): void {
  for (const record of to.matched) {
    for (const view of Object.values(record.components ?? {})) {
      // A lazy view is a bare loader function; a component (even a functional one) is an object or has props.
      if (typeof view === 'function' && !('props' in view) && !('displayName' in view)) {
        void (view as () => Promise<unknown>)().catch(() => undefined);
      }
    }
  }
}
