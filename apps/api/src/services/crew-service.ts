import type { DataSource, EntityManager } from 'typeorm';
import type { CrewDto, CrewListQuery, CrewParsed, Page } from '@hodboard/shared';
import { Crew, CrewMember, Membership } from '../entities/index.js';
import type { EventBus } from '../lib/event-bus.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { assertVersion, FirmScope } from './firm-scope.js';
import { paginate } from './paging.js';

export class CrewService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly events: EventBus,
  ) {}

  async list(actor: Actor, query: CrewListQuery): Promise<Page<CrewDto>> {
    requirePermission(actor, 'crews:read');
    const scope = new FirmScope(this.dataSource.manager, actor.firmId);
    const page = await paginate(scope.query(Crew, 'crew'), query, {
      sortColumns: { name: 'crew.name', createdAt: 'crew.created_at' },
      defaultSort: 'name',
      searchColumns: ['crew.name'],
      toDto: (crew) => crew,
    });
    return { ...page, items: await this.toDtos(scope.manager, actor.firmId, page.items) };
  }

  async get(actor: Actor, id: string): Promise<CrewDto> {
    requirePermission(actor, 'crews:read');
    const scope = new FirmScope(this.dataSource.manager, actor.firmId);
    const crew = await scope.get(Crew, id, 'Crew');
    return (await this.toDtos(scope.manager, actor.firmId, [crew]))[0]!;
  }

  async create(actor: Actor, input: CrewParsed): Promise<CrewDto> {
    requirePermission(actor, 'crews:manage');
    const crew = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      await assertMembers(scope, input);
      const created = await manager.save(scope.create(Crew, { name: input.name, colour: input.colour, leadMemberId: input.leadMemberId }));
      await replaceMembers(manager, actor.firmId, created.id, input.memberIds);
      await recordAudit(manager, actor, { entity: 'crew', entityId: created.id, action: 'created', after: { ...created, memberIds: input.memberIds } });
      return created;
    });
    this.events.publish({ firmId: actor.firmId, type: 'crew:created', id: crew.id, version: crew.version });
    return this.get(actor, crew.id);
  }

  async update(actor: Actor, id: string, input: CrewParsed & { version?: number }): Promise<CrewDto> {
    requirePermission(actor, 'crews:manage');
    const crew = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const existing = await scope.lockForUpdate(Crew, id, 'Crew');
      assertVersion(existing, input.version, 'This crew');
      await assertMembers(scope, input);
      const before = { ...existing };
      Object.assign(existing, { name: input.name, colour: input.colour, leadMemberId: input.leadMemberId });
      const saved = await manager.save(existing);
      await replaceMembers(manager, actor.firmId, id, input.memberIds);
      await recordAudit(manager, actor, { entity: 'crew', entityId: id, action: 'updated', before, after: { ...saved, memberIds: input.memberIds } });
      return saved;
    });
    this.events.publish({ firmId: actor.firmId, type: 'crew:updated', id, version: crew.version });
    return this.get(actor, id);
  }

  async remove(actor: Actor, id: string): Promise<void> {
    requirePermission(actor, 'crews:manage');
    await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const existing = await scope.lockForUpdate(Crew, id, 'Crew');
      await manager.delete(Crew, { id: existing.id, firmId: actor.firmId });
      await recordAudit(manager, actor, { entity: 'crew', entityId: id, action: 'deleted', before: existing });
    });
    this.events.publish({ firmId: actor.firmId, type: 'crew:deleted', id });
  }

  private async toDtos(manager: EntityManager, firmId: string, crews: Crew[]): Promise<CrewDto[]> {
    if (crews.length === 0) return [];
    const scope = new FirmScope(manager, firmId);
    const rows = await scope
      .query(CrewMember, 'cm')
      .innerJoinAndSelect('cm.member', 'member')
      .innerJoinAndSelect('member.user', 'user')
      .andWhere('cm.crew_id IN (:...ids)', { ids: crews.map((crew) => crew.id) })
      .orderBy('user.name', 'ASC')
      .getMany();
    return crews.map((crew) => ({
      id: crew.id,
      name: crew.name,
      colour: crew.colour,
      leadMemberId: crew.leadMemberId,
      members: rows
        .filter((row) => row.crewId === crew.id)
        .map((row) => ({ memberId: row.memberId, name: row.member.user.name, role: row.member.role })),
      version: crew.version,
      createdAt: crew.createdAt.toISOString(),
    }));
  }
}

async function assertMembers(scope: FirmScope, input: CrewParsed): Promise<void> {
  const ids = [...input.memberIds, ...(input.leadMemberId ? [input.leadMemberId] : [])];
  await scope.assertAllExist(Membership, ids, 'Crew member');
}

async function replaceMembers(manager: EntityManager, firmId: string, crewId: string, memberIds: string[]): Promise<void> {
  await manager.delete(CrewMember, { crewId, firmId });
  const unique = [...new Set(memberIds)];
  if (unique.length) await manager.insert(CrewMember, unique.map((memberId) => ({ crewId, memberId, firmId })));
}
