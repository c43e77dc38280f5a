import type { Server as HttpServer } from 'node:http';
import { Server, type Socket } from 'socket.io';
import { can, type ClientToServerEvents, type ServerToClientEvents } from '@hodboard/shared';
import type { Logger } from 'pino';
import type { EventBus } from '../lib/event-bus.js';
import type { Actor } from '../services/actor.js';
import type { AuthService } from '../services/auth-service.js';

interface SocketData {
  actor: Actor;
}

export type RealtimeServer = Server<ClientToServerEvents, ServerToClientEvents, Record<string, never>, SocketData>;
type RealtimeSocket = Socket<ClientToServerEvents, ServerToClientEvents, Record<string, never>, SocketData>;

export const officeRoom = (firmId: string) => `firm:${firmId}:office`;
export const crewRoom = (crewId: string) => `crew:${crewId}`;

function roomsOf(actor: Actor): string[] {
  return [...(can(actor.role, 'jobs:manage') ? [officeRoom(actor.firmId)] : []), ...actor.crewIds.map(crewRoom)];
}

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
    void socket.join(roomsOf(socket.data.actor));
  });

  /** Puts an open socket in the rooms its membership allows now; closes it once the membership has gone. */
  async function reseat(socket: RealtimeSocket): Promise<void> {
    let actor: Actor;
    try {
      actor = await auth.currentActor(socket.data.actor);
    } catch (error) {
      logger.debug({ err: error, membershipId: socket.data.actor.membershipId }, 'socket closed: membership gone');
      socket.disconnect(true);
      return;
    }
    socket.data.actor = actor;
    const allowed = new Set(roomsOf(actor));
    for (const room of socket.rooms) if (room !== socket.id && !allowed.has(room)) void socket.leave(room);
    void socket.join([...allowed]);
  }

  events.subscribe((event) => {
    // A socket's rooms were chosen at its handshake: a new role, a removal or a crew's new line-up must reach it now,
    // or it would go on hearing the office or a crew it no longer belongs to until it reconnects.
    const isMemberChange = event.type === 'member:changed' || event.type === 'member:removed';
    if (isMemberChange || event.type.startsWith('crew:')) {
      for (const socket of io.sockets.sockets.values()) {
        const { actor } = socket.data;
        if (actor.firmId !== event.firmId || (isMemberChange && actor.membershipId !== event.id)) continue;
        void reseat(socket);
      }
    }
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
