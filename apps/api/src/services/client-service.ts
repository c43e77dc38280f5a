import type { DataSource } from 'typeorm';
import { clientInputSchema, type ClientDto, type ClientListQuery, type Page } from '@hodboard/shared';
import type { z } from 'zod';
import { Client, Job, Site } from '../entities/index.js';
import { errors } from '../errors.js';
import type { EventBus } from '../lib/event-bus.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { assertVersion, FirmScope } from './firm-scope.js';
import { paginate } from './paging.js';

type ClientValues = z.output<typeof clientInputSchema>;

// The sort key 'email' is the main (first) contact's address.
const MAIN_CONTACT_EMAIL = "client.contacts -> 0 ->> 'email'";
// Every contact's name, role, e-mail and phone as one text to search, one line per field so a search cannot span two.
const CONTACT_TEXT = `(SELECT string_agg(concat_ws(E'\\n', c ->> 'name', c ->> 'role', c ->> 'email', c ->> 'phone'), E'\\n')
  FROM jsonb_array_elements(client.contacts) AS c)`;

export class ClientService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly events: EventBus,
  ) {}

  async list(actor: Actor, query: ClientListQuery): Promise<Page<ClientDto>> {
    requirePermission(actor, 'clients:read');
    const scope = new FirmScope(this.dataSource.manager, actor.firmId);
    const page = await paginate(scope.query(Client, 'client'), query, {
      sortColumns: { name: 'client.name', createdAt: 'client.created_at', email: MAIN_CONTACT_EMAIL },
      defaultSort: 'name',
      searchColumns: ['client.name', CONTACT_TEXT],
      toDto: (client) => client,
    });
    const counts = await this.siteCounts(actor.firmId, page.items.map((client) => client.id));
    return { ...page, items: page.items.map((client) => toClientDto(client, counts.get(client.id) ?? 0)) };
  }

  async get(actor: Actor, id: string): Promise<ClientDto> {
    requirePermission(actor, 'clients:read');
    const client = await new FirmScope(this.dataSource.manager, actor.firmId).get(Client, id, 'Client');
    const counts = await this.siteCounts(actor.firmId, [id]);
    return toClientDto(client, counts.get(id) ?? 0);
  }

  async create(actor: Actor, input: ClientValues): Promise<ClientDto> {
    requirePermission(actor, 'clients:manage');
    const client = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const created = await manager.save(scope.create(Client, input));
      await recordAudit(manager, actor, { entity: 'client', entityId: created.id, action: 'created', after: created });
      return created;
    });
    this.events.publish({ firmId: actor.firmId, type: 'client:created', id: client.id, version: client.version });
    return toClientDto(client, 0);
  }

  async update(actor: Actor, id: string, input: ClientValues & { version?: number }): Promise<ClientDto> {
    requirePermission(actor, 'clients:manage');
    const { version, ...values } = input;
    const client = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const existing = await scope.lockForUpdate(Client, id, 'Client');
      assertVersion(existing, version, 'This client');
      const before = { ...existing };
      const saved = await manager.save(Object.assign(existing, values));
      await recordAudit(manager, actor, { entity: 'client', entityId: id, action: 'updated', before, after: saved });
      return saved;
    });
    this.events.publish({ firmId: actor.firmId, type: 'client:updated', id, version: client.version });
    return this.get(actor, id);
  }

  async remove(actor: Actor, id: string): Promise<void> {
    requirePermission(actor, 'clients:manage');
    await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const existing = await scope.lockForUpdate(Client, id, 'Client');
      if (await manager.existsBy(Job, { clientId: id, firmId: actor.firmId })) {
        throw errors.conflict('This client has jobs; cancel or move them before deleting the client.');
      }
      await manager.delete(Site, { clientId: id, firmId: actor.firmId });
      await manager.delete(Client, { id, firmId: actor.firmId });
      await recordAudit(manager, actor, { entity: 'client', entityId: id, action: 'deleted', before: existing });
    });
    this.events.publish({ firmId: actor.firmId, type: 'client:deleted', id });
  }

  private async siteCounts(firmId: string, clientIds: string[]): Promise<Map<string, number>> {
    if (clientIds.length === 0) return new Map();
    const rows = await new FirmScope(this.dataSource.manager, firmId)
      .query(Site, 'site')
      .select('site.client_id', 'clientId')
      .addSelect('COUNT(*)::int', 'count')
      .andWhere('site.client_id IN (:...ids)', { ids: clientIds })
      .groupBy('site.client_id')
      .getRawMany<{ clientId: string; count: number }>();
    return new Map(rows.map((row) => [row.clientId, row.count]));
  }
}

function toClientDto(client: Client, siteCount: number): ClientDto {
  return {
    id: client.id,
    name: client.name,
    contacts: client.contacts.map((contact) => ({ name: contact.name, role: contact.role, email: contact.email, phone: contact.phone })),
    notes: client.notes,
    siteCount,
    version: client.version,
    createdAt: client.createdAt.toISOString(),
  };
}
