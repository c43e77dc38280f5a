import { onScopeDispose, watch } from 'vue';
import { useToast } from 'primevue/usetoast';
import type { RealtimeClient } from '@/realtime/socket';
import { useSessionStore } from '@/stores/session-store';
import { afterNextPaint } from '@/utils/after-paint';

const loadAppRealtime = async (): Promise<RealtimeClient> => (await import('@/realtime/socket')).realtime;

/**
 * Tells the office the moment a supplier answers a date change, on whichever page they are: the answer arrives from
 * outside the firm, so nobody in the office is watching for it. The live connection, the access store and the words
 * load only for someone who manages access, so a crew's phone fetches none of them.
 */
export function useSupplierAnswerNotice(loadClient: () => Promise<RealtimeClient> = loadAppRealtime): void {
  const toast = useToast();
  const session = useSessionStore();
  const canHear = () => session.isSignedIn && session.hasPermission('access:manage');
  let stopListening: (() => void) | null = null;
  let isDisposed = false;

  async function showAnswer(bookingId: string): Promise<void> {
    const [{ useAccessStore }, { describeSupplierAnswer }] = await Promise.all([import('@/stores/access-store'), import('./supplier-answer-text')]);
    const access = useAccessStore();
    await access.refreshOne(bookingId);
    const booking = access.bookings[bookingId];
    if (booking && !isDisposed) toast.add({ ...describeSupplierAnswer(booking), life: 12_000 });
  }

  async function listen(): Promise<void> {
    // After the page has painted: the connection's code (socket.io) should not hold back any first screen.
    await afterNextPaint();
    if (isDisposed || stopListening) return;
    const client = await loadClient();
    if (isDisposed || stopListening) return;
    stopListening = client.onResourceChanged((message) => {
      if (message.type !== 'access:answered' || !canHear()) return;
      void showAnswer(message.id).catch(() => undefined);
    });
    client.start();
  }

  const stopWatch = watch(canHear, (can) => {
    if (can && !stopListening) void listen().catch(() => undefined);
  }, { immediate: true });
  onScopeDispose(() => {
    isDisposed = true;
    stopWatch();
    stopListening?.();
  });
}
