import { onScopeDispose, ref, type Ref } from 'vue';

/** The width where the app shell switches to its phone layout; the board follows it. */
const phoneQuery = '(max-width: 900px)';

export function useBoardNarrow(): Ref<boolean> {
  const media = typeof window !== 'undefined' && window.matchMedia ? window.matchMedia(phoneQuery) : null;
  const isNarrow = ref(media?.matches ?? false);
  const update = (event: MediaQueryListEvent) => {
    isNarrow.value = event.matches;
  };
  media?.addEventListener('change', update);
  onScopeDispose(() => media?.removeEventListener('change', update));
  return isNarrow;
}
