import { randomUUID } from 'node:crypto';
import type { RequestHandler } from 'express';
import type { BoardDto, BoardQuery, ScheduleChangeDto } from '@hodboard/shared';
import type { Clock } from '../lib/clock.js';
import type { DomainEvent, EventBus } from '../lib/event-bus.js';
import { SectionedGzip } from '../lib/sectioned-gzip.js';
import type { Actor } from './actor.js';
import { patchBoard, patchJobEdit, type BoardView } from './board-patch.js';
import type { JobEditedPayload } from './job-service.js';
import type { ScheduleService } from './schedule-service.js';

/** Schedule changes a cached board can take in place. */
const PATCHABLE = new Set(['assignment:created', 'assignment:moved', 'assignment:removed']);
/**
 * Published changes to things no board shows. A quote changes the job's status only through a `job:updated` of its
 * own, and a photo or a site note is counted on the job's page, not on its card. Any other change makes the firm's
 * boards be read afresh.
 */
const UNSEEN_ON_BOARDS = new Set([
  'photo:added', 'site-note:added', 'quote:updated', 'costing:updated',
  'material:created', 'material:updated', 'material:deleted', 'material:imported',
]);

const QUARTER_HOUR_MS = 15 * 60_000;

export interface CachedBoard {
  etag: string;
  /** The board's JSON, gzipped once for every reader of this version. */
  gzip: Buffer;
}

interface Entry {
  firmId: string;
  view: BoardView;
  /** Set once the board is read; only a finished read is patched, one still running is dropped instead. */
  board?: BoardDto;
  /** The serialised board, made when first asked for. */
  answer?: Promise<CachedBoard>;
  /** Keeps each field's compressed bytes, for the patched boards that follow this one. */
  packer: SectionedGzip;
}

/**
 * The serialised board of each (firm, version, what the reader may see, range), kept in this process's memory, so a
 * re-read of an unchanged board costs neither the queries nor the JSON nor the gzip.
 *
 * A firm's version moves on after every write: any non-GET request its people make (once it has answered, so after
 * its transaction committed) unless its route publishes all it changes (`keepsBoardsOnWrite`), and any committed change
 * published on the event bus (timers, e-mailed links and webhooks included) except those in UNSEEN_ON_BOARDS. A read
 * keys its entry by the version it saw before reading, so a write that commits while it runs leaves it under a version
 * nobody asks for. The key also holds the quarter-hour of the clock, because "today" and a forecast's staleness change
 * the board with no write at all: every time zone's midnight falls on a quarter-hour of UTC, so a new day is seen at
 * once, and a forecast turning stale (after hours) shows at most a quarter of an hour late.
 *
 * A schedule change (a card placed, moved or sent back) is the exception: the change it publishes is applied to each
 * finished board of the firm (patchBoard), so the next read skips the queries and the rules. Whatever else the request
 * changed publishes its own change, which moves the version on as usual. A job edit of fields no rule reads is taken
 * in place the same way (patchJobEdit).
 *
 * Single process only: the versions live here, as the event bus does. A second API process, or a write made
 * straight into the database, is not seen until the quarter-hour turns.
 */
export class BoardCache {
  private readonly bootId = randomUUID().slice(0, 8);
  private readonly versions = new Map<string, number>();
  private everyFirm = 0;
  private serial = 0;
  private readonly entries = new Map<string, Entry>();

  constructor(
    private readonly schedule: ScheduleService,
    events: EventBus,
    private readonly clock: Clock,
    private readonly maxEntries = 24,
  ) {
    events.subscribe((event) => {
      if (PATCHABLE.has(event.type)) this.patch(event);
      else if (event.type === 'job:updated' && isJobEdit(event.payload)) this.patchEach(event.firmId, (board) => patchJobEdit(board, event.payload as JobEditedPayload));
      else if (!UNSEEN_ON_BOARDS.has(event.type)) this.invalidate(event.firmId);
    });
  }

  /** Forgets the boards of one firm, or of every firm. */
  invalidate(firmId?: string): void {
    if (firmId === undefined) {
      this.everyFirm += 1;
      this.entries.clear();
      return;
    }
    this.versions.set(firmId, (this.versions.get(firmId) ?? 0) + 1);
    for (const [key, entry] of this.entries) if (entry.firmId === firmId) this.entries.delete(key);
  }

  /** Moves the firm's version on once a write request has been answered, unless the route keeps the boards itself. */
  readonly invalidateOnWrite: RequestHandler = (req, res, next) => {
    if (req.method !== 'GET' && req.method !== 'HEAD' && req.method !== 'OPTIONS') {
      let done = false;
      const bump = () => {
        if (done) return;
        done = true;
        const actor = res.locals.actor as Actor | undefined;
        // A write nobody signed in made (sign-in, an e-mailed link, a webhook) is seen through the change it publishes.
        if (res.locals.keepsBoards === true || !actor) return;
        this.invalidate(actor.firmId);
      };
      res.once('finish', bump);
      res.once('close', bump);
    }
    next();
  };

  /**
   * For a route whose every change to the board is published as a schedule change or as a change that moves the
   * version on; the cached boards then follow the published changes instead of being dropped after the request.
   */
  readonly keepsBoardsOnWrite: RequestHandler = (_req, res, next) => {
    res.locals.keepsBoards = true;
    next();
  };

  async read(actor: Actor, query: BoardQuery): Promise<CachedBoard> {
    const view = this.schedule.boardView(actor, query);
    const quarterHour = Math.floor(this.clock().getTime() / QUARTER_HOUR_MS);
    const version = `${this.everyFirm}.${this.versions.get(actor.firmId) ?? 0}`;
    // The view is what the reader gets (the tray or not, which crews), so two readers who get the same board share it.
    const key = [actor.firmId, version, quarterHour, view.hasTray ? 'tray' : '', view.crewIds?.join(',') ?? 'every crew', view.from, view.to].join('|');
    const known = this.entries.get(key);
    if (known) {
      // Most recently used last, so the oldest is the first to go.
      this.entries.delete(key);
      this.entries.set(key, known);
      return (known.answer ??= this.answerFor(key, known));
    }
    const entry: Entry = { firmId: actor.firmId, view, packer: new SectionedGzip() };
    entry.answer = this.schedule.board(actor, query).then((board) => {
      if (this.entries.get(key) === entry) entry.board = board;
      return this.serialise(board, entry.packer);
    });
    entry.answer.catch(() => this.entries.delete(key));
    this.entries.set(key, entry);
    while (this.entries.size > this.maxEntries) this.entries.delete(this.entries.keys().next().value!);
    return entry.answer;
  }

  /** The board read afresh, skipping this cache: what a reader gets after a write. */
  async build(actor: Actor, query: BoardQuery): Promise<CachedBoard> {
    return this.serialise(await this.schedule.board(actor, query), new SectionedGzip());
  }

  private serialise(board: BoardDto, packer: SectionedGzip): CachedBoard {
    this.serial += 1;
    return { etag: `"${this.bootId}-${this.serial}"`, gzip: packer.gzip(board as unknown as Record<string, unknown>) };
  }

  private answerFor(key: string, entry: Entry): Promise<CachedBoard> {
    try {
      return Promise.resolve(this.serialise(entry.board!, entry.packer));
    } catch (error) {
      this.entries.delete(key);
      return Promise.reject(error);
    }
  }

  /**
   * Applies a published schedule change to each of the firm's finished boards, to be serialised when next read. A
   * board still being read, or one the change cannot be applied to, is dropped and read afresh.
   */
  private patch(event: DomainEvent): void {
    const { eventId, ...change } = event.payload as ScheduleChangeDto & { eventId: number };
    this.patchEach(event.firmId, (board, view) => patchBoard(board, change, eventId, view));
  }

  private patchEach(firmId: string, apply: (board: BoardDto, view: BoardView) => BoardDto | null): void {
    for (const [key, entry] of this.entries) {
      if (entry.firmId !== firmId) continue;
      // A board still being read may hold what was there before the change: dropped, as is one the change does not fit.
      const board = entry.board && apply(entry.board, entry.view);
      if (board && board === entry.board) continue;
      if (board) this.entries.set(key, { firmId: entry.firmId, view: entry.view, board, packer: entry.packer });
      else this.entries.delete(key);
    }
  }
}

function isJobEdit(payload: unknown): payload is JobEditedPayload {
  return typeof payload === 'object' && payload !== null && 'changedFields' in payload && 'job' in payload;
}
