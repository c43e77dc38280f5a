import type { EntityManager } from 'typeorm';

type Results<T extends readonly (() => Promise<unknown>)[]> = { -readonly [K in keyof T]: Awaited<ReturnType<T[K]>> };

/**
 * Runs independent reads side by side on the pool, or one after another inside a transaction, whose single
 * connection must not be given a second query while one is running.
 */
export async function queriesOf<const T extends readonly (() => Promise<unknown>)[]>(manager: EntityManager, reads: T): Promise<Results<T>> {
  if (!manager.queryRunner) return (await Promise.all(reads.map((read) => read()))) as Results<T>;
  const results: unknown[] = [];
  for (const read of reads) results.push(await read());
  return results as Results<T>;
}
