import { onMounted, onScopeDispose, ref, watch, type Ref } from 'vue';
import type { ScheduleChangedMessage } from '@hodboard/shared';
import { realtime, type RealtimeStatus } from '@/realtime/socket';
import { useScheduleStore } from '@/stores/schedule-store';
import { useSessionStore } from '@/stores/session-store';

export interface BoardLive {
  status: Ref<RealtimeStatus>;
  /** The last change someone else made, in words, for the polite live region. */
  lastRemoteChange: Ref<string>;
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
  let reloadTimer: ReturnType<typeof setTimeout> | undefined;
  // Leave, crews and job details come only as live notices, never replayed: a board that lost its connection reads
  // itself again once back, after replaying the schedule changes.
  let wasAway = false;

  const stops = [
    realtime.onScheduleChanged((message) => {
      const applied = store.applyEvent(message.change, message.eventId);
      if (applied && message.change.actorName !== session.user?.name) lastRemoteChange.value = describe(message);
    }),
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
  ];

  watch(realtime.status, (status, before) => {
    if (before === 'live' && status !== 'live') wasAway = true;
  });

  watch(
    () => session.isSignedIn,
    (isSignedIn) => {
      if (!isSignedIn) realtime.stop();
    },
  );

  onMounted(() => realtime.start());
  onScopeDispose(() => {
    clearTimeout(reloadTimer);
    for (const stop of stops) stop();
  });

  return { status: realtime.status, lastRemoteChange };
}
