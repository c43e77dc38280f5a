import { describe, expect, it } from 'vitest';
import { defaultWorkCalendar, type WorkCalendar } from '../rules/index.js';
import { planReplan, type PlacedSpan } from './replan.js';

// Source: gov.uk bank holidays, England and Wales 2027: Good Friday 26 March, Easter Monday 29 March.
const calendar: WorkCalendar = defaultWorkCalendar;
const span = (over: Partial<PlacedSpan> & Pick<PlacedSpan, 'assignmentId' | 'days'>): PlacedSpan => ({
  jobId: `job-${over.assignmentId}`, crewId: 'c1', startDate: over.days[0]!, workingDays: over.days.length, earliestStart: null, ...over,
});

describe('planReplan', () => {
  it('pushes a job stood down on its first day by one working day, over the Easter weekend', () => {
    const target = span({ assignmentId: 'a', days: ['2027-03-25', '2027-03-30'] });
    const plan = planReplan({ target, heldDates: ['2027-03-25'], mode: 'push', laterOnCrew: [], calendarFor: () => calendar });
    expect(plan.lostWorkingDays).toBe(1);
    expect(plan.moves).toEqual([expect.objectContaining({ assignmentId: 'a', toDays: ['2027-03-30', '2027-03-31'] })]);
  });

  it("ripples the crew's next job only as far as it now overlaps, and leaves a job after a gap alone", () => {
    const target = span({ assignmentId: 'a', days: ['2027-03-22', '2027-03-23'] });
    const next = span({ assignmentId: 'b', days: ['2027-03-24', '2027-03-25'] });
    const later = span({ assignmentId: 'c', days: ['2027-04-12'] });
    const plan = planReplan({ target, heldDates: ['2027-03-22', '2027-03-23'], mode: 'push-and-ripple', laterOnCrew: [later, next], calendarFor: () => calendar });
    expect(plan.moves.map((m) => [m.assignmentId, m.toDays])).toEqual([
      ['a', ['2027-03-24', '2027-03-25']],
      ['b', ['2027-03-30', '2027-03-31']],
    ]);
  });

  it('leaves a double-booked job where it is instead of queuing it behind the other, and moves the job after them one day', () => {
    // b and c were already booked on the same days (the board shows that as a conflict); d follows them. a's end does not
    // reach c, which still overlaps b as much as before; b's new end runs into d.
    const target = span({ assignmentId: 'a', days: ['2027-04-12', '2027-04-13'] });
    const b = span({ assignmentId: 'b', days: ['2027-04-14', '2027-04-15', '2027-04-16'] });
    const c = span({ assignmentId: 'c', days: ['2027-04-15', '2027-04-16'] });
    const d = span({ assignmentId: 'd', days: ['2027-04-19'] });
    const plan = planReplan({ target, heldDates: ['2027-04-13'], mode: 'push-and-ripple', laterOnCrew: [d, c, b], calendarFor: () => calendar });
    expect(plan.moves.map((m) => [m.assignmentId, m.toDays])).toEqual([
      ['a', ['2027-04-12', '2027-04-13', '2027-04-14']],
      ['b', ['2027-04-15', '2027-04-16', '2027-04-19']],
      ['d', ['2027-04-20']],
    ]);
  });

  it('never moves a rippled job before its earliest start', () => {
    const target = span({ assignmentId: 'a', days: ['2027-05-04'] });
    const next = span({ assignmentId: 'b', days: ['2027-05-05'], earliestStart: '2027-05-10' });
    const plan = planReplan({ target, heldDates: ['2027-05-04'], mode: 'push-and-ripple', laterOnCrew: [next], calendarFor: () => calendar });
    expect(plan.moves[1]!.toDays).toEqual(['2027-05-10']);
  });

  it("hands another crew the job from its first day stood down, on that crew's calendar", () => {
    // Source: gov.uk bank holidays, England and Wales 2027: no bank holiday between 4 and 10 May (early May is Monday 3 May).
    const target = span({ assignmentId: 'a', days: ['2027-05-04', '2027-05-05', '2027-05-06'] });
    const fourDayWeek: WorkCalendar = { ...calendar, weekdays: [1, 2, 3, 4] };
    const plan = planReplan({ target, heldDates: ['2027-05-04'], mode: 'move-crew', toCrewId: 'c2', laterOnCrew: [], calendarFor: (id) => (id === 'c2' ? fourDayWeek : calendar) });
    expect(plan.moves).toEqual([expect.objectContaining({ toCrewId: 'c2', toDays: ['2027-05-04', '2027-05-05', '2027-05-06'], workingDays: 3 })]);
    const later = planReplan({ target: span({ assignmentId: 'a', days: ['2027-05-05', '2027-05-06', '2027-05-07'] }), heldDates: ['2027-05-05'], mode: 'move-crew', toCrewId: 'c2', laterOnCrew: [], calendarFor: (id) => (id === 'c2' ? fourDayWeek : calendar) });
    // Friday 7 May is not one of the four-day crew's days, so its third day is Monday 10 May.
    expect(later.moves[0]!.toDays).toEqual(['2027-05-05', '2027-05-06', '2027-05-10']);
  });

  it('changes nothing when none of the held days are the job\'s', () => {
    const target = span({ assignmentId: 'a', days: ['2027-05-04'] });
    expect(planReplan({ target, heldDates: ['2027-05-07'], mode: 'push', laterOnCrew: [], calendarFor: () => calendar }))
      .toEqual({ lostWorkingDays: 0, moves: [], workedDays: [], requestedStart: null, blockedBy: [] });
  });
});

// A five-day job, Monday 24 to Friday 28 May 2027, stood down on its third day, Wednesday 26 May.
// Source: gov.uk bank holidays, England and Wales 2027: Spring bank holiday Monday 31 May; no other until 30 August.
describe('planReplan, stood down in the middle of a job', () => {
  const week = ['2027-05-24', '2027-05-25', '2027-05-26', '2027-05-27', '2027-05-28'];
  const target = span({ assignmentId: 'a', days: week });
  const held = ['2027-05-26'];

  it('keeps the start and the days worked, keeps the held day inside the span and adds one working day at the end, after the bank holiday', () => {
    const plan = planReplan({ target, heldDates: held, mode: 'push', laterOnCrew: [], calendarFor: () => calendar });
    expect(plan.lostWorkingDays).toBe(1);
    expect(plan.moves).toEqual([expect.objectContaining({
      assignmentId: 'a', startDate: '2027-05-24', workingDays: 6,
      toDays: ['2027-05-24', '2027-05-25', '2027-05-26', '2027-05-27', '2027-05-28', '2027-06-01'],
    })]);
  });

  it('pushes the start past held days at the front and lengthens the span for a held day further in', () => {
    // Held Monday 24 and Wednesday 26: the job starts Tuesday 25, and its five days of work end on Wednesday 2 June.
    const plan = planReplan({ target, heldDates: ['2027-05-24', '2027-05-26'], mode: 'push', laterOnCrew: [], calendarFor: () => calendar });
    expect(plan.lostWorkingDays).toBe(2);
    expect(plan.moves[0]).toMatchObject({ startDate: '2027-05-25', workingDays: 6, toDays: ['2027-05-25', '2027-05-26', '2027-05-27', '2027-05-28', '2027-06-01', '2027-06-02'] });
  });

  it("ripples the crew's next job past the new end, over the bank holiday, and leaves a job after the gap alone", () => {
    const next = span({ assignmentId: 'b', days: ['2027-06-01', '2027-06-02'] });
    const afterGap = span({ assignmentId: 'c', days: ['2027-06-04'] });
    const plan = planReplan({ target, heldDates: held, mode: 'push-and-ripple', laterOnCrew: [afterGap, next], calendarFor: () => calendar });
    expect(plan.moves.map((m) => [m.assignmentId, m.toDays])).toEqual([
      ['a', ['2027-05-24', '2027-05-25', '2027-05-26', '2027-05-27', '2027-05-28', '2027-06-01']],
      ['b', ['2027-06-02', '2027-06-03']],
    ]);
  });

  it("ripples across the crew's leave", () => {
    // The crew is off on Thursday 3 June, so the next job's second day is Friday 4 June and the job after it moves on.
    const onLeave: WorkCalendar = { ...calendar, leave: ['DTSTART:20270603\nRRULE:FREQ=DAILY;COUNT=1'] };
    const next = span({ assignmentId: 'b', days: ['2027-06-01', '2027-06-02'] });
    const third = span({ assignmentId: 'c', days: ['2027-06-04'] });
    const plan = planReplan({ target, heldDates: held, mode: 'push-and-ripple', laterOnCrew: [next, third], calendarFor: () => onLeave });
    expect(plan.moves.map((m) => [m.assignmentId, m.toDays])).toEqual([
      ['a', ['2027-05-24', '2027-05-25', '2027-05-26', '2027-05-27', '2027-05-28', '2027-06-01']],
      ['b', ['2027-06-02', '2027-06-04']],
      ['c', ['2027-06-07']],
    ]);
  });

  it('gives the receiving crew only the three days left, from the day stood down, and keeps the two days worked in history', () => {
    const plan = planReplan({ target, heldDates: held, mode: 'move-crew', toCrewId: 'c2', laterOnCrew: [], calendarFor: () => calendar });
    expect(plan.workedDays).toEqual(['2027-05-24', '2027-05-25']);
    expect(plan.moves).toEqual([expect.objectContaining({
      assignmentId: 'a', fromCrewId: 'c1', toCrewId: 'c2', startDate: '2027-05-26', workingDays: 3, toDays: ['2027-05-26', '2027-05-27', '2027-05-28'],
    })]);
  });

  it("starts after the receiving crew's job already under way and ripples that crew's later jobs over the bank holiday", () => {
    const underWay = span({ assignmentId: 'x', crewId: 'c2', days: ['2027-05-25', '2027-05-26'] });
    const booked = span({ assignmentId: 'y', crewId: 'c2', days: ['2027-05-28'] });
    const clear = span({ assignmentId: 'z', crewId: 'c2', days: ['2027-06-10'] });
    const plan = planReplan({
      target, heldDates: held, mode: 'move-crew', toCrewId: 'c2', startDate: '2027-05-26', laterOnCrew: [],
      onReceivingCrew: [clear, booked, underWay], calendarFor: () => calendar,
    });
    expect(plan).toMatchObject({ requestedStart: '2027-05-26', blockedBy: ['x'] });
    expect(plan.moves.map((m) => [m.assignmentId, m.toCrewId, m.toDays])).toEqual([
      ['a', 'c2', ['2027-05-27', '2027-05-28', '2027-06-01']],
      ['y', 'c2', ['2027-06-02']],
    ]);
  });

  it('changes nothing with mode none but still counts the day lost', () => {
    expect(planReplan({ target, heldDates: held, mode: 'none', laterOnCrew: [], calendarFor: () => calendar })).toMatchObject({ lostWorkingDays: 1, moves: [] });
  });
});
