import { defineComponent, h, nextTick, ref } from 'vue';
import { mount } from '@vue/test-utils';
import { beforeEach, describe, expect, it, vi } from 'vitest';

// A stand-in for the socket: the test connects and drops it by hand.
const status = ref<'offline' | 'connecting' | 'live'>('offline');
const connected = new Set<() => void>();
vi.mock('@/realtime/socket', () => ({
  realtime: {
    status,
    start: vi.fn(),
    stop: vi.fn(),
    onScheduleChanged: () => () => {},
    onResourceChanged: () => () => {},
    onConnected: (listener: () => void) => {
      connected.add(listener);
      return () => connected.delete(listener);
    },
  },
}));
const store = { range: { from: '2027-03-01', to: '2027-03-14' }, isLoading: false, catchUp: vi.fn(), reload: vi.fn(), applyEvent: vi.fn() };
vi.mock('@/stores/schedule-store', () => ({ useScheduleStore: () => store }));
vi.mock('@/stores/session-store', () => ({ useSessionStore: () => ({ isSignedIn: true, user: { name: 'Dev Okafor' } }) }));

const { useBoardLive } = await import('./use-board-live');

function mountBoard() {
  return mount(defineComponent({ setup: () => (useBoardLive(), () => h('div')) }));
}

async function connect(): Promise<void> {
  status.value = 'live';
  await nextTick();
  for (const listener of connected) listener();
  await Promise.resolve();
  await Promise.resolve();
}

async function drop(): Promise<void> {
  status.value = 'connecting';
  await nextTick();
}

beforeEach(() => {
  status.value = 'offline';
  connected.clear();
  store.catchUp.mockReset().mockResolvedValue(undefined);
  store.reload.mockReset().mockResolvedValue(undefined);
});

describe('useBoardLive', () => {
  it('replays the schedule changes on the first connection without reading the whole board again', async () => {
    mountBoard();
    await connect();
    expect(store.catchUp).toHaveBeenCalledTimes(1);
    expect(store.reload).not.toHaveBeenCalled();
  });

  it('after a dropped connection, replays the changes and then reads the board again for the notices it missed', async () => {
    mountBoard();
    await connect();
    await drop();
    await connect();
    expect(store.catchUp).toHaveBeenCalledTimes(2);
    expect(store.reload).toHaveBeenCalledTimes(1);
    expect(store.catchUp.mock.invocationCallOrder[1]!).toBeLessThan(store.reload.mock.invocationCallOrder[0]!);

    // A connection with no drop before it reads nothing more.
    await connect();
    expect(store.reload).toHaveBeenCalledTimes(1);
  });

  it('reads the board again when the replay itself fails', async () => {
    mountBoard();
    store.catchUp.mockRejectedValueOnce(new Error('offline'));
    await connect();
    expect(store.reload).toHaveBeenCalledTimes(1);
  });
});
