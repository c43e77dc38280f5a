import { In, type EntityManager, type EntityTarget, type FindManyOptions, type FindOptionsWhere, type ObjectLiteral, type SelectQueryBuilder } from 'typeorm';
import { errors } from '../errors.js';

type FirmOwned = ObjectLiteral & { id: string; firmId: string };

/**
 * The one path to firm-owned rows. Every read and write made through it carries the caller's firm id,
 * so a service cannot forget the tenant: another firm's id simply is not found.
 */
export class FirmScope {
  constructor(
    readonly manager: EntityManager,
    readonly firmId: string,
  ) {}

  withManager(manager: EntityManager): FirmScope {
    return new FirmScope(manager, this.firmId);
  }

  async get<T extends FirmOwned>(entity: EntityTarget<T>, id: string, what: string): Promise<T> {
    const row = await this.manager.findOne(entity, { where: { id, firmId: this.firmId } as FindOptionsWhere<T> });
    if (!row) throw errors.notFound(what);
    return row;
  }

  async lockForUpdate<T extends FirmOwned>(entity: EntityTarget<T>, id: string, what: string): Promise<T> {
    const row = await this.manager.findOne(entity, {
      where: { id, firmId: this.firmId } as FindOptionsWhere<T>,
      lock: { mode: 'pessimistic_write' },
    });
    if (!row) throw errors.notFound(what);
    return row;
  }

  /** Several rows locked in one statement, in id order so two writers never wait on each other crosswise. */
  async lockAllForUpdate<T extends FirmOwned & { id: string }>(entity: EntityTarget<T>, ids: string[], what: string): Promise<Map<string, T>> {
    const unique = [...new Set(ids)].sort();
    if (unique.length === 0) return new Map();
    const rows = await this.manager.find(entity, {
      where: { id: In(unique), firmId: this.firmId } as FindOptionsWhere<T>,
      order: { id: 'ASC' } as FindManyOptions<T>['order'],
      lock: { mode: 'pessimistic_write' },
    });
    if (rows.length !== unique.length) throw errors.notFound(what);
    return new Map(rows.map((row) => [row.id, row]));
  }

  find<T extends FirmOwned>(entity: EntityTarget<T>, options: FindManyOptions<T> = {}): Promise<T[]> {
    const where = options.where;
    const scoped = Array.isArray(where)
      ? where.map((clause) => ({ ...clause, firmId: this.firmId }))
      : { ...(where ?? {}), firmId: this.firmId };
    return this.manager.find(entity, { ...options, where: scoped as FindOptionsWhere<T> });
  }

  /** Ids that are not all in this firm are reported as not found, naming the first missing one's kind. */
  async assertAllExist<T extends FirmOwned>(entity: EntityTarget<T>, ids: string[], what: string): Promise<void> {
    const unique = [...new Set(ids)];
    if (unique.length === 0) return;
    const count = await this.manager
      .createQueryBuilder(entity, 'row')
      .where('row.firm_id = :firmId', { firmId: this.firmId })
      .andWhere('row.id IN (:...ids)', { ids: unique })
      .getCount();
    if (count !== unique.length) throw errors.notFound(what);
  }

  query<T extends FirmOwned>(entity: EntityTarget<T>, alias: string): SelectQueryBuilder<T> {
    return this.manager.createQueryBuilder(entity, alias).where(`${alias}.firm_id = :firmId`, { firmId: this.firmId });
  }

  create<T extends FirmOwned>(entity: EntityTarget<T>, values: Omit<Partial<T>, 'firmId'>): T {
    return this.manager.create(entity, { ...values, firmId: this.firmId } as unknown as T);
  }
}

export function assertVersion(current: { version: number }, expected: number | undefined, what: string): void {
  if (expected !== undefined && expected !== current.version) throw errors.staleVersion(what);
}
