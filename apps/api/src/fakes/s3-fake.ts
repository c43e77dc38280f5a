import { mkdir } from 'node:fs/promises';
import type { AddressInfo } from 'node:net';
import S3rver from 's3rver';
import type { Fake } from './fake.js';

export interface S3FakeOptions {
  /** 0 picks a free port; read the real one from `port()` after `start()`. */
  port: number;
  directory: string;
  bucket: string;
}

export interface S3Fake extends Fake {
  port(): number;
  endpoint(): string;
}

/** An S3-compatible store on disk for development and tests; the same SDK calls as real object storage. */
export function createS3Fake(options: S3FakeOptions): S3Fake {
  let server: S3rver | null = null;
  let port = options.port;
  return {
    name: 's3',
    port: () => port,
    endpoint: () => `http://127.0.0.1:${port}`,
    async start() {
      await mkdir(options.directory, { recursive: true });
      server = new S3rver({
        port: options.port,
        address: '127.0.0.1',
        silent: true,
        directory: options.directory,
        configureBuckets: [{ name: options.bucket, configs: [] }],
      });
      const address = (await server.run()) as AddressInfo;
      port = address.port;
      return [`S3 API on http://127.0.0.1:${port} (bucket ${options.bucket}, files in ${options.directory})`];
    },
    async stop() {
      await server?.close();
      server = null;
    },
  };
}
