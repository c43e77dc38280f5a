import type { DataSource, EntityManager } from 'typeorm';
import { defaultVatRatePct, type CostingSettings, type CostingSettingsDto } from '@hodboard/shared';
import { CostingSettingsRow } from '../entities/index.js';
import type { EventBus } from '../lib/event-bus.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { assertVersion } from './firm-scope.js';

/**
 * Starting figures for a firm that has not filled in its costing yet. They are placeholders to be
 * replaced with the firm's own; nothing is charged from them until the firm sends a quote.
 */
export const defaultCostingSettings: CostingSettings = {
  runningCosts: [],
  workingDaysPerMonth: 21,
  travelMode: 'bands',
  travelBands: [
    { upToMiles: 10, perDayPence: 1500 },
    { upToMiles: 25, perDayPence: 3000 },
    { upToMiles: 50, perDayPence: 5500 },
  ],
  travelPerMilePence: 45,
  labourRates: [],
  defaultMarginPct: 15,
  vatRegistered: false,
  vatRatePct: defaultVatRatePct,
  quoteValidityDays: 30,
  paymentTerms: 'Balance due within 14 days of completion.',
  depositPct: 0,
  defaultWastePct: 5,
  defaultExclusions: null,
};

export class CostingSettingsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly events: EventBus,
  ) {}

  async get(actor: Actor): Promise<CostingSettingsDto> {
    requirePermission(actor, 'quotes:manage');
    const row = await this.dataSource.manager.findOneBy(CostingSettingsRow, { firmId: actor.firmId });
    return row ? toDto(row) : { ...defaultCostingSettings, version: 0, updatedAt: null };
  }

  /** The settings a price is worked out with, inside the caller's transaction. */
  async settingsFor(manager: EntityManager, firmId: string): Promise<CostingSettings> {
    const row = await manager.findOneBy(CostingSettingsRow, { firmId });
    return row ? toSettings(row) : { ...defaultCostingSettings };
  }

  async update(actor: Actor, input: CostingSettings & { version: number }): Promise<CostingSettingsDto> {
    requirePermission(actor, 'costing:manage');
    const { version, ...values } = input;
    const saved = await this.dataSource.transaction(async (manager) => {
      const existing = await manager.findOne(CostingSettingsRow, { where: { firmId: actor.firmId }, lock: { mode: 'pessimistic_write' } });
      if (!existing) {
        // Version 0 means "never saved": a second first save is stale like any other.
        assertVersion({ version: 0 }, version, 'The costing settings');
        const created = await manager.save(manager.create(CostingSettingsRow, { ...values, firmId: actor.firmId }));
        await recordAudit(manager, actor, { entity: 'costing-settings', entityId: created.id, action: 'created', after: toSettings(created) });
        return created;
      }
      assertVersion(existing, version, 'The costing settings');
      const before = toSettings(existing);
      const updated = await manager.save(Object.assign(existing, values));
      await recordAudit(manager, actor, { entity: 'costing-settings', entityId: updated.id, action: 'updated', before, after: toSettings(updated) });
      return updated;
    });
    this.events.publish({ firmId: actor.firmId, type: 'costing:updated', id: saved.id, version: saved.version });
    return toDto(saved);
  }
}

function toSettings(row: CostingSettingsRow): CostingSettings {
  return {
    runningCosts: row.runningCosts,
    workingDaysPerMonth: row.workingDaysPerMonth,
    travelMode: row.travelMode,
    travelBands: row.travelBands,
    travelPerMilePence: row.travelPerMilePence,
    labourRates: row.labourRates,
    defaultMarginPct: row.defaultMarginPct,
    vatRegistered: row.vatRegistered,
    vatRatePct: row.vatRatePct,
    quoteValidityDays: row.quoteValidityDays,
    paymentTerms: row.paymentTerms,
    depositPct: row.depositPct,
    defaultWastePct: row.defaultWastePct,
    defaultExclusions: row.defaultExclusions,
  };
}

function toDto(row: CostingSettingsRow): CostingSettingsDto {
  return { ...toSettings(row), version: row.version, updatedAt: row.updatedAt.toISOString() };
}
