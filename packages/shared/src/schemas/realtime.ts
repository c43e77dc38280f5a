import type { ScheduleChangeDto } from './board.js';

export interface ScheduleChangedMessage {
  eventId: number;
  type: 'assignment:created' | 'assignment:moved' | 'assignment:removed' | (string & {});
  change: ScheduleChangeDto;
}

export interface ResourceChangedMessage {
  type: string;
  id: string;
  version?: number;
}

/** What the server pushes over socket.io; clients send nothing but the authenticated handshake. */
export interface ServerToClientEvents {
  'schedule:changed': (message: ScheduleChangedMessage) => void;
  'resource:changed': (message: ResourceChangedMessage) => void;
}

// eslint-disable-next-line @typescript-eslint/no-empty-object-type
export interface ClientToServerEvents {}

export interface SocketHandshakeAuth {
  token: string;
}
