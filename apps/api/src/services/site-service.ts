import type { DataSource } from 'typeorm';
import { siteInputSchema, type Page, type SiteDto, type SiteListQuery } from '@hodboard/shared';
import type { z } from 'zod';
import { Client, Job, Site } from '../entities/index.js';
import { errors } from '../errors.js';
import type { EventBus } from '../lib/event-bus.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { assertVersion, FirmScope } from './firm-scope.js';
import { paginate } from './paging.js';

type SiteValues = z.output<typeof siteInputSchema>;

export class SiteService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly events: EventBus,
  ) {}

  async list(actor: Actor, query: SiteListQuery): Promise<Page<SiteDto>> {
    requirePermission(actor, 'clients:read');
    const scope = new FirmScope(this.dataSource.manager, actor.firmId);
    const builder = scope.query(Site, 'site').innerJoinAndSelect('site.client', 'client');
    if (query.clientId) builder.andWhere('site.client_id = :clientId', { clientId: query.clientId });
    return paginate(builder, query, {
      sortColumns: { postcode: 'site.postcode', town: 'site.town', addressLine1: 'site.address_line1', createdAt: 'site.created_at' },
      defaultSort: 'postcode',
      searchColumns: ['site.address_line1', 'site.town', 'site.postcode', 'client.name'],
      toDto: toSiteDto,
    });
  }

  async get(actor: Actor, id: string): Promise<SiteDto> {
    requirePermission(actor, 'clients:read');
    const site = await new FirmScope(this.dataSource.manager, actor.firmId)
      .query(Site, 'site')
      .innerJoinAndSelect('site.client', 'client')
      .andWhere('site.id = :id', { id })
      .getOne();
    if (!site) throw errors.notFound('Site');
    return toSiteDto(site);
  }

  async create(actor: Actor, input: SiteValues): Promise<SiteDto> {
    requirePermission(actor, 'clients:manage');
    const site = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      await scope.get(Client, input.clientId, 'Client');
      const created = await manager.save(scope.create(Site, input));
      await recordAudit(manager, actor, { entity: 'site', entityId: created.id, action: 'created', after: created });
      return created;
    });
    this.events.publish({ firmId: actor.firmId, type: 'site:created', id: site.id, version: site.version });
    return this.get(actor, site.id);
  }

  async update(actor: Actor, id: string, input: SiteValues & { version?: number }): Promise<SiteDto> {
    requirePermission(actor, 'clients:manage');
    const { version, ...values } = input;
    const site = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const existing = await scope.lockForUpdate(Site, id, 'Site');
      assertVersion(existing, version, 'This site');
      await scope.get(Client, values.clientId, 'Client');
      const before = { ...existing };
      const saved = await manager.save(Object.assign(existing, values));
      await recordAudit(manager, actor, { entity: 'site', entityId: id, action: 'updated', before, after: saved });
      return saved;
    });
    this.events.publish({ firmId: actor.firmId, type: 'site:updated', id, version: site.version });
    return this.get(actor, id);
  }

  async remove(actor: Actor, id: string): Promise<void> {
    requirePermission(actor, 'clients:manage');
    await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const existing = await scope.lockForUpdate(Site, id, 'Site');
      if (await manager.existsBy(Job, { siteId: id, firmId: actor.firmId })) {
        throw errors.conflict('This site has jobs; it cannot be deleted.');
      }
      await manager.delete(Site, { id, firmId: actor.firmId });
      await recordAudit(manager, actor, { entity: 'site', entityId: id, action: 'deleted', before: existing });
    });
    this.events.publish({ firmId: actor.firmId, type: 'site:deleted', id });
  }
}

export function formatAddress(site: Pick<Site, 'addressLine1' | 'addressLine2' | 'town' | 'postcode'>): string {
  return [site.addressLine1, site.addressLine2, site.town, site.postcode].filter(Boolean).join(', ');
}

function toSiteDto(site: Site): SiteDto {
  return {
    id: site.id,
    clientId: site.clientId,
    clientName: site.client.name,
    addressLine1: site.addressLine1,
    addressLine2: site.addressLine2,
    town: site.town,
    postcode: site.postcode,
    accessNotes: site.accessNotes,
    hazards: site.hazards,
    lat: site.lat,
    lon: site.lon,
    version: site.version,
    createdAt: site.createdAt.toISOString(),
  };
}
