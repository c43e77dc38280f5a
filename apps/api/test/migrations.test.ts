import { afterAll, describe, expect, it } from 'vitest';
import { testDataSource } from './harness.js';

afterAll(async () => {
  await (await testDataSource()).destroy();
});

describe('migrations', () => {
  it('build exactly the schema the entities describe', async () => {
    const dataSource = await testDataSource();
    // What `migration:generate` would write: nothing, if every entity change came with its migration.
    const pending = await dataSource.driver.createSchemaBuilder().log();
    expect(pending.upQueries.map((query) => query.query)).toEqual([]);
  });

  it('leave none unapplied', async () => {
    const dataSource = await testDataSource();
    expect(await dataSource.showMigrations()).toBe(false);
  });
});
