import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Fake } from './fake.js';

export interface ReceivedPush {
  path: string;
  headers: Record<string, string>;
  /** The encrypted body as base64; a push service cannot read it either (RFC 8291). */
  body: string;
  bodyBytes: number;
  at: string;
}

export interface PushFake extends Fake {
  port(): number;
  /** A push endpoint address for a made-up browser. */
  endpoint(name: string): string;
  received(): readonly ReceivedPush[];
  clear(): void;
  /** The next push to a path answers with this status, e.g. 410 for a browser that unsubscribed. */
  answerNext(path: string, status: number): void;
}

/**
 * Stands in for a browser vendor's push service (RFC 8030): accepts POSTs on any path, keeps what came, and
 * lists it at GET /messages. Real browsers register with their own vendor, so this serves tests and demos.
 */
export function createPushFake(options: { port: number; host?: string }): PushFake {
  const host = options.host ?? '127.0.0.1';
  let port = options.port;
  let received: ReceivedPush[] = [];
  const scripted = new Map<string, number>();

  const server: Server = createServer((req: IncomingMessage, res: ServerResponse) => {
    const chunks: Buffer[] = [];
    req.on('data', (chunk: Buffer) => chunks.push(chunk));
    req.on('end', () => {
      const path = new URL(req.url ?? '/', 'http://fake').pathname;
      if (req.method === 'GET' && path === '/messages') {
        res.writeHead(200, { 'Content-Type': 'application/json' }).end(JSON.stringify(received));
        return;
      }
      if (req.method === 'DELETE' && path === '/messages') {
        received = [];
        res.writeHead(204).end();
        return;
      }
      if (req.method !== 'POST') {
        res.writeHead(405).end();
        return;
      }
      const status = scripted.get(path);
      scripted.delete(path);
      const body = Buffer.concat(chunks);
      received.push({
        path,
        headers: Object.fromEntries(Object.entries(req.headers).map(([key, value]) => [key, String(value)])),
        body: body.toString('base64'),
        bodyBytes: body.length,
        at: new Date().toISOString(),
      });
      if (received.length > 500) received = received.slice(-500);
      res.writeHead(status ?? 201).end();
    });
  });

  return {
    name: 'push',
    port: () => port,
    endpoint: (name) => `http://${host}:${port}/push/${encodeURIComponent(name)}`,
    received: () => received,
    clear: () => {
      received = [];
    },
    answerNext: (path, status) => {
      scripted.set(path, status);
    },
    start() {
      return new Promise((resolve, reject) => {
        server.once('error', reject);
        server.listen(options.port, host, () => {
          port = (server.address() as AddressInfo).port;
          resolve([`push service on http://${host}:${port} (received pushes at /messages)`]);
        });
      });
    },
    stop() {
      return new Promise((resolve) => server.close(() => resolve()));
    },
  };
}
