import { In, type DataSource, type EntityManager } from 'typeorm';
import { can, type SiteNoteDto, type SiteNoteValues } from '@hodboard/shared';
import { SiteNote, User } from '../entities/index.js';
import type { EventBus } from '../lib/event-bus.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { crewsOfJob, visibleJob } from './crew-day-service.js';
import { FirmScope } from './firm-scope.js';

const NOTES_PER_JOB = 50;

/**
 * Two copies of one queued item can race (a phone retrying on a flaky signal): the loser hits the unique
 * idempotency index, and running the work again finds the winner's row instead of failing.
 */
export async function retryOnDuplicateKey<T>(work: () => Promise<T>, hasKey: boolean): Promise<T> {
  try {
    return await work();
  } catch (error) {
    const e = error as { code?: string; driverError?: { code?: string } };
    if (!hasKey || (e.driverError?.code ?? e.code) !== '23505') throw error;
    return work();
  }
}

export class SiteNoteService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly events: EventBus,
  ) {}

  /** A repeated idempotency key returns the note stored the first time, so a phone replaying its queue adds nothing. */
  async add(actor: Actor, input: SiteNoteValues): Promise<{ note: SiteNoteDto; isNew: boolean }> {
    requirePermission(actor, 'site-notes:add');
    const result = await retryOnDuplicateKey(() => this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      if (input.idempotencyKey) {
        const earlier = (await scope.find(SiteNote, { where: { idempotencyKey: input.idempotencyKey } }))[0];
        if (earlier) {
          await visibleJob(manager, actor, earlier.jobId);
          return { note: earlier, isNew: false, crewIds: [] as string[] };
        }
      }
      await visibleJob(manager, actor, input.jobId);
      const note = await manager.save(scope.create(SiteNote, {
        jobId: input.jobId,
        body: input.body,
        authorUserId: actor.userId,
        authorRole: can(actor.role, 'jobs:manage') ? 'office' : 'crew',
        idempotencyKey: input.idempotencyKey ?? null,
      }));
      await recordAudit(manager, actor, { entity: 'job', entityId: input.jobId, action: 'site-note-added', after: { noteId: note.id, body: note.body } });
      return { note, isNew: true, crewIds: await crewsOfJob(manager, actor.firmId, input.jobId) };
    }), Boolean(input.idempotencyKey));
    if (result.isNew) this.events.publish({ firmId: actor.firmId, type: 'site-note:added', id: result.note.jobId, crewIds: result.crewIds });
    const [dto] = await this.toDtos(this.dataSource.manager, [result.note]);
    return { note: dto!, isNew: result.isNew };
  }

  async list(actor: Actor, jobId: string): Promise<SiteNoteDto[]> {
    requirePermission(actor, 'jobs:read');
    await visibleJob(this.dataSource.manager, actor, jobId);
    return (await this.listForJobs(actor, [jobId]))[jobId] ?? [];
  }

  /** For jobs the caller has already been shown; newest first. */
  async listForJobs(actor: Actor, jobIds: string[]): Promise<Record<string, SiteNoteDto[]>> {
    if (jobIds.length === 0) return {};
    const manager = this.dataSource.manager;
    const rows = await new FirmScope(manager, actor.firmId).find(SiteNote, { where: { jobId: In(jobIds) }, order: { createdAt: 'DESC' } });
    const byJob: Record<string, SiteNoteDto[]> = Object.fromEntries(jobIds.map((id) => [id, []]));
    for (const dto of await this.toDtos(manager, rows)) {
      const list = byJob[dto.jobId]!;
      if (list.length < NOTES_PER_JOB) list.push(dto);
    }
    return byJob;
  }

  private async toDtos(manager: EntityManager, rows: SiteNote[]): Promise<SiteNoteDto[]> {
    const ids = [...new Set(rows.map((row) => row.authorUserId).filter((id): id is string => Boolean(id)))];
    const users = ids.length ? await manager.find(User, { where: { id: In(ids) }, select: { id: true, name: true } }) : [];
    const names = new Map(users.map((user) => [user.id, user.name]));
    return rows.map((row) => ({
      id: row.id,
      jobId: row.jobId,
      body: row.body,
      authorName: (row.authorUserId && names.get(row.authorUserId)) || 'Someone',
      authorRole: row.authorRole,
      createdAt: row.createdAt.toISOString(),
    }));
  }
}
