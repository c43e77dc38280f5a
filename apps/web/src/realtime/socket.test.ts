import { describe, expect, it, vi } from 'vitest';
import type { SessionDto } from '@hodboard/shared';
import { createHttpClient } from '@/api/http';
import { createRealtimeClient, type RealtimeOptions } from './socket';

const session: SessionDto = {
  accessToken: 'renewed-token',
  expiresIn: 900,
  user: { id: 'u1', name: 'Nell Carrow', email: 'nell@example.test' },
  firm: { id: 'f1', name: 'Carrow Stoneworks' },
  role: 'crew-lead',
  crewIds: ['c1'],
};

function fakeSocket() {
  const socket = { connected: false, active: false, on: vi.fn(), connect: vi.fn(), disconnect: vi.fn() };
  const connect = vi.fn(() => socket) as unknown as NonNullable<RealtimeOptions['connect']>;
  return { socket, connect };
}

describe('createRealtimeClient', () => {
  it('connects once the session is renewed when a view asked before there was a token', async () => {
    const http = createHttpClient({ fetch: async () => new Response(JSON.stringify(session), { status: 200 }) });
    const { socket, connect } = fakeSocket();
    const realtime = createRealtimeClient({ http, connect });

    realtime.start();
    expect(connect).not.toHaveBeenCalled();

    await http.renew();
    expect(socket.connect).toHaveBeenCalledTimes(1);
    expect(realtime.status.value).toBe('connecting');
  });

  it('stays closed after a renewal when no view asked for live updates', async () => {
    const http = createHttpClient({ fetch: async () => new Response(JSON.stringify(session), { status: 200 }) });
    const { connect } = fakeSocket();
    const realtime = createRealtimeClient({ http, connect });

    realtime.start();
    realtime.stop();
    await http.renew();
    expect(connect).not.toHaveBeenCalled();
  });
});
