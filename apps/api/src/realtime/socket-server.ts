import type { Server as HttpServer } from 'node:http';
import { Server } from 'socket.io';
import { can, type ClientToServerEvents, type ServerToClientEvents } from '@hodboard/shared';
import type { Logger } from 'pino';
import type { EventBus } from '../lib/event-bus.js';
import type { Actor } from '../services/actor.js';
import type { AuthService } from '../services/auth-service.js';

interface SocketData {
  actor: Actor;
}

export type RealtimeServer = Server<ClientToServerEvents, ServerToClientEvents, Record<string, never>, SocketData>;

export const officeRoom = (firmId: string) => `firm:${firmId}:office`;
export const crewRoom = (crewId: string) => `crew:${crewId}`;

/**
 * Pushes committed changes to the people who can see them: the office of the firm, and each crew whose
 * schedule the change touches. Sockets join rooms only after their access token checks out.
 */
export function attachRealtime(httpServer: HttpServer, auth: AuthService, events: EventBus, logger: Logger): RealtimeServer {
  const io: RealtimeServer = new Server(httpServer, { serveClient: false, cors: { origin: false } });

  io.use(async (socket, next) => {
    const token = (socket.handshake.auth as { token?: unknown }).token;
    if (typeof token !== 'string' || token.length === 0) return next(new Error('unauthenticated'));
    try {
      socket.data.actor = await auth.authenticate(token);
      next();
    } catch {
      next(new Error('unauthenticated'));
    }
  });

  io.on('connection', (socket) => {
    const { actor } = socket.data;
    if (can(actor.role, 'jobs:manage')) void socket.join(officeRoom(actor.firmId));
    for (const crewId of actor.crewIds) void socket.join(crewRoom(crewId));
  });

  events.subscribe((event) => {
    const rooms = [officeRoom(event.firmId), ...(event.crewIds ?? []).map(crewRoom)];
    if (event.type.startsWith('assignment:')) {
      const { eventId, ...change } = event.payload as { eventId: number } & Parameters<ServerToClientEvents['schedule:changed']>[0]['change'];
      io.to(rooms).emit('schedule:changed', { eventId, type: event.type, change });
    } else {
      io.to(rooms).emit('resource:changed', { type: event.type, id: event.id, ...(event.version ? { version: event.version } : {}) });
    }
  });

  logger.debug('realtime attached');
  return io;
}
