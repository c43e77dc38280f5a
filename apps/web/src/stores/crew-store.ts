import { defineStore } from 'pinia';
import { computed, ref, shallowRef, watch } from 'vue';
import { format, parseISO } from 'date-fns';
import { addDays } from '@hodboard/shared';
import type { CrewDayDto, CrewDaysDto, HoldReason, PhotoDto, ScheduleChangedMessage, SiteNoteDto } from '@hodboard/shared';
import { getCrewDays, raiseStandDown, takePrefetchedCrewDays } from '@/api/crew-days';
import { isApiError } from '@/api/http';
import { messageForError } from '@/api/problem-messages';
import { uploadPhoto } from '@/api/photos';
import { addSiteNote } from '@/api/site-notes';
import { idbOutboxStore, loadSnapshot, saveSnapshot } from '@/offline/idb';
import { newIdempotencyKey, Outbox, type OutboxItem, type OutboxSnapshot, type OutboxStore } from '@/offline/outbox';
import { useSessionStore } from './session-store';

export interface NextDayChange {
  reference: string;
  title: string;
  summary: string;
  by: string;
}

function sendItem(item: OutboxItem, onProgress: (fraction: number) => void): Promise<unknown> {
  switch (item.kind) {
    case 'note':
      return addSiteNote({ jobId: item.jobId, body: item.body, idempotencyKey: item.id });
    case 'photo':
      return uploadPhoto({ jobId: item.jobId, file: item.file, fileName: item.fileName, caption: item.caption, idempotencyKey: item.id }, onProgress);
    case 'stand-down':
      return raiseStandDown({ jobId: item.jobId, dates: item.dates, reason: item.reason, notes: item.notes, idempotencyKey: item.id });
  }
}

// date-fns rather than an Intl formatter made when this module loads, which would load the locale data on the way
// to the crew home's first screen.
function short(date: string): string {
  return format(parseISO(date), 'EEE d MMM');
}

export const useCrewStore = defineStore('crew', () => {
  const session = useSessionStore();
  const data = shallowRef<CrewDaysDto | null>(null);
  const savedAt = ref<string | null>(null);
  const isLoading = ref(false);
  const loadError = ref<string | null>(null);
  const isOnline = ref(typeof navigator === 'undefined' ? true : navigator.onLine);
  const outboxState = shallowRef<OutboxSnapshot>({ items: [], progress: {} });
  const nextDayChange = shallowRef<NextDayChange | null>(null);
  let outbox: Outbox | null = null;
  let loading: Promise<void> | null = null;

  const today = computed(() => data.value?.days.filter((day) => day.date === data.value?.today) ?? []);
  const nextDay = computed(() => data.value?.days.filter((day) => day.date === data.value?.nextDay) ?? []);
  const isNextDayTomorrow = computed(() => !data.value || addDays(data.value.today, 1) === data.value.nextDay);
  /** What the crew calls the next working day: "Tomorrow", or its weekday after a Friday or a holiday. */
  const nextDayName = computed(() => (isNextDayTomorrow.value ? 'Tomorrow' : format(parseISO(data.value!.nextDay), 'EEEE')));
  const nextDayInSentence = computed(() => (isNextDayTomorrow.value ? 'tomorrow' : nextDayName.value));
  const waiting = computed(() => outboxState.value.items);

  function notesFor(jobId: string): SiteNoteDto[] {
    return data.value?.notes[jobId] ?? [];
  }

  function photosFor(jobId: string): PhotoDto[] {
    return data.value?.photos[jobId] ?? [];
  }

  function waitingFor(jobId: string): OutboxItem[] {
    return outboxState.value.items.filter((item) => item.jobId === jobId);
  }

  /** Opens the queue once per page; `store` lets unit tests use memory instead of IndexedDB. */
  function startOutbox(store: OutboxStore = idbOutboxStore): Outbox {
    if (outbox) return outbox;
    outbox = new Outbox(store, async (item, onProgress) => {
      await sendItem(item, onProgress);
    }, () => session.user?.id ?? null);
    watch(() => session.user?.id, () => outbox?.userChanged());
    outbox.subscribe((snapshot) => {
      const before = outboxState.value.items.length;
      outboxState.value = snapshot;
      // Something just went through: fetch the server's view so it shows who and when.
      if (snapshot.items.length < before && isOnline.value) void reload();
    });
    void outbox.load().then(() => outbox?.flush());
    if (typeof window !== 'undefined') {
      window.addEventListener('online', () => {
        isOnline.value = true;
        void outbox?.flush();
        void load();
      });
      window.addEventListener('offline', () => {
        isOnline.value = false;
      });
    }
    return outbox;
  }

  async function restoreSnapshot(): Promise<void> {
    const userId = session.user?.id;
    if (!userId || data.value) return;
    const snapshot = await loadSnapshot(userId).catch(() => null);
    if (snapshot && !data.value) {
      data.value = snapshot.days;
      savedAt.value = snapshot.savedAt;
    }
  }

  function load(): Promise<void> {
    loading ??= (async () => {
      isLoading.value = true;
      loadError.value = null;
      // Asked for at once; what this phone saved shows while the answer is on its way.
      const answer = takePrefetchedCrewDays() ?? getCrewDays();
      answer.catch(() => undefined);
      // The saved copy is read alongside, not first: an answer already here (the page's first script asked for it)
      // shows at once, and a saved copy arriving after it is not shown.
      const saved = restoreSnapshot();
      try {
        const fresh = await answer;
        data.value = fresh;
        savedAt.value = fresh.generatedAt;
        if (session.user) await saveSnapshot(session.user.id, fresh).catch(() => undefined);
      } catch (error) {
        await saved;
        if (isApiError(error) && error.status === 0) {
          isOnline.value = false;
          if (!data.value) loadError.value = 'No signal, and nothing saved on this phone yet. Open Hodboard once with a signal to keep your days here.';
        } else {
          loadError.value = messageForError(error).detail;
        }
      } finally {
        isLoading.value = false;
        loading = null;
      }
    })();
    return loading;
  }

  /** A read asked for while one is in flight waits for it and then reads again, since that one may predate the change. */
  function reload(): Promise<void> {
    return loading ? loading.then(() => load()) : load();
  }

  function label(jobId: string): string {
    const day = data.value?.days.find((d) => d.job.id === jobId);
    return day ? day.job.reference : 'job';
  }

  function author(): string {
    const userId = session.user?.id;
    if (!userId) throw new Error('sign in before adding to the queue');
    return userId;
  }

  async function addNote(jobId: string, body: string): Promise<void> {
    await startOutbox().add({
      id: newIdempotencyKey(), userId: author(), kind: 'note', jobId, body, label: `Note on ${label(jobId)}: ${body.slice(0, 40)}`,
      createdAt: new Date().toISOString(), state: 'waiting', error: null,
    });
  }

  async function addPhotos(jobId: string, files: File[]): Promise<void> {
    const box = startOutbox();
    for (const file of files) {
      await box.add({
        id: newIdempotencyKey(), userId: author(), kind: 'photo', jobId, file, fileName: file.name || 'photo.jpg', caption: null,
        label: `Photo ${file.name || ''} for ${label(jobId)}`.replace(/\s+/g, ' '), createdAt: new Date().toISOString(), state: 'waiting', error: null,
      });
    }
  }

  async function standDown(day: CrewDayDto, reason: HoldReason, notes: string | null): Promise<void> {
    await startOutbox().add({
      id: newIdempotencyKey(), userId: author(), kind: 'stand-down', jobId: day.job.id, dates: [day.date], reason, notes,
      label: `Stand-down of ${day.job.reference} on ${short(day.date)}`, createdAt: new Date().toISOString(), state: 'waiting', error: null,
    });
  }

  function retry(id: string): Promise<void> {
    return startOutbox().retry(id);
  }

  function discard(id: string): Promise<void> {
    return startOutbox().discard(id);
  }

  /** A schedule push for one of my crews: say so when it touches the next working day, then fetch the new days. */
  function applyEvent(message: ScheduleChangedMessage): void {
    const { change } = message;
    if (!change.crewIds.some((id) => session.crewIds.includes(id)) || !data.value) return;
    const wasNextDay = nextDay.value.some((day) => day.job.id === change.job.id || day.assignmentId === change.removedAssignmentId);
    const isNextDay = Boolean(change.assignment?.days.includes(data.value.nextDay));
    if (wasNextDay || isNextDay) {
      const name = nextDayInSentence.value;
      const days = change.assignment?.days ?? [];
      const run = days.length === 0 ? 'unplaced' : days.length === 1 ? `on ${short(days[0]!)} only` : `${short(days[0]!)} to ${short(days[days.length - 1]!)}`;
      const summary = !change.assignment
        ? 'It is off the board for now; the office will tell you what comes instead.'
        : !isNextDay
          ? `It no longer runs ${name}: now ${run}.`
          : wasNextDay
            ? `Its days changed: now ${run}.`
            : `It is new for ${name}: ${run}.`;
      nextDayChange.value = { reference: change.job.reference, title: change.job.title, summary, by: change.actorName };
    }
    void load();
  }

  function dismissChange(): void {
    nextDayChange.value = null;
  }

  return {
    data,
    savedAt,
    isLoading,
    loadError,
    isOnline,
    today,
    nextDay,
    isNextDayTomorrow,
    nextDayName,
    nextDayInSentence,
    waiting,
    outboxState,
    nextDayChange,
    notesFor,
    photosFor,
    waitingFor,
    startOutbox,
    load,
    addNote,
    addPhotos,
    standDown,
    retry,
    discard,
    applyEvent,
    dismissChange,
  };
});
