import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { DEMO_SIGN_INS, seedDemoFirm } from '../src/db/demo-firm.js';
import { EventBus } from '../src/lib/event-bus.js';
import { ScheduleService } from '../src/services/schedule-service.js';
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

  it('shows a newcomer a living six weeks: leave, a firm closure, a bank holiday skipped and the deliberate conflicts', async () => {
    const dataSource = await testDataSource();
    await seedDemoFirm(dataSource, TODAY);
    const board = await ownersBoard(dataSource, '2027-03-08', '2027-04-18');

    expect(board.assignments.length).toBeGreaterThanOrEqual(30);
    expect(board.crews).toHaveLength(4);
    expect(board.crews.some((crew) => crew.leave.length > 0)).toBe(true);
    expect(board.crews.some((crew) => crew.memberLeave.length > 0)).toBe(true);
    // Source: GOV.UK, "Bank holidays" (gov.uk/bank-holidays), England and Wales 2027: Good Friday 26 March, Easter
    // Monday 29 March. The training day is the demo firm's own closure.
    expect(board.days.filter((day) => day.offReason && day.offReason !== 'Weekend').map((day) => [day.date, day.offReason])).toEqual([
      ['2027-03-26', 'Good Friday'], ['2027-03-29', 'Easter Monday'], ['2027-04-01', 'Firm training day'],
    ]);
    expect(board.assignments.some((a) => a.days[0]! < '2027-03-26' && a.days.at(-1)! > '2027-03-29' && !a.days.includes('2027-03-26'))).toBe(true);
    expect(new Set(board.conflicts.map((conflict) => conflict.kind))).toEqual(new Set(['double-booked', 'member-on-leave', 'before-earliest-start']));
  });

  it("writes its history in one transaction with no two events at the same moment, so a job's history reads in order", async () => {
    const dataSource = await testDataSource();
    await seedDemoFirm(dataSource, TODAY);
    const [counts] = (await dataSource.query('SELECT COUNT(*)::int AS events, COUNT(DISTINCT at)::int AS moments FROM audit_event')) as Array<{ events: number; moments: number }>;
    expect(counts!.events).toBeGreaterThan(40);
    expect(counts!.moments).toBe(counts!.events);
  });

  it('books a job over the next bank holiday when none falls in the six weeks', async () => {
    const dataSource = await testDataSource();
    // Six weeks from Monday 7 June 2027 hold no bank holiday; the next is the summer one.
    await seedDemoFirm(dataSource, '2027-06-09');
    const board = await ownersBoard(dataSource, '2027-08-23', '2027-09-03');

    // Source: GOV.UK, "Bank holidays" (gov.uk/bank-holidays), England and Wales 2027: summer bank holiday, Monday 30 August.
    expect(board.days.find((day) => day.date === '2027-08-30')?.offReason).toBe('Summer bank holiday');
    expect(board.assignments.map((a) => a.days)).toContainEqual(['2027-08-27', '2027-08-31']);
  });
});

/** The board as the demo owner sees it. */
async function ownersBoard(dataSource: DataSource, from: string, to: string) {
  const [owner] = (await dataSource.query(
    `SELECT m.id, m.user_id, m.firm_id FROM membership m JOIN app_user u ON u.id = m.user_id WHERE u.email = $1`,
    [DEMO_SIGN_INS[0]!.email],
  )) as Array<{ id: string; user_id: string; firm_id: string }>;
  const actor = { userId: owner!.user_id, firmId: owner!.firm_id, membershipId: owner!.id, role: 'owner' as const, crewIds: [] };
  return new ScheduleService(dataSource, new EventBus()).board(actor, { from, to });
}
