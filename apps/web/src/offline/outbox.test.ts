import { describe, expect, it } from 'vitest';
import { ApiError } from '@/api/http';
import { MemoryOutboxStore, Outbox, type OutboxItem } from './outbox';

const note = (id: string, createdAt: string, userId = 'lead-1'): OutboxItem => ({
  id, userId, kind: 'note', jobId: 'job-1', label: `Note ${id}`, body: `body ${id}`, createdAt, state: 'waiting', error: null,
});

const offlineError = () => new ApiError({ type: 'about:blank', title: 'Network error', status: 0, code: 'service-unavailable' });

describe('Outbox', () => {
  it('sends each queued item exactly once, in the order made, even when flushes overlap', async () => {
    const store = new MemoryOutboxStore();
    let online = false;
    const sent: string[] = [];
    const outbox = new Outbox(store, async (item) => {
      await new Promise((resolve) => setTimeout(resolve, 5));
      sent.push(item.id);
    }, () => 'lead-1', () => online);
    await outbox.add(note('b', '2027-03-01T09:00:02Z'));
    await outbox.add(note('a', '2027-03-01T09:00:01Z'));
    expect(sent).toEqual([]);
    online = true;
    await Promise.all([outbox.flush(), outbox.flush(), outbox.flush()]);
    expect(sent).toEqual(['b', 'a']);
    expect(await store.all()).toEqual([]);
  });

  it('keeps an item waiting when there is no answer, and sends it on the next flush', async () => {
    const store = new MemoryOutboxStore();
    let fail = true;
    const sent: string[] = [];
    const outbox = new Outbox(store, async (item) => {
      if (fail) throw offlineError();
      sent.push(item.id);
    }, () => 'lead-1', () => true);
    await outbox.add(note('a', '2027-03-01T09:00:00Z'));
    await outbox.flush();
    expect((await store.all()).map((item) => item.state)).toEqual(['waiting']);
    fail = false;
    await outbox.flush();
    expect(sent).toEqual(['a']);
    expect(await store.all()).toEqual([]);
  });

  it('marks an item the server refuses as failed with its reason and goes on with the rest', async () => {
    const store = new MemoryOutboxStore();
    const sent: string[] = [];
    const outbox = new Outbox(store, async (item) => {
      if (item.id === 'bad') {
        throw new ApiError({ type: 'about:blank', title: 'Some details need fixing', status: 400, code: 'validation-failed', errors: [{ path: 'photo', message: '"plan.jpg" is a PDF file' }] });
      }
      sent.push(item.id);
    }, () => 'lead-1', () => false);
    await outbox.add(note('bad', '2027-03-01T09:00:00Z'));
    await outbox.add(note('good', '2027-03-01T09:00:01Z'));
    const states: string[][] = [];
    outbox.subscribe((snapshot) => states.push(snapshot.items.map((item) => `${item.id}:${item.state}`)));
    (outbox as unknown as { isOnline: () => boolean }).isOnline = () => true;
    await outbox.flush();
    expect(sent).toEqual(['good']);
    const left = await store.all();
    expect(left).toMatchObject([{ id: 'bad', state: 'failed', error: '"plan.jpg" is a PDF file' }]);
    expect(states.at(-1)).toEqual(['bad:failed']);
  });

  it('picks up items left by a closed tab, including one that was mid-send', async () => {
    const store = new MemoryOutboxStore();
    await store.put({ ...note('x', '2027-03-01T09:00:00Z'), state: 'sending' });
    const sent: string[] = [];
    const outbox = new Outbox(store, async (item) => {
      sent.push(item.id);
    }, () => 'lead-1', () => true);
    await outbox.flush();
    expect(sent).toEqual(['x']);
  });

  it('on a shared phone, shows and sends only what the signed-in person queued; the rest waits for its author', async () => {
    const store = new MemoryOutboxStore();
    let signedIn: string | null = 'lead-1';
    const sent: string[] = [];
    const outbox = new Outbox(store, async (item) => {
      sent.push(`${item.id} as ${signedIn}`);
    }, () => signedIn, () => false);
    await outbox.add(note('lead-note', '2027-03-01T09:00:00Z', 'lead-1'));
    let shown: string[] = [];
    outbox.subscribe((snapshot) => (shown = snapshot.items.map((item) => item.id)));

    signedIn = 'operative-2';
    outbox.userChanged();
    expect(shown).toEqual([]);
    await outbox.add(note('operative-note', '2027-03-01T09:05:00Z', 'operative-2'));
    (outbox as unknown as { isOnline: () => boolean }).isOnline = () => true;
    await outbox.flush();
    expect(sent).toEqual(['operative-note as operative-2']);
    expect((await store.all()).map((item) => item.id)).toEqual(['lead-note']);

    signedIn = null;
    outbox.userChanged();
    await outbox.flush();
    expect(sent).toHaveLength(1);

    signedIn = 'lead-1';
    outbox.userChanged();
    await outbox.flush();
    expect(sent).toEqual(['operative-note as operative-2', 'lead-note as lead-1']);
    expect(shown).toEqual([]);
  });
});
