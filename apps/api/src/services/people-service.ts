import type { DataSource } from 'typeorm';
import { assignableRoles, roleSchema, type ChangeRoleInput, type InviteInput, type MemberDto, type Role } from '@hodboard/shared';
import { AuthToken, CrewMember, Membership, User } from '../entities/index.js';
import { errors } from '../errors.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import type { AuthService } from './auth-service.js';
import { FirmScope } from './firm-scope.js';
import type { EventBus } from '../lib/event-bus.js';

export class PeopleService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly auth: AuthService,
    private readonly events: EventBus,
  ) {}

  async list(actor: Actor): Promise<MemberDto[]> {
    requirePermission(actor, 'people:read');
    const scope = new FirmScope(this.dataSource.manager, actor.firmId);
    const memberships = await scope.find(Membership, { relations: { user: true }, order: { createdAt: 'ASC' } });
    const crewRows = await scope.find(CrewMember, {});
    return memberships.map((membership) =>
      toMemberDto(membership, crewRows.filter((row) => row.memberId === membership.id).map((row) => row.crewId)),
    );
  }

  async invite(actor: Actor, input: InviteInput): Promise<MemberDto> {
    requirePermission(actor, 'people:manage');
    assertMayAssign(actor.role, input.role);
    const membership = await this.dataSource.transaction(async (manager) => {
      let user = await manager.findOneBy(User, { email: input.email });
      if (user && (await manager.existsBy(Membership, { userId: user.id, firmId: actor.firmId }))) {
        throw errors.alreadyExists('This person is already in your firm.');
      }
      user ??= await manager.save(manager.create(User, { email: input.email, name: input.name, passwordHash: null }));
      const created = await manager.save(
        manager.create(Membership, { firmId: actor.firmId, userId: user.id, role: input.role, status: 'invited' }),
      );
      created.user = user;
      await recordAudit(manager, actor, { entity: 'membership', entityId: created.id, action: 'invited', after: { email: input.email, role: input.role } });
      await this.auth.sendInvite(manager, actor, created, user);
      return created;
    });
    this.events.publish({ firmId: actor.firmId, type: 'member:invited', id: membership.id });
    return toMemberDto(membership, []);
  }

  async changeRole(actor: Actor, membershipId: string, input: ChangeRoleInput): Promise<MemberDto> {
    requirePermission(actor, 'people:manage');
    const membership = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const target = await scope.lockForUpdate(Membership, membershipId, 'Person');
      assertMayAssign(actor.role, roleSchema.parse(target.role));
      assertMayAssign(actor.role, input.role);
      if (target.role === 'owner' && input.role !== 'owner') await assertAnotherOwner(scope, target.id);
      const before = { role: target.role };
      target.role = input.role;
      await manager.save(target);
      await recordAudit(manager, actor, { entity: 'membership', entityId: target.id, action: 'role-changed', before, after: { role: input.role } });
      target.user = await manager.findOneByOrFail(User, { id: target.userId });
      return target;
    });
    this.events.publish({ firmId: actor.firmId, type: 'member:changed', id: membership.id });
    const crews = await new FirmScope(this.dataSource.manager, actor.firmId).find(CrewMember, { where: { memberId: membership.id } });
    return toMemberDto(membership, crews.map((row) => row.crewId));
  }

  async remove(actor: Actor, membershipId: string): Promise<void> {
    requirePermission(actor, 'people:manage');
    if (membershipId === actor.membershipId) throw errors.conflict('You cannot remove yourself; ask another owner.');
    await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const target = await scope.lockForUpdate(Membership, membershipId, 'Person');
      assertMayAssign(actor.role, roleSchema.parse(target.role));
      if (target.role === 'owner') await assertAnotherOwner(scope, target.id);
      await manager.delete(AuthToken, { membershipId: target.id });
      await manager.delete(Membership, { id: target.id });
      await recordAudit(manager, actor, { entity: 'membership', entityId: target.id, action: 'removed', before: target });
    });
    this.events.publish({ firmId: actor.firmId, type: 'member:removed', id: membershipId });
  }
}

function assertMayAssign(actorRole: Role, role: Role): void {
  if (!assignableRoles(actorRole).includes(role)) throw errors.forbidden(`Your role cannot manage ${role} accounts.`);
}

async function assertAnotherOwner(scope: FirmScope, exceptMembershipId: string): Promise<void> {
  const owners = await scope.find(Membership, { where: { role: 'owner', status: 'active' } });
  if (!owners.some((owner) => owner.id !== exceptMembershipId)) {
    throw errors.conflict('A firm needs at least one owner.');
  }
}

function toMemberDto(membership: Membership, crewIds: string[]): MemberDto {
  return {
    id: membership.id,
    userId: membership.userId,
    name: membership.user.name,
    email: membership.user.email,
    role: roleSchema.parse(membership.role),
    status: membership.status,
    crewIds,
    createdAt: membership.createdAt.toISOString(),
  };
}
