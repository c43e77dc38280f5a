import { randomUUID } from 'node:crypto';
import { promisify } from 'node:util';
import { gzip } from 'node:zlib';
import type { RequestHandler } from 'express';
import { can, type BoardQuery } from '@hodboard/shared';
import type { Clock } from '../lib/clock.js';
import type { EventBus } from '../lib/event-bus.js';
import type { Actor } from './actor.js';
import type { ScheduleService } from './schedule-service.js';

const gzipAsync = promisify(gzip);

export interface CachedBoard {
  etag: string;
  /** The board's JSON, gzipped once for every reader of this version. */
  gzip: Buffer;
}

/**
 * The serialised board of each (firm, version, what the reader may see, range), kept in this process's memory, so a
 * re-read of an unchanged board costs neither the queries nor the JSON nor the gzip.
 *
 * A firm's version moves on after every write: any non-GET request its people make (once it has answered, so after
 * its transaction committed), any committed change published on the event bus (timers and e-mailed links included),
 * and every firm's at once for a write nobody signed in made. A read keys its entry by the version it saw before
 * reading, so a write that commits while it runs leaves it under a version nobody asks for. The key also holds the
 * minute of the clock, because "today" and a forecast's staleness change the board with no write at all.
 *
 * Single process only: the versions live here, as the event bus does. A second API process, or a write made
 * straight into the database, is not seen until the minute turns.
 */
export class BoardCache {
  private readonly bootId = randomUUID().slice(0, 8);
  private readonly versions = new Map<string, number>();
  private everyFirm = 0;
  private serial = 0;
  private readonly entries = new Map<string, Promise<CachedBoard>>();

  constructor(
    private readonly schedule: ScheduleService,
    events: EventBus,
    private readonly clock: Clock,
    private readonly maxEntries = 24,
  ) {
    events.subscribe((event) => this.invalidate(event.firmId));
  }

  /** Forgets the boards of one firm, or of every firm. */
  invalidate(firmId?: string): void {
    if (firmId === undefined) {
      this.everyFirm += 1;
      this.entries.clear();
      return;
    }
    this.versions.set(firmId, (this.versions.get(firmId) ?? 0) + 1);
    for (const key of this.entries.keys()) if (key.startsWith(`${firmId}|`)) this.entries.delete(key);
  }

  /** Moves the firm's version on once a write request has been answered. */
  readonly invalidateOnWrite: RequestHandler = (req, res, next) => {
    if (req.method !== 'GET' && req.method !== 'HEAD' && req.method !== 'OPTIONS') {
      let done = false;
      const bump = () => {
        if (done) return;
        done = true;
        this.invalidate((res.locals.actor as Actor | undefined)?.firmId);
      };
      res.once('finish', bump);
      res.once('close', bump);
    }
    next();
  };

  async read(actor: Actor, query: BoardQuery): Promise<CachedBoard> {
    const sees = can(actor.role, 'jobs:manage') ? 'office' : `crews:${[...actor.crewIds].sort().join(',')}`;
    const minute = Math.floor(this.clock().getTime() / 60_000);
    const version = `${this.everyFirm}.${this.versions.get(actor.firmId) ?? 0}`;
    const key = [actor.firmId, version, minute, sees, query.from, query.to, query.crewId ?? ''].join('|');
    const known = this.entries.get(key);
    if (known) {
      // Most recently used last, so the oldest is the first to go.
      this.entries.delete(key);
      this.entries.set(key, known);
      return known;
    }
    const built = this.build(actor, query);
    this.entries.set(key, built);
    built.catch(() => this.entries.delete(key));
    while (this.entries.size > this.maxEntries) this.entries.delete(this.entries.keys().next().value!);
    return built;
  }

  /** The board read afresh, skipping this cache: what a reader gets after a write. */
  async build(actor: Actor, query: BoardQuery): Promise<CachedBoard> {
    const board = await this.schedule.board(actor, query);
    this.serial += 1;
    return { etag: `"${this.bootId}-${this.serial}"`, gzip: await gzipAsync(JSON.stringify(board), { level: 1 }) };
  }
}
