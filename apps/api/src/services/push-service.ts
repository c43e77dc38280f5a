import webpush from 'web-push';
import { In, type DataSource } from 'typeorm';
import type { Logger } from 'pino';
import { dayRangeLabel, type PushConfigDto, type PushMessageDto, type PushSubscriptionInput, type ScheduleChangeDto } from '@hodboard/shared';
import { CrewMember, Membership, PushSubscriptionRow } from '../entities/index.js';
import type { DomainEvent, EventBus } from '../lib/event-bus.js';
import { requirePermission, type Actor } from './actor.js';
import { FirmScope } from './firm-scope.js';

export interface VapidOptions {
  publicKey: string;
  privateKey: string;
  /** A mailto: or https: contact the push service can reach the sender on (RFC 8292 §2.1). */
  subject: string;
}

export interface PushTarget {
  endpoint: string;
  keys: { p256dh: string; auth: string };
}

/** Delivers one encrypted message; web-push's sendNotification in production, a stand-in in unit tests. */
export type PushSender = (target: PushTarget, payload: string, vapid: VapidOptions) => Promise<{ statusCode: number }>;

/**
 * web-push builds the encrypted body and the VAPID header; the request itself goes out with fetch, which
 * also reaches a plain-http push service (the local fake) that web-push's own https-only sender cannot.
 */
export const webPushSender: PushSender = async (target, payload, vapid) => {
  const details = webpush.generateRequestDetails(target, payload, {
    vapidDetails: vapid,
    TTL: 12 * 3600,
    urgency: 'normal',
    contentEncoding: 'aes128gcm',
  });
  const response = await fetch(details.endpoint, {
    method: details.method,
    headers: details.headers as Record<string, string>,
    body: details.body ? new Uint8Array(details.body) : undefined,
    signal: AbortSignal.timeout(10_000),
  });
  return { statusCode: response.status };
};

/**
 * Tells the phones of a crew when its schedule changes. Runs off the event bus, so only committed changes
 * are announced; a push service that has forgotten a subscription (404/410) gets it removed.
 */
export class PushService {
  private pending = new Set<Promise<void>>();

  constructor(
    private readonly dataSource: DataSource,
    events: EventBus,
    private readonly vapid: VapidOptions | undefined,
    private readonly sender: PushSender = webPushSender,
    private readonly logger?: Pick<Logger, 'warn' | 'error'>,
  ) {
    if (vapid) {
      events.subscribe((event) => {
        if (!event.type.startsWith('assignment:') && !event.type.startsWith('hold:')) return;
        const task = this.announce(event).catch((error: unknown) => this.logger?.error({ err: error }, 'push announce failed'));
        this.pending.add(task);
        void task.finally(() => this.pending.delete(task));
      });
    }
  }

  config(): PushConfigDto {
    return { publicKey: this.vapid?.publicKey ?? null };
  }

  async subscribe(actor: Actor, input: PushSubscriptionInput): Promise<void> {
    requirePermission(actor, 'jobs:read');
    // An endpoint belongs to one browser; if someone else signed in on it before, it is now this person's.
    await this.dataSource.manager.upsert(PushSubscriptionRow, {
      firmId: actor.firmId, userId: actor.userId, endpoint: input.endpoint, p256dh: input.keys.p256dh, auth: input.keys.auth,
    }, ['endpoint']);
  }

  async unsubscribe(actor: Actor, endpoint: string): Promise<void> {
    requirePermission(actor, 'jobs:read');
    await this.dataSource.manager.delete(PushSubscriptionRow, { firmId: actor.firmId, userId: actor.userId, endpoint });
  }

  /** Resolves once every announcement started so far has been sent; tests wait on it. */
  async idle(): Promise<void> {
    while (this.pending.size) await Promise.all([...this.pending]);
  }

  private async announce(event: DomainEvent): Promise<void> {
    const crewIds = event.crewIds ?? [];
    if (!this.vapid || crewIds.length === 0) return;
    const manager = this.dataSource.manager;
    const scope = new FirmScope(manager, event.firmId);
    const members = await scope.find(CrewMember, { where: { crewId: In(crewIds) } });
    const memberships = members.length ? await scope.find(Membership, { where: { id: In(members.map((m) => m.memberId)) } }) : [];
    const userIds = [...new Set(memberships.map((m) => m.userId))];
    if (userIds.length === 0) return;
    const targets = await scope.find(PushSubscriptionRow, { where: { userId: In(userIds) } });
    const message = messageFor(event);
    for (const target of targets) {
      try {
        const { statusCode } = await this.sender({ endpoint: target.endpoint, keys: { p256dh: target.p256dh, auth: target.auth } }, JSON.stringify(message), this.vapid);
        if (statusCode === 404 || statusCode === 410) await manager.delete(PushSubscriptionRow, { id: target.id });
      } catch (error) {
        const statusCode = (error as { statusCode?: number }).statusCode;
        if (statusCode === 404 || statusCode === 410) await manager.delete(PushSubscriptionRow, { id: target.id });
        else this.logger?.warn({ err: error, endpoint: new URL(target.endpoint).origin }, 'push not delivered');
      }
    }
  }
}

function messageFor(event: DomainEvent): PushMessageDto {
  const change = (event.payload ?? {}) as Partial<ScheduleChangeDto>;
  const job = change.job ? `${change.job.reference} ${change.job.title}` : 'A job';
  const days = change.assignment?.days ?? [];
  const body = event.type === 'assignment:removed'
    ? `${job} is off your crew's days for now.`
    : event.type === 'hold:withdrawn'
      ? 'A weather stand-down for your crew was withdrawn; open Hodboard to see your days.'
      : event.type.startsWith('hold:')
        ? 'A weather stand-down was recorded for your crew; open Hodboard to see it.'
        : days.length
          ? `${job}: now ${days.length} day${days.length > 1 ? 's' : ''}, ${dayRangeLabel(days[0]!, days[days.length - 1]!)}.`
          : `${job} changed.`;
  return { title: 'Your schedule changed', body, url: '/crew', tag: `schedule-${change.job?.id ?? event.id}` };
}
