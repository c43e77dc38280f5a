import { mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import PrimeVue from 'primevue/config';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { BoardDto } from '@hodboard/shared';

const api = vi.hoisted(() => ({ getBoard: vi.fn(), getBoardChanges: vi.fn() }));
vi.mock('@/api/board', () => api);
vi.mock('@/stores/session-store', () => ({ useSessionStore: () => ({ user: { name: 'Dev Okafor' }, hasPermission: () => true }) }));

const { useScheduleStore } = await import('@/stores/schedule-store');
const { default: BoardPhoneList } = await import('./BoardPhoneList.vue');

function board(): BoardDto {
  return {
    from: '2027-03-22', to: '2027-04-04', days: [],
    crews: [{ id: 'crew-1', name: 'Gable crew', colour: '#445566', leave: [], memberLeave: [] }],
    assignments: [{ id: 'as-1', jobId: 'job-1', crewId: 'crew-1', startDate: '2027-03-30', workingDays: 2, days: ['2027-03-30', '2027-03-31'], version: 2 }],
    jobs: {
      'job-1': {
        id: 'job-1', reference: 'J0042', title: 'Rebuild chimney stack', clientName: 'Marsh End Farm', siteAddress: '2 Sheepwash Lane', status: 'scheduled',
        estimatedWorkingDays: 2, workTypes: ['chimney'], accessNeeds: ['scaffold'], earliestStart: null, targetFinish: null, priority: 'normal', version: 4,
      },
    },
    trayJobIds: [], conflicts: [], accessBands: [], weather: [],
    holdDays: [
      { holdId: 'h2', jobId: 'job-1', date: '2027-03-31', reason: 'rain', status: 'open' },
      { holdId: 'h1', jobId: 'job-1', date: '2027-03-25', reason: 'wind', status: 'replanned' },
    ],
    lastEventId: 7,
  };
}

describe('BoardPhoneList', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    api.getBoard.mockReset();
  });

  it('lists each stood-down day of a job under its card, including one a re-plan moved it off, with why', async () => {
    api.getBoard.mockResolvedValue(board());
    const store = useScheduleStore();
    await store.load({ from: '2027-03-22', to: '2027-04-04' });
    const wrapper = mount(BoardPhoneList, { props: { today: '2027-03-24' }, global: { plugins: [PrimeVue] } });
    const held = wrapper.findAll('[data-testid="phone-held"]');
    expect(held.map((item) => [item.attributes('data-date'), item.text()])).toEqual([
      ['2027-03-25', 'Stood down Thu 25 Mar for wind'],
      ['2027-03-31', 'Stood down Wed 31 Mar for rain, waiting for a re-plan'],
    ]);
    expect(held[0]!.find('.pi-pause-circle').exists()).toBe(true);
  });
});
