import type { DataSource } from 'typeorm';
import type { FirmDto, FirmSettings } from '@hodboard/shared';
import { Firm } from '../entities/index.js';
import type { EventBus } from '../lib/event-bus.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { assertVersion } from './firm-scope.js';

export class FirmService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly events: EventBus,
  ) {}

  async get(actor: Actor): Promise<FirmDto> {
    const firm = await this.dataSource.manager.findOneByOrFail(Firm, { id: actor.firmId });
    return toFirmDto(firm);
  }

  async update(actor: Actor, input: FirmSettings & { version?: number }): Promise<FirmDto> {
    requirePermission(actor, 'firm:manage');
    const { version, ...values } = input;
    const firm = await this.dataSource.transaction(async (manager) => {
      const existing = await manager.findOneOrFail(Firm, { where: { id: actor.firmId }, lock: { mode: 'pessimistic_write' } });
      assertVersion(existing, version, 'The firm settings');
      const before = toFirmDto(existing);
      const saved = await manager.save(Object.assign(existing, values));
      await recordAudit(manager, actor, { entity: 'firm', entityId: saved.id, action: 'updated', before, after: toFirmDto(saved) });
      return saved;
    });
    this.events.publish({ firmId: actor.firmId, type: 'firm:updated', id: firm.id, version: firm.version });
    return toFirmDto(firm);
  }
}

function toFirmDto(firm: Firm): FirmDto {
  return {
    id: firm.id,
    name: firm.name,
    email: firm.email,
    phone: firm.phone,
    address: firm.address,
    timeZone: firm.timeZone,
    holidayRegion: firm.holidayRegion,
    workingWeekdays: firm.workingWeekdays,
    dayStart: firm.dayStart,
    dayEnd: firm.dayEnd,
    closures: firm.closures,
    version: firm.version,
  };
}
