import type { DataSource } from 'typeorm';
import { timeOffRule, timeOffRuleProblem, type TimeOffDto, type TimeOffValues } from '@hodboard/shared';
import { Crew, Membership, TimeOff } from '../entities/index.js';
import { errors } from '../errors.js';
import type { EventBus } from '../lib/event-bus.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { assertVersion, FirmScope } from './firm-scope.js';

export class TimeOffService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly events: EventBus,
  ) {}

  async list(actor: Actor, query: { from?: string; to?: string; crewId?: string }): Promise<TimeOffDto[]> {
    requirePermission(actor, 'crews:read');
    const builder = new FirmScope(this.dataSource.manager, actor.firmId).query(TimeOff, 't').orderBy('t.start_date', 'ASC');
    if (query.crewId) builder.andWhere('(t.crew_id = :crewId OR t.scope = :firm)', { crewId: query.crewId, firm: 'firm' });
    // Repeating entries may reach into the range from before it, so only one-off entries are cut by date.
    if (query.to) builder.andWhere('t.start_date <= :to', { to: query.to });
    if (query.from) builder.andWhere("(t.repeats <> 'none' AND (t.repeat_until IS NULL OR t.repeat_until >= :from) OR t.end_date >= :from)", { from: query.from });
    return (await builder.getMany()).map(toTimeOffDto);
  }

  async create(actor: Actor, input: TimeOffValues): Promise<TimeOffDto> {
    requirePermission(actor, 'crews:manage');
    const entry = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      await assertTargets(scope, input);
      const created = await manager.save(scope.create(TimeOff, { ...normalise(input), rule: ruleFor(input) }));
      await recordAudit(manager, actor, { entity: 'time-off', entityId: created.id, action: 'created', after: created });
      return created;
    });
    this.publish(actor, 'time-off:created', entry);
    return toTimeOffDto(entry);
  }

  async update(actor: Actor, id: string, input: TimeOffValues & { version?: number }): Promise<TimeOffDto> {
    requirePermission(actor, 'crews:manage');
    const { version, ...values } = input;
    const entry = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const existing = await scope.lockForUpdate(TimeOff, id, 'Leave or closure');
      assertVersion(existing, version, 'This entry');
      await assertTargets(scope, values);
      const before = { ...existing };
      const saved = await manager.save(Object.assign(existing, normalise(values), { rule: ruleFor(values) }));
      await recordAudit(manager, actor, { entity: 'time-off', entityId: id, action: 'updated', before, after: saved });
      return saved;
    });
    this.publish(actor, 'time-off:updated', entry);
    return toTimeOffDto(entry);
  }

  async remove(actor: Actor, id: string): Promise<void> {
    requirePermission(actor, 'crews:manage');
    const entry = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const existing = await scope.lockForUpdate(TimeOff, id, 'Leave or closure');
      await manager.delete(TimeOff, { id, firmId: actor.firmId });
      await recordAudit(manager, actor, { entity: 'time-off', entityId: id, action: 'deleted', before: existing });
      return existing;
    });
    this.publish(actor, 'time-off:deleted', entry);
  }

  private publish(actor: Actor, type: string, entry: TimeOff): void {
    this.events.publish({ firmId: actor.firmId, type, id: entry.id, version: entry.version, crewIds: entry.crewId ? [entry.crewId] : [] });
  }
}

function ruleFor(input: TimeOffValues): string {
  const problem = timeOffRuleProblem(input);
  if (problem) throw errors.validation([{ path: 'repeats', message: problem }]);
  return timeOffRule(input);
}

/** Keeps only the target the scope names, so a firm closure never carries a stray crew id. */
function normalise(input: TimeOffValues) {
  return {
    ...input,
    crewId: input.scope === 'crew' ? input.crewId : null,
    memberId: input.scope === 'member' ? input.memberId : null,
    repeatUntil: input.repeats === 'none' ? null : input.repeatUntil,
  };
}

async function assertTargets(scope: FirmScope, input: TimeOffValues): Promise<void> {
  if (input.scope === 'crew' && input.crewId) await scope.get(Crew, input.crewId, 'Crew');
  if (input.scope === 'member' && input.memberId) await scope.get(Membership, input.memberId, 'Person');
}

function toTimeOffDto(entry: TimeOff): TimeOffDto {
  return {
    id: entry.id,
    scope: entry.scope,
    crewId: entry.crewId,
    memberId: entry.memberId,
    label: entry.label,
    startDate: entry.startDate,
    endDate: entry.endDate,
    repeats: entry.repeats,
    repeatUntil: entry.repeatUntil,
    notes: entry.notes,
    rule: entry.rule,
    version: entry.version,
  };
}
