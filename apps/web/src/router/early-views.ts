// Imported by the page's first script: nothing here may import the app, only name the views to load.

/** The two screens people open Hodboard onto: the crew's phone and the office board. */
export const crewHomeView = () => import('@/views/CrewHomeView.vue');
export const boardView = () => import('@/views/BoardView.vue');

const byPath: Record<string, () => Promise<unknown>> = { '/crew': crewHomeView, '/board': boardView };

/** Starts downloading the view a path opens while the app's own code is still on its way. */
export function startLoadingViewFor(path: string): void {
  byPath[path.replace(/\/+$/, '') || '/']?.().catch(() => undefined);
}
