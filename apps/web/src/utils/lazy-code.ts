import { defineAsyncComponent, markRaw, nextTick, shallowRef, type Component, type ShallowRef } from 'vue';

export interface RetryOptions {
  /** Failures with the phone online before the load gives up. */
  onlineAttempts?: number;
  /** The first pause after a failure with the phone online; each next one is longer, up to 15 s. */
  pauseMs?: number;
  /** With no signal, how often to try anyway: a service worker that has just finished installing can answer. */
  offlinePauseMs?: number;
}

/** Resolves when the signal is back or after the pause, whichever is first. */
function signalBackOr(pauseMs: number): Promise<void> {
  return new Promise((resolve) => {
    const done = new AbortController();
    const finish = () => {
      done.abort();
      clearTimeout(timer);
      resolve();
    };
    const timer = setTimeout(finish, pauseMs);
    window.addEventListener('online', finish, { signal: done.signal });
  });
}

/**
 * Runs a code import until it succeeds. With no signal it keeps trying, however long that lasts: at once when the
 * signal is back, and now and then before, as a service worker may hold the code. With a signal it tries again after
 * a pause, a few times. A screen's code that loads on first use would otherwise fail for good on a phone that lost
 * its signal while the code was on its way.
 */
export async function loadWithRetry<T>(loader: () => Promise<T>, { onlineAttempts = 6, pauseMs = 2000, offlinePauseMs = 5000 }: RetryOptions = {}): Promise<T> {
  let failedOnline = 0;
  for (;;) {
    try {
      return await loader();
    } catch (error) {
      if (!navigator.onLine) {
        await signalBackOr(offlinePauseMs);
        continue;
      }
      failedOnline += 1;
      if (failedOnline >= onlineAttempts) throw error;
      await new Promise((resolve) => setTimeout(resolve, Math.min(pauseMs * failedOnline, 15_000)));
    }
  }
}

export interface LazyComponent<T extends Component> {
  /** Renders once its code is here; until then, nothing. */
  component: T;
  /** Whether its code has arrived, so a screen can say that what was tapped is still on its way. */
  loaded: Readonly<ShallowRef<boolean>>;
}

/** A component whose code loads when it first renders (as with Vue's defineAsyncComponent), tried again as loadWithRetry does. */
export function lazyComponent<T extends Component>(loader: () => Promise<{ default: T }>, options?: RetryOptions): LazyComponent<T> {
  const loaded = shallowRef(false);
  const component = defineAsyncComponent(() =>
    loadWithRetry(loader, options).then((module) => {
      loaded.value = true;
      return module.default;
    }),
  );
  return { component, loaded };
}

export interface ComponentOnCall<T extends Component> {
  /** Null until `load` has brought its code. */
  component: Readonly<ShallowRef<T | null>>;
  /** Brings its code once, tried again as loadWithRetry does, and waits for the render that mounts it. */
  load(): Promise<void>;
}

/**
 * A component whose code loads when code asks for it, not when it renders: for a menu or a popover that a tap opens
 * through its instance (`show(event, target)`), so it must be mounted before the call.
 */
export function componentOnCall<T extends Component>(loader: () => Promise<{ default: T }>, options?: RetryOptions): ComponentOnCall<T> {
  // Typed by hand: shallowRef's overloads widen a component type parameter into every shape a component can have.
  const component: ShallowRef<T | null> = shallowRef(null);
  let loading: Promise<void> | null = null;
  return {
    component,
    load() {
      loading ??= loadWithRetry(loader, options).then(
        async (module) => {
          component.value = markRaw(module.default);
          await nextTick();
        },
        (error: unknown) => {
          loading = null;
          throw error;
        },
      );
      return loading;
    },
  };
}
