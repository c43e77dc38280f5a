import type { HoldReason } from '@hodboard/shared';
import { isApiError } from '@/api/http';
import { messageForError } from '@/api/problem-messages';
import { compareCodes } from '@/utils/compare';

export type OutboxItem =
  | (OutboxBase & { kind: 'note'; body: string })
  | (OutboxBase & { kind: 'photo'; file: Blob; fileName: string; caption: string | null })
  | (OutboxBase & { kind: 'stand-down'; dates: string[]; reason: HoldReason; notes: string | null });

export interface OutboxBase {
  /** Also the idempotency key the server stores, so a resend after a lost answer is recognised. */
  id: string;
  /** Who made it. It is sent only while they are signed in on this phone, never under someone else's session. */
  userId: string;
  jobId: string;
  /** What the crew sees in the "waiting to send" list. */
  label: string;
  createdAt: string;
  state: 'waiting' | 'sending' | 'failed';
  error: string | null;
}

/** Where queued items survive a closed tab or a flat battery: IndexedDB in the app, memory in tests. */
export interface OutboxStore {
  all(): Promise<OutboxItem[]>;
  put(item: OutboxItem): Promise<void>;
  delete(id: string): Promise<void>;
}

export type OutboxSender = (item: OutboxItem, onProgress: (fraction: number) => void) => Promise<void>;

export interface OutboxSnapshot {
  items: OutboxItem[];
  progress: Record<string, number>;
}

export function newIdempotencyKey(): string {
  return `hb-${crypto.randomUUID()}`;
}

/** No answer at all (offline, dropped connection): keep the item and try again later. */
function isNoAnswer(error: unknown): boolean {
  return isApiError(error) && error.status === 0;
}

/**
 * Sends queued work in the order it was made, one item at a time. An item leaves the queue only after the
 * server has answered yes; with the idempotency key, a resend after a lost answer cannot store it twice.
 * A phone can be shared: each person sees and sends only what they queued themselves, and another person's
 * items wait on the phone until that person signs in again.
 */
export class Outbox {
  private flushing: Promise<void> | null = null;
  private isAgain = false;
  private items: OutboxItem[] = [];
  private progress: Record<string, number> = {};
  private readonly listeners = new Set<(snapshot: OutboxSnapshot) => void>();
  private loaded: Promise<void> | null = null;

  constructor(
    private readonly store: OutboxStore,
    private readonly send: OutboxSender,
    private readonly signedInUserId: () => string | null,
    private readonly isOnline: () => boolean = () => navigator.onLine,
  ) {}

  /** Call when someone signs in or out: the list shows, and the queue sends, the new person's items. */
  userChanged(): void {
    this.emit();
    void this.flush();
  }

  private isMine(item: OutboxItem): boolean {
    const userId = this.signedInUserId();
    return userId !== null && item.userId === userId;
  }

  subscribe(listener: (snapshot: OutboxSnapshot) => void): () => void {
    this.listeners.add(listener);
    listener(this.snapshot());
    return () => this.listeners.delete(listener);
  }

  load(): Promise<void> {
    this.loaded ??= this.store.all().then((items) => {
      // A tab closed mid-send left "sending": it was never confirmed, so it waits again.
      this.items = items.map((item): OutboxItem => (item.state === 'sending' ? { ...item, state: 'waiting' as const } : item)).sort((a, b) => compareCodes(a.createdAt, b.createdAt));
      this.emit();
    });
    return this.loaded;
  }

  async add(item: OutboxItem): Promise<void> {
    await this.load();
    await this.store.put(item);
    this.items = [...this.items, item];
    this.emit();
    void this.flush();
  }

  async discard(id: string): Promise<void> {
    await this.store.delete(id);
    this.items = this.items.filter((item) => item.id !== id);
    this.emit();
  }

  async retry(id: string): Promise<void> {
    await this.update(id, { state: 'waiting', error: null });
    await this.flush();
  }

  /** Concurrent calls share one pass, so two triggers (online event, a new item) never send one item twice. */
  flush(): Promise<void> {
    if (this.flushing) {
      // A pass may be on its way out having just seen "offline": one more pass follows it.
      this.isAgain = true;
      return this.flushing;
    }
    this.flushing = (async () => {
      do {
        this.isAgain = false;
        await this.run();
      } while (this.isAgain);
    })().finally(() => {
      this.flushing = null;
    });
    return this.flushing;
  }

  private async run(): Promise<void> {
    await this.load();
    for (;;) {
      if (!this.isOnline()) return;
      const next = this.items.find((item) => item.state === 'waiting' && this.isMine(item));
      if (!next) return;
      await this.update(next.id, { state: 'sending', error: null });
      try {
        await this.send(next, (fraction) => {
          this.progress = { ...this.progress, [next.id]: fraction };
          this.emit();
        });
        await this.store.delete(next.id);
        this.items = this.items.filter((item) => item.id !== next.id);
        const { [next.id]: _done, ...rest } = this.progress;
        this.progress = rest;
        this.emit();
      } catch (error) {
        if (isNoAnswer(error)) {
          await this.update(next.id, { state: 'waiting', error: null });
          return;
        }
        await this.update(next.id, { state: 'failed', error: problemText(error) });
      }
    }
  }

  private async update(id: string, patch: Partial<OutboxBase>): Promise<void> {
    const current = this.items.find((item) => item.id === id);
    if (!current) return;
    const updated = { ...current, ...patch } as OutboxItem;
    this.items = this.items.map((item) => (item.id === id ? updated : item));
    await this.store.put(updated);
    this.emit();
  }

  private snapshot(): OutboxSnapshot {
    return { items: this.items.filter((item) => this.isMine(item)), progress: this.progress };
  }

  private emit(): void {
    const snapshot = this.snapshot();
    for (const listener of this.listeners) listener(snapshot);
  }
}

function problemText(error: unknown): string {
  if (isApiError(error)) {
    const field = error.problem.errors?.[0]?.message;
    return field ?? error.problem.detail ?? messageForError(error).detail;
  }
  return messageForError(error).detail;
}

export class MemoryOutboxStore implements OutboxStore {
  readonly rows = new Map<string, OutboxItem>();

  async all(): Promise<OutboxItem[]> {
    return [...this.rows.values()];
  }

  async put(item: OutboxItem): Promise<void> {
    this.rows.set(item.id, item);
  }

  async delete(id: string): Promise<void> {
    this.rows.delete(id);
  }
}
