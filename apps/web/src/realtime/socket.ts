import { io, type Socket } from 'socket.io-client';
import { ref, type Ref } from 'vue';
import type {
  ClientToServerEvents,
  ResourceChangedMessage,
  ScheduleChangedMessage,
  ServerToClientEvents,
  SessionDto,
} from '@hodboard/shared';
import { http, type HttpClient } from '@/api/http';

export type RealtimeStatus = 'offline' | 'connecting' | 'live';

type HodboardSocket = Socket<ServerToClientEvents, ClientToServerEvents>;
type Listener<T> = (value: T) => void;

export interface RealtimeClient {
  status: Ref<RealtimeStatus>;
  /** Opens the connection if it is not open yet; safe to call from every view that wants live data. */
  start(): void;
  stop(): void;
  onScheduleChanged(listener: Listener<ScheduleChangedMessage>): () => void;
  onResourceChanged(listener: Listener<ResourceChangedMessage>): () => void;
  /** Runs after every (re)connection, so a listener can fetch whatever it missed while away. */
  onConnected(listener: () => void): () => void;
}

export interface RealtimeOptions {
  http?: HttpClient;
  connect?: (auth: (cb: (data: { token: string }) => void) => void) => HodboardSocket;
}

export function createRealtimeClient(options: RealtimeOptions = {}): RealtimeClient {
  const client = options.http ?? http;
  const connect =
    options.connect ??
    ((auth) => io({ path: '/socket.io', autoConnect: false, transports: ['websocket', 'polling'], auth }) as HodboardSocket);
  const status = ref<RealtimeStatus>('offline');
  const scheduleListeners = new Set<Listener<ScheduleChangedMessage>>();
  const resourceListeners = new Set<Listener<ResourceChangedMessage>>();
  const connectedListeners = new Set<() => void>();
  let socket: HodboardSocket | null = null;
  let isRefreshing = false;
  /** A view asked for live updates before there was a token (the app opened on the profile saved on the phone). */
  let isWanted = false;

  // A function, not an object: socket.io calls it on every attempt, so a reconnect presents the token current at that moment.
  const auth = (cb: (data: { token: string }) => void) => cb({ token: client.getAccessToken() ?? '' });

  function ensureSocket(): HodboardSocket {
    if (socket) return socket;
    const created = connect(auth);
    created.on('connect', () => {
      status.value = 'live';
      for (const listener of connectedListeners) listener();
    });
    created.on('disconnect', () => {
      status.value = created.active ? 'connecting' : 'offline';
    });
    created.on('connect_error', () => {
      // The server refused the handshake (expired token): socket.io will not retry that on its own.
      if (created.active) {
        status.value = 'connecting';
        return;
      }
      status.value = 'offline';
      if (isRefreshing) return;
      isRefreshing = true;
      void client
        .refresh()
        .then((session) => {
          if (session && socket === created) {
            status.value = 'connecting';
            created.connect();
          }
        })
        .finally(() => {
          isRefreshing = false;
        });
    });
    created.on('schedule:changed', (message) => {
      for (const listener of scheduleListeners) listener(message);
    });
    created.on('resource:changed', (message) => {
      for (const listener of resourceListeners) listener(message);
    });
    socket = created;
    return created;
  }

  function start(): void {
    if (!client.getAccessToken()) {
      isWanted = true;
      return;
    }
    isWanted = false;
    const current = ensureSocket();
    if (current.connected || current.active) return;
    status.value = 'connecting';
    current.connect();
  }

  function stop(): void {
    isWanted = false;
    socket?.disconnect();
    status.value = 'offline';
  }

  // New token (background refresh, another sign-in): hand it to the server; no session: close.
  client.onSessionChange((session: SessionDto | null) => {
    if (!socket) {
      if (session && isWanted) start();
      return;
    }
    if (!session) {
      stop();
      return;
    }
    socket.disconnect();
    status.value = 'connecting';
    socket.connect();
  });

  function subscribe<T>(set: Set<T>, listener: T): () => void {
    set.add(listener);
    return () => set.delete(listener);
  }

  return {
    status,
    start,
    stop,
    onScheduleChanged: (listener) => subscribe(scheduleListeners, listener),
    onResourceChanged: (listener) => subscribe(resourceListeners, listener),
    onConnected: (listener) => subscribe(connectedListeners, listener),
  };
}

export const realtime = createRealtimeClient();
