import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { SCHEDULE_CHANGES_PAGE, type ScheduleEventDto } from '@hodboard/shared';
import { addPerson, createHarness, populateFirm, signIn, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';

// A client coming back online asks for the schedule changes after the last one it applied, page by page.
let h: Harness;
let owner: SignedIn;
let ids: Awaited<ReturnType<typeof populateFirm>>;

beforeEach(async () => {
  h = await createHarness();
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Elm Street Masonry', 'owner@elm.example');
  ids = await populateFirm(h, owner);
});
afterAll(async () => {
  await h.dataSource.destroy();
});

/** Logs `count` schedule events for these crews straight into the table, as many moves would. */
async function logEvents(count: number, crewIds: string[]): Promise<void> {
  await h.dataSource.query(
    `INSERT INTO schedule_event (firm_id, crew_ids, type, payload)
     SELECT $1, $2::uuid[], 'assignment:moved', jsonb_build_object('n', n) FROM generate_series(1, $3) AS n`,
    [owner.session.firm.id, crewIds, count],
  );
}

async function changesAfter(afterEventId: number, who: SignedIn): Promise<ScheduleEventDto[]> {
  const res = await request(h.app).get('/api/board/changes').query({ afterEventId }).set(who.auth).expect(200);
  return res.body as ScheduleEventDto[];
}

/** What a reconnecting client does: asks again after the last change it got for as long as a page comes back full. */
async function allChangesAfter(afterEventId: number, who: SignedIn): Promise<ScheduleEventDto[]> {
  const all: ScheduleEventDto[] = [];
  for (let after = afterEventId; ; ) {
    const page = await changesAfter(after, who);
    all.push(...page);
    if (page.length < SCHEDULE_CHANGES_PAGE) return all;
    after = page.at(-1)!.id;
  }
}

describe('GET /api/board/changes', () => {
  it('answers in full pages in order, so a client that was away a long time can ask again after the last', async () => {
    const start = (await changesAfter(0, owner)).at(-1)?.id ?? 0;
    await logEvents(SCHEDULE_CHANGES_PAGE + 20, [ids.crewId]);
    const first = await changesAfter(start, owner);
    expect(first).toHaveLength(SCHEDULE_CHANGES_PAGE);
    expect(first.map((event) => event.id)).toEqual([...first.map((event) => event.id)].sort((a, b) => a - b));
    const rest = await changesAfter(first.at(-1)!.id, owner);
    expect(rest).toHaveLength(20);
    expect((await allChangesAfter(start, owner)).map((event) => event.id)).toEqual([...first, ...rest].map((event) => event.id));
  });

  it("gives a crew lead every change to their crew even when other crews' changes fill many pages", async () => {
    const otherCrew = await request(h.app).post('/api/crews').set(owner.auth).send({ name: 'Other crew', colour: '#aa3300' }).expect(201);
    await addPerson(h, owner, 'crew-lead', 'lead@elm.example');
    const people = await request(h.app).get('/api/people').set(owner.auth).expect(200);
    const leadMemberId = (people.body as Array<{ id: string; email: string }>).find((p) => p.email === 'lead@elm.example')!.id;
    const crew = await request(h.app).get(`/api/crews/${ids.crewId}`).set(owner.auth).expect(200);
    await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ ...crew.body, leadMemberId }).expect(200);
    const lead = await signIn(h, 'lead@elm.example');
    const start = (await changesAfter(0, owner)).at(-1)?.id ?? 0;

    await logEvents(SCHEDULE_CHANGES_PAGE * 2, [otherCrew.body.id]);
    await logEvents(7, [ids.crewId]);
    await logEvents(3, [otherCrew.body.id, ids.crewId]);

    const seen = await allChangesAfter(start, lead);
    expect(seen).toHaveLength(10);
    expect(seen.map((event) => event.payload)).toEqual([...[1, 2, 3, 4, 5, 6, 7], ...[1, 2, 3]].map((n) => ({ n })));
  });
});
