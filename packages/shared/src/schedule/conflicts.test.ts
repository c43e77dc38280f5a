import { describe, expect, it } from 'vitest';
import { doubleBookedDays, scheduleConflicts, type PlacedJob } from './conflicts.js';

// Source: the board rules of the job-board issue (common practice, no source): a crew works one job a day;
// a job should not start before its earliest start or finish after its target.
const job = (over: Partial<PlacedJob>): PlacedJob => ({
  assignmentId: 'a1', jobId: 'j1', crewId: 'c1', reference: 'J0001', days: ['2027-03-01', '2027-03-02'],
  earliestStart: null, targetFinish: null, ...over,
});

describe('scheduleConflicts', () => {
  it('flags both jobs on each shared crew-day, and nothing for another crew on the same day', () => {
    const a = job({});
    const b = job({ assignmentId: 'a2', jobId: 'j2', reference: 'J0002', days: ['2027-03-02', '2027-03-03'] });
    const c = job({ assignmentId: 'a3', jobId: 'j3', crewId: 'c2', reference: 'J0003', days: ['2027-03-02'] });
    const found = scheduleConflicts([a, b, c]).filter((x) => x.kind === 'double-booked');
    expect(found.map((x) => [x.assignmentId, x.date])).toEqual([['a1', '2027-03-02'], ['a2', '2027-03-02']]);
    expect(found[0]!.message).toContain('J0002');
  });

  it('flags a start before the earliest start and a finish after the target', () => {
    const kinds = scheduleConflicts([job({ earliestStart: '2027-03-02', targetFinish: '2027-03-01' })]).map((x) => x.kind);
    expect(kinds).toEqual(['before-earliest-start', 'after-target-finish']);
  });

  it('flags each day a crew member is off', () => {
    const found = scheduleConflicts([job({})], [{ crewId: 'c1', date: '2027-03-02', name: 'Nia', label: 'Dentist' }]);
    expect(found).toEqual([expect.objectContaining({ kind: 'member-on-leave', date: '2027-03-02', message: 'Nia is off (Dentist)' })]);
  });

  it('finds the days a candidate move would double-book, ignoring the job itself', () => {
    const placed = [job({}), job({ assignmentId: 'a2', days: ['2027-03-05'] })];
    expect(doubleBookedDays({ assignmentId: 'a1', crewId: 'c1', days: ['2027-03-02', '2027-03-05'] }, placed)).toEqual(['2027-03-05']);
  });
});
