import type { ObjectLiteral, SelectQueryBuilder } from 'typeorm';
import type { Page } from '@hodboard/shared';

export interface PageRequest {
  page: number;
  pageSize: number;
  sort?: string;
  order: 'asc' | 'desc';
  q?: string;
}

/**
 * Applies search, sort and paging to a scoped query. `sortColumns` maps the public sort keys to SQL
 * expressions so callers can never inject a column name; `searchColumns` are matched case-insensitively.
 */
export async function paginate<T extends ObjectLiteral, D>(
  query: SelectQueryBuilder<T>,
  request: PageRequest,
  options: { sortColumns: Record<string, string>; defaultSort: string; searchColumns: string[]; toDto: (row: T) => D },
): Promise<Page<D>> {
  if (request.q) {
    const pattern = `%${request.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    const clauses = options.searchColumns.map((column) => `${column} ILIKE :pattern`);
    query.andWhere(`(${clauses.join(' OR ')})`, { pattern });
  }
  const sortColumn = options.sortColumns[request.sort ?? options.defaultSort] ?? options.sortColumns[options.defaultSort]!;
  query
    .orderBy(sortColumn, request.order === 'desc' ? 'DESC' : 'ASC')
    .addOrderBy(`${query.alias}.id`, 'ASC')
    .skip((request.page - 1) * request.pageSize)
    .take(request.pageSize);
  const [rows, total] = await query.getManyAndCount();
  return { items: rows.map(options.toDto), total, page: request.page, pageSize: request.pageSize };
}
