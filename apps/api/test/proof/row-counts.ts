import type { DataSource } from 'typeorm';

/** Every table's row count in one round trip: the fuzz test counts before and after thousands of requests. */
export async function rowCounts(dataSource: DataSource): Promise<Record<string, number>> {
  const tables = dataSource.entityMetadatas.map((meta) => meta.tableName);
  const select = tables.map((table, i) => `(SELECT COUNT(*)::int FROM "${table}") AS c${i}`).join(', ');
  const [row] = (await dataSource.query(`SELECT ${select}`)) as Array<Record<string, number>>;
  return Object.fromEntries(tables.map((table, i) => [table, row![`c${i}`]!]));
}
