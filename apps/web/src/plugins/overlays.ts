import { nextTick, shallowRef, type App, type Component } from 'vue';
import { loadWithRetry } from '@/utils/lazy-code';

/**
 * PrimeVue's Toast and ConfirmDialog, loaded the first time something asks for a toast or a confirmation rather
 * than with every first screen: their code (a dialog, a focus trap, icons) is a good part of what a phone would
 * otherwise download and run before the crew's days show. AppOverlays renders what is here.
 */
export const overlayComponents = shallowRef<{ Toast: Component; ConfirmDialog: Component } | null>(null);

let loading: Promise<void> | null = null;

export function loadOverlays(): Promise<void> {
  loading ??= loadWithRetry(() => Promise.all([import('primevue/toast'), import('primevue/confirmdialog')])).then(async ([toast, confirm]) => {
    overlayComponents.value = { Toast: toast.default, ConfirmDialog: confirm.default };
    // Mounted in this flush; both listen for their messages from their mounted hooks.
    await nextTick();
  });
  return loading;
}

/**
 * After PrimeVue's ToastService and ConfirmationService: each call waits for the overlays to be on the page, then
 * goes through as before. The services hand `useToast()` and `useConfirm()` the same objects as `$toast` and
 * `$confirm`, so wrapping those covers both ways in. Calls keep their order, as each waits on the same load.
 */
export function installLazyOverlays(app: App): void {
  const { $toast: toast, $confirm: confirm } = app.config.globalProperties;
  const later = <A extends unknown[]>(send: (...args: A) => void) => (...args: A): void => {
    void loadOverlays().then(() => send(...args));
  };
  toast.add = later(toast.add.bind(toast));
  toast.remove = later(toast.remove.bind(toast));
  toast.removeGroup = later(toast.removeGroup.bind(toast));
  toast.removeAllGroups = later(toast.removeAllGroups.bind(toast));
  confirm.require = later(confirm.require.bind(confirm));
  confirm.close = later(confirm.close.bind(confirm));
}
