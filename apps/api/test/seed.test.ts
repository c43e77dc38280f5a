import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { DEMO_SIGN_INS, seedDemoFirm } from '../src/db/demo-firm.js';
import { countRows, testDataSource, truncateAll } from './harness.js';

const TODAY = '2027-03-10';

beforeEach(async () => {
  await truncateAll(await testDataSource());
});
afterAll(async () => {
  await (await testDataSource()).destroy();
});

const total = (counts: Record<string, number>) => Object.values(counts).reduce((sum, n) => sum + n, 0);

describe('demo firm seed', () => {
  it('creates the firm once; a second run changes nothing', async () => {
    const dataSource = await testDataSource();
    expect(await seedDemoFirm(dataSource, TODAY)).toEqual({ created: true });
    const first = await countRows(dataSource);
    expect(first).toMatchObject({
      firm: 1, app_user: DEMO_SIGN_INS.length + 6, crew: 4, client: 12, site: 12, job: 40, quote: 3,
      supplier: 2, access_booking: 5, scaffold_inspection: 3, access_change_request: 0,
    });

    expect(await seedDemoFirm(dataSource, TODAY)).toEqual({ created: false });
    expect(await countRows(dataSource)).toEqual(first);
  });

  it('writes nothing when its last step fails, so the next run builds the whole firm', async () => {
    const dataSource = await testDataSource();
    // Quotes are the seed's last rows: refusing them makes everything before them roll back with them.
    await dataSource.query(`CREATE FUNCTION test_refuse_quote() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN RAISE EXCEPTION 'quote refused by the test'; END $$`);
    await dataSource.query('CREATE TRIGGER test_refuse_quote BEFORE INSERT ON quote FOR EACH ROW EXECUTE FUNCTION test_refuse_quote()');
    try {
      await expect(seedDemoFirm(dataSource, TODAY)).rejects.toThrow(/quote refused by the test/);
    } finally {
      await dataSource.query('DROP TRIGGER IF EXISTS test_refuse_quote ON quote');
      await dataSource.query('DROP FUNCTION IF EXISTS test_refuse_quote()');
    }
    expect(total(await countRows(dataSource))).toBe(0);

    expect(await seedDemoFirm(dataSource, TODAY)).toEqual({ created: true });
    expect(await countRows(dataSource)).toMatchObject({ firm: 1, job: 40, quote: 3 });
  });
});
