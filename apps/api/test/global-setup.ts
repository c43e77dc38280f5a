import { createDataSource } from '../src/db/data-source.js';

/** Rebuilds the throwaway test schema from the committed migrations, once per run. */
export default async function setup(): Promise<void> {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('API tests need DATABASE_URL pointing at a throwaway database (npm test sets it).');
  if (!/test/i.test(new URL(url).pathname)) throw new Error(`Refusing to reset ${url}: its name must contain "test".`);
  const dataSource = createDataSource(url);
  await dataSource.initialize();
  await dataSource.query('DROP SCHEMA public CASCADE; CREATE SCHEMA public;');
  await dataSource.runMigrations({ transaction: 'each' });
  await dataSource.destroy();
}
