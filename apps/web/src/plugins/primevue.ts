import type { App } from 'vue';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import ConfirmationService from 'primevue/confirmationservice';
import { installLazyOverlays } from './overlays';

export { darkModeClass } from './dark-mode';

export function installPrimeVue(app: App): void {
  app.use(PrimeVue, {
    ripple: false,
    // The theme arrives as a stylesheet made at build time, so PrimeVue has none to build in the browser: left to
    // it, it turns every token of the preset into CSS and injects a style element per component as each first
    // shows, which on a slow phone is a good part of the first screen's wait.
    theme: 'none',
    locale: {
      firstDayOfWeek: 1,
      dateFormat: 'dd/mm/yy',
    },
  });
  app.use(ToastService);
  app.use(ConfirmationService);
  installLazyOverlays(app);
}
