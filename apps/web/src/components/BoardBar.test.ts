import { mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import type { BoardAssignmentDto, BoardHoldDayDto } from '@hodboard/shared';
import BoardBar, { type BoardBarColumn } from './BoardBar.vue';

// Thu 25 March 2027, then Good Friday, the weekend and Easter Monday off, then Tue 30 and Wed 31 March.
const assignment: BoardAssignmentDto = {
  id: 'as-1', jobId: 'job-1', crewId: 'crew-1', startDate: '2027-03-25', workingDays: 2, days: ['2027-03-25', '2027-03-31'], version: 3,
};
const columns: BoardBarColumn[] = ['2027-03-25', '2027-03-26', '2027-03-27', '2027-03-28', '2027-03-29', '2027-03-30', '2027-03-31']
  .map((date) => ({ date, isWorked: assignment.days.includes(date) }));
const hold = (date: string, overrides: Partial<BoardHoldDayDto> = {}): BoardHoldDayDto => ({ holdId: 'h1', jobId: 'job-1', date, reason: 'wind', status: 'open', ...overrides });

const mountBar = (holdDays?: BoardHoldDayDto[]) =>
  mount(BoardBar, {
    props: {
      assignment, job: undefined, crewName: 'Gable crew', colour: '#445566', columns, gridColumn: '2 / 9', gridRow: 1, conflicts: [],
      continuesBefore: false, continuesAfter: false, isSaving: false, canEdit: true, holdDays,
    },
  });

describe('BoardBar', () => {
  it('draws no stand-down mark on a job with none', () => {
    const bar = mountBar();
    expect(bar.find('[data-testid="bar-held"]').exists()).toBe(false);
    expect(bar.findAll('.segment.is-held')).toHaveLength(0);
    expect(bar.attributes('aria-label')).not.toContain('stood down');
  });

  it('marks a stood-down day it still books with a hatched segment, a pause icon and the words, and says why in its name', () => {
    const bar = mountBar([hold('2027-03-25')]);
    const segment = bar.get('.segment[data-date="2027-03-25"]');
    expect(segment.classes()).toContain('is-held');
    expect(segment.attributes('data-held')).toBe('wind');
    const flag = bar.get('[data-testid="bar-held"]');
    expect(flag.text()).toBe('Stood down Thu 25');
    expect(flag.find('.pi-pause-circle').exists()).toBe(true);
    expect(bar.attributes('aria-label')).toContain('stood down Thu 25 Mar for wind, waiting for a re-plan');
    expect(bar.attributes('title')).toContain('stood down Thu 25 Mar for wind');
  });

  it('marks a day a re-plan moved the job off, counts the days, and leaves out days outside the bar', () => {
    const bar = mountBar([
      hold('2027-03-30', { status: 'replanned', reason: 'frost-cold' }),
      hold('2027-03-31', { reason: 'other' }),
      hold('2027-04-01'),
    ]);
    expect(bar.findAll('.segment.is-held').map((s) => s.attributes('data-date'))).toEqual(['2027-03-30', '2027-03-31']);
    expect(bar.get('.segment[data-date="2027-03-30"]').classes()).toContain('is-gap');
    expect(bar.get('[data-testid="bar-held"]').text()).toBe('Stood down 2 days');
    const label = bar.attributes('aria-label');
    expect(label).toContain('stood down Tue 30 Mar for frost or cold; stood down Wed 31 Mar for another reason, waiting for a re-plan');
    expect(label).not.toContain('Tue 30 Mar for frost or cold, waiting');
    expect(label).not.toContain('1 Apr');
  });
});
