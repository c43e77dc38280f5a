import { mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import PrimeVue from 'primevue/config';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { AccessBookingDto, BoardDto } from '@hodboard/shared';

const api = vi.hoisted(() => ({ getBoard: vi.fn(), getBoardChanges: vi.fn() }));
vi.mock('@/api/board', () => api);
const accessApi = vi.hoisted(() => ({ listAccessBookings: vi.fn(), getAccessBooking: vi.fn() }));
vi.mock('@/api/access', () => accessApi);
vi.mock('@/stores/session-store', () => ({ useSessionStore: () => ({ user: { name: 'Dev Okafor' }, hasPermission: () => true }) }));

const { useScheduleStore } = await import('@/stores/schedule-store');
const { useAccessStore } = await import('@/stores/access-store');
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

  it('says in words when the access is up and what it needs, where the grid would draw a band', async () => {
    api.getBoard.mockResolvedValue(board());
    const scaffold: AccessBookingDto = {
      id: 'bk-1', jobIds: ['job-1'], jobReferences: ['J0042'], accessType: 'scaffold', supplierId: 's1', supplierName: 'Lofty Poles Scaffolding',
      state: 'erected', requestedErect: '2027-03-29', requestedStrike: '2027-04-01', confirmedErect: '2027-03-29', confirmedStrike: '2027-04-01',
      neededErect: '2027-03-29', neededStrike: '2027-04-01', weeklyRate: 18_000, minimumWeeks: 1, curingDays: 0, reference: null, notes: null,
      hire: { erect: '2027-03-26', strike: '2027-04-01', hireDays: 6, chargedWeeks: 1, pence: 18_000, pricedWeeks: 1, overPricedPence: 0 },
      inspection: { status: 'overdue', nextDue: '2027-03-26', lastInspectedOn: null, reasons: ['after-assembly'], source: null, adverseDays: [] },
      pendingChange: null, handover: null, hasNoWork: false, cancelledBecause: null, version: 3,
    };
    accessApi.listAccessBookings.mockResolvedValue([scaffold, { ...scaffold, id: 'bk-2', jobIds: ['job-9'] }]);
    await useScheduleStore().load({ from: '2027-03-22', to: '2027-04-04' });
    await useAccessStore().loadAll();
    const wrapper = mount(BoardPhoneList, { props: { today: '2027-03-29' }, global: { plugins: [PrimeVue] } });
    const lines = wrapper.findAll('[data-testid="phone-access"]');
    expect(lines.map((line) => [line.attributes('data-booking-id'), line.text()])).toEqual([
      ['bk-1', 'Scaffold up: up Fri 26 Mar, down Thu 1 Apr · Inspection overdue'],
    ]);
    expect(lines[0]!.classes()).toContain('is-warn');
  });
});
