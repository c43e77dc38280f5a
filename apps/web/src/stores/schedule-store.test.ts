import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { SCHEDULE_CHANGES_PAGE, type AssignmentDto, type BoardDto, type BoardJobDto, type ConflictDto, type JobPriority, type ScheduleChangeDto } from '@hodboard/shared';
import { ApiError } from '@/api/http';

const api = vi.hoisted(() => ({
  getBoard: vi.fn(),
  getBoardChanges: vi.fn(),
  placeAssignment: vi.fn(),
  updateAssignment: vi.fn(),
  removeAssignment: vi.fn(),
}));
vi.mock('@/api/board', () => api);
vi.mock('@/stores/session-store', () => ({
  useSessionStore: () => ({ user: { name: 'Dev Okafor' }, hasPermission: () => true }),
}));

const { pendingAssignmentId, useScheduleStore } = await import('./schedule-store');

const crewA = 'aaaaaaaa-0000-4000-8000-000000000001';
const crewB = 'aaaaaaaa-0000-4000-8000-000000000002';

function job(id: string, reference: string, priority: JobPriority = 'normal', status: BoardJobDto['status'] = 'scheduled'): BoardJobDto {
  return {
    id, reference, title: `Job ${reference}`, clientName: 'Marlow Yard', siteAddress: '4 Kiln Row', status,
    estimatedWorkingDays: 3, workTypes: ['brickwork'], accessNeeds: [], earliestStart: null, targetFinish: null, priority, version: 1,
  };
}

function assignment(id: string, jobId: string, crewId: string, days: string[], version = 1): AssignmentDto {
  return { id, jobId, crewId, startDate: days[0]!, workingDays: days.length, days, version, updatedBy: 'Ruth Brindle', updatedAt: '2027-02-20T09:00:00.000Z' };
}

function conflict(assignmentId: string, jobId: string, message: string): ConflictDto {
  return { kind: 'double-booked', assignmentId, jobId, crewId: crewA, date: '2027-03-02', severity: 'warning', message };
}

/** Two weeks from Monday 1 March 2027; weekends off, crew A away on Wednesday 10 March. */
function board(): BoardDto {
  const days = Array.from({ length: 14 }, (_, i) => {
    const date = `2027-03-${String(i + 1).padStart(2, '0')}`;
    const weekday = new Date(`${date}T00:00:00Z`).getUTCDay();
    const isWeekend = weekday === 0 || weekday === 6;
    return { date, isWorkingDay: !isWeekend, offReason: isWeekend ? 'Weekend' : null };
  });
  return {
    from: '2027-03-01', to: '2027-03-14', days,
    crews: [
      { id: crewA, name: 'Stack crew', colour: '#9c4221', leave: [{ date: '2027-03-10', label: 'Training' }], memberLeave: [] },
      { id: crewB, name: 'Wall crew', colour: '#2f6f6a', leave: [], memberLeave: [] },
    ],
    assignments: [
      assignment('as-1', 'job-1', crewA, ['2027-03-01', '2027-03-02', '2027-03-03']),
      assignment('as-2', 'job-2', crewA, ['2027-03-02', '2027-03-03']),
    ],
    jobs: {
      'job-1': job('job-1', 'J0001'), 'job-2': job('job-2', 'J0002'),
      'job-7': job('job-7', 'J0007', 'normal', 'booked'), 'job-9': job('job-9', 'J0009', 'urgent', 'booked'),
    },
    trayJobIds: ['job-9', 'job-7'],
    conflicts: [conflict('as-1', 'job-1', 'Booked twice on Tue'), conflict('as-2', 'job-2', 'Booked twice on Tue')],
    accessBands: [],
    weather: [],
    holdDays: [],
    lastEventId: 40,
  } as BoardDto;
}

function change(overrides: Partial<ScheduleChangeDto> & Pick<ScheduleChangeDto, 'job'>): ScheduleChangeDto {
  return { assignment: null, affectedAssignmentIds: [], conflicts: [], accessBands: [], weather: [], crewIds: [crewA], actorName: 'Ruth Brindle', ...overrides } as ScheduleChangeDto;
}

function stale(current: AssignmentDto): ApiError {
  return new ApiError({ type: 'about:blank', title: 'Conflict', status: 409, code: 'stale-version', current, changedBy: 'Ruth Brindle' });
}

async function loaded() {
  api.getBoard.mockResolvedValueOnce(board());
  const store = useScheduleStore();
  await store.load({ from: '2027-03-01', to: '2027-03-14' });
  return store;
}

beforeEach(() => {
  setActivePinia(createPinia());
  vi.clearAllMocks();
});

describe('applyEvent', () => {
  it('moves the assignment and replaces the conflicts of the assignments the change recomputed', async () => {
    const store = await loaded();
    const moved = assignment('as-2', 'job-2', crewA, ['2027-03-04', '2027-03-05'], 2);

    expect(store.applyEvent(change({ assignment: moved, job: job('job-2', 'J0002'), affectedAssignmentIds: ['as-1', 'as-2'] }), 41)).toBe(true);

    expect(store.assignments['as-2']).toEqual(moved);
    expect(store.conflicts).toEqual([]);
    expect(store.lastEventId).toBe(41);
  });

  it('keeps conflicts of assignments the change did not touch', async () => {
    const store = await loaded();
    const moved = assignment('as-2', 'job-2', crewB, ['2027-03-08'], 2);

    store.applyEvent(change({ assignment: moved, job: job('job-2', 'J0002'), affectedAssignmentIds: ['as-2'] }), 41);

    expect(store.conflicts.map((c) => c.assignmentId)).toEqual(['as-1']);
    expect(store.assignmentsByCrew.get(crewB)?.map((a) => a.id)).toEqual(['as-2']);
  });

  it('takes a recomputed conflict only on the days it shows, as a fresh read of the board would list them', async () => {
    const store = await loaded();
    const moved = assignment('as-2', 'job-2', crewA, ['2027-03-12', '2027-03-15'], 2);
    const onShownDay = { ...conflict('as-2', 'job-2', 'Crew is also booked on J0005 this day'), date: '2027-03-12' };
    const beyond = { ...conflict('as-2', 'job-2', 'Crew is also booked on J0006 this day'), date: '2027-03-15' };
    const undated = { ...conflict('as-2', 'job-2', 'Finishes after the target date'), kind: 'after-target-finish' as const, date: null };

    store.applyEvent(change({ assignment: moved, job: job('job-2', 'J0002'), affectedAssignmentIds: ['as-2'], conflicts: [onShownDay, beyond, undated] }), 41);

    expect(store.conflicts.filter((c) => c.assignmentId === 'as-2')).toEqual([onShownDay, undated]);
  });

  it('ignores an event it has already applied, such as one replayed after a reconnect', async () => {
    const store = await loaded();
    const moved = assignment('as-1', 'job-1', crewA, ['2027-03-08'], 2);

    expect(store.applyEvent(change({ assignment: moved, job: job('job-1', 'J0001') }), 40)).toBe(false);
    expect(store.assignments['as-1']?.days).toEqual(['2027-03-01', '2027-03-02', '2027-03-03']);
  });

  it('does not let a late push of an older version undo a newer one already shown', async () => {
    const store = await loaded();
    store.applyEvent(change({ assignment: assignment('as-1', 'job-1', crewA, ['2027-03-11'], 3), job: job('job-1', 'J0001') }), 42);

    store.applyEvent(change({ assignment: assignment('as-1', 'job-1', crewA, ['2027-03-08'], 2), job: job('job-1', 'J0001') }), 43);

    expect(store.assignments['as-1']?.days).toEqual(['2027-03-11']);
  });

  it('puts a removed job back in the tray where the API would list it: priority first, then reference', async () => {
    const store = await loaded();
    const back = { ...job('job-1', 'J0001'), status: 'booked' as const };

    store.applyEvent(change({ removedAssignmentId: 'as-1', job: back, affectedAssignmentIds: ['as-1', 'as-2'] }), 41);

    expect(store.assignments['as-1']).toBeUndefined();
    expect(store.trayJobIds).toEqual(['job-9', 'job-1', 'job-7']);
  });

  it('takes a placed job out of the tray and drops a move that leaves the days shown', async () => {
    const store = await loaded();
    store.applyEvent(change({ assignment: assignment('as-9', 'job-9', crewB, ['2027-03-03']), job: job('job-9', 'J0009', 'urgent') }), 41);
    store.applyEvent(change({ assignment: assignment('as-1', 'job-1', crewA, ['2027-04-05'], 2), job: job('job-1', 'J0001') }), 42);

    expect(store.trayJobIds).toEqual(['job-7']);
    expect(store.assignments['as-9']?.crewId).toBe(crewB);
    expect(store.assignments['as-1']).toBeUndefined();
  });
});

describe('conflict groups', () => {
  it('reads a clash reported on several days once, with its days, and counts it once', async () => {
    api.getBoard.mockResolvedValueOnce({
      ...board(),
      conflicts: [
        { ...conflict('as-1', 'job-1', 'Crew is also booked on J0002 this day'), date: '2027-03-03' },
        { ...conflict('as-1', 'job-1', 'Crew is also booked on J0002 this day'), date: '2027-03-02' },
        { ...conflict('as-1', 'job-1', 'Ana is off (Holiday)'), kind: 'member-on-leave', date: '2027-03-02' },
      ],
    });
    const store = useScheduleStore();
    await store.load({ from: '2027-03-01', to: '2027-03-14' });

    expect(store.conflictGroups.get('as-1')?.map((g) => [g.kind, g.dates])).toEqual([
      ['double-booked', ['2027-03-02', '2027-03-03']],
      ['member-on-leave', ['2027-03-02']],
    ]);
    expect(store.conflictCounts).toEqual({ 'double-booked': 1, 'member-on-leave': 1 });
  });
});

describe('working days on the visible calendar', () => {
  it('skips the weekend and the crew leave when it predicts a span', async () => {
    const store = await loaded();
    expect(store.predictSpan(crewA, '2027-03-04', 3)).toEqual(['2027-03-04', '2027-03-05', '2027-03-08']);
    expect(store.predictSpan(crewA, '2027-03-09', 2)).toEqual(['2027-03-09', '2027-03-11']);
    expect(store.predictSpan(crewB, '2027-03-09', 2)).toEqual(['2027-03-09', '2027-03-10']);
  });

  it('counts working days between two dates for a resize', async () => {
    const store = await loaded();
    expect(store.countWorkingDays(crewA, '2027-03-04', '2027-03-08')).toBe(3);
    expect(store.countWorkingDays(crewA, '2027-03-08', '2027-03-12')).toBe(4);
  });
});

describe('optimistic changes', () => {
  it('shows a move at once and keeps the server answer', async () => {
    const store = await loaded();
    let resolve!: (value: ScheduleChangeDto) => void;
    api.updateAssignment.mockReturnValueOnce(new Promise((r) => (resolve = r)));

    const saving = store.move('as-2', { crewId: crewA, startDate: '2027-03-05', workingDays: 2 });
    expect(store.assignments['as-2']?.days).toEqual(['2027-03-05', '2027-03-08']);
    expect(store.savingIds.has('as-2')).toBe(true);
    expect(api.updateAssignment).toHaveBeenCalledWith('as-2', { crewId: crewA, startDate: '2027-03-05', workingDays: 2, version: 1, confirmDoubleBooking: false });

    resolve(change({ assignment: assignment('as-2', 'job-2', crewA, ['2027-03-05', '2027-03-08'], 2), job: job('job-2', 'J0002') }));
    await saving;
    expect(store.assignments['as-2']?.version).toBe(2);
    expect(store.savingIds.has('as-2')).toBe(false);
  });

  it('rolls a failed move back to where it was', async () => {
    const store = await loaded();
    api.updateAssignment.mockRejectedValueOnce(new ApiError({ type: 'about:blank', title: 'Error', status: 500, code: 'internal' }));

    await expect(store.move('as-2', { crewId: crewB, startDate: '2027-03-09', workingDays: 2 })).rejects.toBeInstanceOf(ApiError);

    expect(store.assignments['as-2']).toEqual(board().assignments[1]);
  });

  it('shows the server copy when someone else changed the job first', async () => {
    const store = await loaded();
    const theirs = assignment('as-2', 'job-2', crewB, ['2027-03-12'], 4);
    api.updateAssignment.mockRejectedValueOnce(stale(theirs));

    await expect(store.move('as-2', { crewId: crewA, startDate: '2027-03-09', workingDays: 2 })).rejects.toMatchObject({ code: 'stale-version' });

    expect(store.assignments['as-2']).toEqual(theirs);
  });

  it('returns a job to its place in the tray when placing it fails', async () => {
    const store = await loaded();
    api.placeAssignment.mockRejectedValueOnce(new ApiError({ type: 'about:blank', title: 'Conflict', status: 409, code: 'needs-confirmation' }));

    const saving = store.place('job-9', crewB, '2027-03-04');
    expect(store.trayJobIds).toEqual(['job-7']);
    expect(store.assignments[pendingAssignmentId('job-9')]?.days).toEqual(['2027-03-04', '2027-03-05', '2027-03-08']);
    await expect(saving).rejects.toMatchObject({ code: 'needs-confirmation' });

    expect(store.trayJobIds).toEqual(['job-9', 'job-7']);
    expect(store.assignments[pendingAssignmentId('job-9')]).toBeUndefined();
  });

  it('puts an assignment back on the board when taking it off fails', async () => {
    const store = await loaded();
    api.removeAssignment.mockRejectedValueOnce(new ApiError({ type: 'about:blank', title: 'Error', status: 503, code: 'service-unavailable' }));

    const saving = store.unschedule('as-1');
    expect(store.assignments['as-1']).toBeUndefined();
    expect(store.trayJobIds).toContain('job-1');
    await expect(saving).rejects.toBeInstanceOf(ApiError);

    expect(store.assignments['as-1']).toEqual(board().assignments[0]);
    expect(store.trayJobIds).toEqual(['job-9', 'job-7']);
    expect(api.removeAssignment).toHaveBeenCalledWith('as-1', 1);
  });
});

describe('catchUp', () => {
  it('does not let a board read from before a change it has shown undo that change', async () => {
    const store = await loaded();
    const moved = change({ assignment: assignment('as-1', 'job-1', crewA, ['2027-03-09'], 2), job: job('job-1', 'J0001') });
    store.applyEvent(moved, 41);
    api.getBoard.mockResolvedValueOnce(board());
    api.getBoardChanges.mockResolvedValueOnce([{ id: 41, type: 'assignment:moved', payload: moved }]);

    await store.reload();

    expect(api.getBoardChanges).toHaveBeenCalledWith(40);
    expect(store.assignments['as-1']?.days).toEqual(['2027-03-09']);
    expect(store.lastEventId).toBe(41);
  });

  it('replays the changes made after the last event the board applied', async () => {
    const store = await loaded();
    api.getBoardChanges.mockResolvedValueOnce([
      { id: 41, type: 'assignment:moved', payload: change({ assignment: assignment('as-1', 'job-1', crewA, ['2027-03-09'], 2), job: job('job-1', 'J0001') }) },
      { id: 42, type: 'assignment:moved', payload: change({ assignment: assignment('as-1', 'job-1', crewA, ['2027-03-11'], 3), job: job('job-1', 'J0001') }) },
    ]);

    await store.catchUp();

    expect(api.getBoardChanges).toHaveBeenCalledWith(40);
    expect(store.assignments['as-1']?.days).toEqual(['2027-03-11']);
    expect(store.lastEventId).toBe(42);
  });

  it('keeps asking after the last change while the answers come back as full pages', async () => {
    const store = await loaded();
    const moveTo = (id: number, day: string) => ({
      id, type: 'assignment:moved', payload: change({ assignment: assignment('as-1', 'job-1', crewA, [day], id), job: job('job-1', 'J0001') }),
    });
    const fullPage = Array.from({ length: SCHEDULE_CHANGES_PAGE }, (_, i) => moveTo(41 + i, '2027-03-09'));
    const lastOfPage = 40 + SCHEDULE_CHANGES_PAGE;
    api.getBoardChanges.mockResolvedValueOnce(fullPage).mockResolvedValueOnce([moveTo(lastOfPage + 1, '2027-03-12')]);

    await store.catchUp();

    expect(api.getBoardChanges.mock.calls).toEqual([[40], [lastOfPage]]);
    expect(store.assignments['as-1']?.days).toEqual(['2027-03-12']);
    expect(store.lastEventId).toBe(lastOfPage + 1);
  });
});
