import { onMounted, onScopeDispose, ref, watch, type Ref } from 'vue';
import type { ScheduleChangedMessage } from '@hodboard/shared';
import type { RealtimeClient, RealtimeStatus } from '@/realtime/socket';
import { useScheduleStore } from '@/stores/schedule-store';
import { useSessionStore } from '@/stores/session-store';
import { afterNextPaint } from '@/utils/after-paint';

export interface BoardLive {
  status: Ref<RealtimeStatus>;
  /** The last change someone else made, in words, for the polite live region. */
  lastRemoteChange: Ref<string>;
  /**
   * Runs once the live connection's code has loaded (after the board first paints); what it returns is undone when
   * the board goes. For a view's own listeners on the connection.
   */
  whenConnecting(use: (realtime: RealtimeClient) => Array<() => void> | void): void;
}

function describe(message: ScheduleChangedMessage): string {
  const { change } = message;
  const ref = change.job.reference;
  if (message.type === 'assignment:created') return `${change.actorName} put ${ref} on the board.`;
  if (message.type === 'assignment:removed') return `${change.actorName} put ${ref} back in the tray.`;
  return `${change.actorName} moved ${ref}.`;
}

/** Records that change what the board draws (a job's status, leave, a crew, a stood-down day) without being schedule changes. */
const reloadingTypes = /^(job|time-off|crew|firm|access|hold)[:.]/;

export function useBoardLive(): BoardLive {
  const store = useScheduleStore();
  const session = useSessionStore();
  const lastRemoteChange = ref('');
  const status = ref<RealtimeStatus>('offline');
  let reloadTimer: ReturnType<typeof setTimeout> | undefined;
  // Leave, crews and job details come only as live notices, never replayed: a board that lost its connection reads
  // itself again once back, after replaying the schedule changes.
  let wasAway = false;
  let isGone = false;
  const stops: Array<() => void> = [];
  const waiting: Array<(realtime: RealtimeClient) => Array<() => void> | void> = [];
  let loaded: RealtimeClient | null = null;

  function listen(realtime: RealtimeClient): void {
    stops.push(
      realtime.onScheduleChanged((message) => {
        const applied = store.applyEvent(message.change, message.eventId);
        if (applied && message.change.actorName !== session.user?.name) lastRemoteChange.value = describe(message);
      }),
      // The first connection replays what changed since the board was read, so nothing is missed while the
      // connection's code was still loading.
      realtime.onConnected(() => {
        const missedNotices = wasAway;
        wasAway = false;
        if (!store.range || store.isLoading) return;
        store
          .catchUp()
          .then(() => (missedNotices ? store.reload() : undefined))
          .catch(() => store.reload());
      }),
      realtime.onResourceChanged((message) => {
        if (!reloadingTypes.test(message.type)) return;
        clearTimeout(reloadTimer);
        // Bulk edits arrive as bursts; one reload after the burst is enough.
        reloadTimer = setTimeout(() => void store.reload(), 400);
      }),
      watch(realtime.status, (next, before) => {
        status.value = next;
        if (before === 'live' && next !== 'live') wasAway = true;
      }, { immediate: true }),
      watch(
        () => session.isSignedIn,
        (isSignedIn) => {
          if (!isSignedIn) realtime.stop();
        },
      ),
    );
    for (const use of waiting.splice(0)) stops.push(...(use(realtime) ?? []));
    realtime.start();
  }

  // After the board has painted: the connection's code (socket.io) need not hold back the first screen.
  onMounted(() => {
    void afterNextPaint()
      .then(() => import('@/realtime/socket'))
      .then(({ realtime }) => {
        if (isGone) return;
        loaded = realtime;
        listen(realtime);
      });
  });
  onScopeDispose(() => {
    isGone = true;
    clearTimeout(reloadTimer);
    for (const stop of stops.splice(0)) stop();
  });

  return {
    status,
    lastRemoteChange,
    whenConnecting(use) {
      if (loaded) stops.push(...(use(loaded) ?? []));
      else waiting.push(use);
    },
  };
}
