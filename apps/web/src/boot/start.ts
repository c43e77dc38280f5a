// The page's first script. It stays tiny so it runs as soon as the page arrives: it sends the session renewal (and,
// on the crew's home, the first read once the renewal answers) and asks for the opened screen's code, then lets the
// shell that index.html draws paint before the app starts.
// On a slow phone the app's code takes a second or more to evaluate; without the wait the screen stays blank
// for all of it. The app's code is already downloading meanwhile (index.html preloads it).
import { startLoadingViewFor } from '@/router/early-views';
import { startEarlyRead, startEarlyRefresh } from './early-refresh';

/** The read the crew's home starts with, sent once the renewal answers rather than once the app has started. */
const firstReadFor: Record<string, string> = { '/crew': '/crew-days' };

startEarlyRefresh();
const firstRead = firstReadFor[location.pathname.replace(/\/+$/, '')];
if (firstRead) startEarlyRead(firstRead);
startLoadingViewFor(location.pathname);

/** Lets the browser run whatever else is waiting (a tap, a paint) before going on. */
const nextTask = () => new Promise((resolve) => setTimeout(resolve));

// The app's code runs in three turns instead of one long task, the framework and the component library each in their
// own: on a slow phone that one task took well over 100 ms, in which the page could not answer a tap. Each import
// only runs code the page has already downloaded (index.html preloads it); main's own import of them finds them run.
requestAnimationFrame(() => setTimeout(async () => {
  await import('./framework');
  await nextTask();
  await import('./component-library');
  await nextTask();
  await import('../main');
}));
