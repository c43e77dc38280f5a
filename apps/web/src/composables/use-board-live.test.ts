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
vi.mock('@/utils/after-paint', () => ({ afterNextPaint: () => Promise.resolve() }));
vi.mock('@/stores/session-store', () => ({ useSessionStore: () => ({ isSignedIn: true, user: { name: 'Dev Okafor' } }) }));

const { useBoardLive } = await import('./use-board-live');

type UseConnection = Parameters<ReturnType<typeof useBoardLive>['whenConnecting']>[0];

const Board = defineComponent({
  props: { use: { type: Function, default: undefined } },
  setup: (props) => {
    const live = useBoardLive();
    if (props.use) live.whenConnecting(props.use as UseConnection);
    return () => h('div');
  },
});

/** The connection's code loads once the board has painted (at once here); this waits for it. */
async function settled(): Promise<void> {
  await vi.dynamicImportSettled();
  await Promise.resolve();
}

async function mountBoard() {
  const wrapper = mount(Board);
  await settled();
  return wrapper;
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
    await mountBoard();
    await connect();
    expect(store.catchUp).toHaveBeenCalledTimes(1);
    expect(store.reload).not.toHaveBeenCalled();
  });

  it('after a dropped connection, replays the changes and then reads the board again for the notices it missed', async () => {
    await mountBoard();
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

  it('starts the connection only after the board has painted, then hands it to the view, and lets go when the board goes', async () => {
    const { realtime } = await import('@/realtime/socket');
    vi.mocked(realtime.start).mockClear();
    const stop = vi.fn();
    const use = vi.fn(() => [stop]);
    const wrapper = mount(Board, { props: { use } });
    expect(realtime.start).not.toHaveBeenCalled();
    expect(use).not.toHaveBeenCalled();
    await settled();
    expect(realtime.start).toHaveBeenCalledTimes(1);
    expect(use).toHaveBeenCalledWith(realtime);
    wrapper.unmount();
    expect(stop).toHaveBeenCalledTimes(1);
  });

  it('reads the board again when the replay itself fails', async () => {
    await mountBoard();
    store.catchUp.mockRejectedValueOnce(new Error('offline'));
    await connect();
    expect(store.reload).toHaveBeenCalledTimes(1);
  });
});
