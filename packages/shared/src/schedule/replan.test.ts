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

  it('never moves a rippled job before its earliest start', () => {
    const target = span({ assignmentId: 'a', days: ['2027-05-04'] });
    const next = span({ assignmentId: 'b', days: ['2027-05-05'], earliestStart: '2027-05-10' });
    const plan = planReplan({ target, heldDates: ['2027-05-04'], mode: 'push-and-ripple', laterOnCrew: [next], calendarFor: () => calendar });
    expect(plan.moves[1]!.toDays).toEqual(['2027-05-10']);
  });

  it("hands the job to another crew from the first day stood down, on that crew's calendar", () => {
    const target = span({ assignmentId: 'a', days: ['2027-05-04', '2027-05-05', '2027-05-06'] });
    const fourDayWeek: WorkCalendar = { ...calendar, weekdays: [1, 2, 3, 4] };
    const plan = planReplan({ target, heldDates: ['2027-05-05'], mode: 'move-crew', toCrewId: 'c2', laterOnCrew: [], calendarFor: (id) => (id === 'c2' ? fourDayWeek : calendar) });
    expect(plan.moves).toEqual([expect.objectContaining({ toCrewId: 'c2', toDays: ['2027-05-05', '2027-05-06', '2027-05-10'] })]);
  });

  it('changes nothing when none of the held days are the job\'s', () => {
    const target = span({ assignmentId: 'a', days: ['2027-05-04'] });
    expect(planReplan({ target, heldDates: ['2027-05-07'], mode: 'push', laterOnCrew: [], calendarFor: () => calendar })).toEqual({ lostWorkingDays: 0, moves: [] });
  });
});
