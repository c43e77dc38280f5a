// The page's first script. It stays tiny so it runs as soon as the page arrives: it sends the session renewal
// and asks for the opened screen's code, then lets the shell that index.html draws paint before the app starts.
// On a slow phone the app's code takes a second or more to evaluate; without the wait the screen stays blank
// for all of it. The app's code is already downloading meanwhile (index.html preloads it).
import { startLoadingViewFor } from '@/router/early-views';
import { startEarlyRefresh } from './early-refresh';

startEarlyRefresh();
startLoadingViewFor(location.pathname);
requestAnimationFrame(() => setTimeout(() => void import('../main')));
