import { openDB, type DBSchema, type IDBPDatabase } from 'idb';
import type { CrewDaysDto } from '@hodboard/shared';
import { CREW_DAYS_CACHE, PHOTOS_CACHE } from './cache-names';
import type { OutboxItem, OutboxStore } from './outbox';

interface CrewDb extends DBSchema {
  outbox: { key: string; value: OutboxItem };
  snapshots: { key: string; value: { userId: string; savedAt: string; days: CrewDaysDto } };
}

let db: Promise<IDBPDatabase<CrewDb>> | null = null;

function open(): Promise<IDBPDatabase<CrewDb>> {
  db ??= openDB<CrewDb>('hodboard-crew', 1, {
    upgrade(database) {
      database.createObjectStore('outbox', { keyPath: 'id' });
      database.createObjectStore('snapshots', { keyPath: 'userId' });
    },
  });
  return db;
}

export const idbOutboxStore: OutboxStore = {
  async all() {
    return (await open()).getAll('outbox');
  },
  async put(item) {
    await (await open()).put('outbox', item);
  },
  async delete(id) {
    await (await open()).delete('outbox', id);
  },
};

/** The last crew days seen, so the phone still shows them with no signal. */
export async function saveSnapshot(userId: string, days: CrewDaysDto): Promise<void> {
  await (await open()).put('snapshots', { userId, savedAt: new Date().toISOString(), days });
}

export async function loadSnapshot(userId: string): Promise<{ savedAt: string; days: CrewDaysDto } | null> {
  return (await (await open()).get('snapshots', userId)) ?? null;
}

export async function clearSnapshots(): Promise<void> {
  await (await open()).clear('snapshots');
}

/** Everything this device kept of the crew's work for offline use: gone when the session that saw it ends. */
export async function clearCrewCopies(): Promise<void> {
  await clearSnapshots().catch(() => undefined);
  if (typeof caches !== 'undefined') {
    await Promise.all([caches.delete(CREW_DAYS_CACHE), caches.delete(PHOTOS_CACHE)]).catch(() => undefined);
  }
}
