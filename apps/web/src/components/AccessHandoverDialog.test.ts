import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { createPinia, setActivePinia } from 'pinia';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { AccessBookingDto } from '@hodboard/shared';
import { ApiError } from '@/api/http';

const api = vi.hoisted(() => ({ changeAccessState: vi.fn(), recordHandover: vi.fn(), getAccessBooking: vi.fn(), listAccessBookings: vi.fn() }));
const toast = vi.hoisted(() => ({ showProblem: vi.fn(), showSaved: vi.fn() }));
vi.mock('@/api/access', () => api);
vi.mock('@/composables/use-problem-toast', () => ({ useProblemToast: () => toast }));

const { default: AccessHandoverDialog } = await import('./AccessHandoverDialog.vue');
const { useAccessStore } = await import('@/stores/access-store');

function booking(overrides: Partial<AccessBookingDto> = {}): AccessBookingDto {
  return {
    id: 'b1', jobIds: ['j1'], jobReferences: ['J-0107'], accessType: 'scaffold', supplierId: 's1', supplierName: 'Lofty Poles Scaffolding',
    state: 'confirmed', requestedErect: '2027-02-26', requestedStrike: '2027-03-04', confirmedErect: '2027-02-26', confirmedStrike: '2027-03-04',
    neededErect: '2027-02-26', neededStrike: '2027-03-04', weeklyRate: 18_000, minimumWeeks: 2, curingDays: 0, reference: null, notes: null, hire: null,
    inspection: { status: 'none', nextDue: null, lastInspectedOn: null, reasons: [], source: null, adverseDays: [] },
    pendingChange: null, handover: null, hasNoWork: false, cancelledBecause: null, version: 2, ...overrides,
  };
}

async function opened(shown: AccessBookingDto) {
  api.listAccessBookings.mockResolvedValue([shown]);
  await useAccessStore().loadAll();
  const wrapper = mount(AccessHandoverDialog, {
    props: { booking: shown, visible: false, 'onUpdate:visible': () => {} },
    global: { plugins: [PrimeVue] },
    attachTo: document.body,
  });
  await wrapper.setProps({ visible: true });
  await flushPromises();
  return wrapper;
}

const field = (id: string) => document.querySelector<HTMLInputElement | HTMLTextAreaElement>(`#${id}`)!;
function type(id: string, value: string): void {
  const input = field(id);
  input.value = value;
  input.dispatchEvent(new Event('input'));
}
const submit = async () => {
  document.querySelector('form#access-handover-form')!.dispatchEvent(new Event('submit', { cancelable: true }));
  await flushPromises();
};
const dialogText = () => document.querySelector('[role="dialog"]')!.textContent ?? '';

describe('AccessHandoverDialog', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.clearAllMocks();
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(new Date('2027-02-26T09:00:00'));
  });
  afterEach(() => {
    vi.useRealTimers();
    document.body.innerHTML = '';
  });

  it('marks a confirmed booking as up with the handover, dated today unless changed', async () => {
    api.changeAccessState.mockImplementation(async (_id: string, input: { handover: AccessBookingDto['handover'] }) => booking({ state: 'erected', handover: input.handover, version: 3 }));
    const wrapper = await opened(booking());
    expect(dialogText()).toContain('Mark the scaffold as up');
    expect(dialogText()).toContain('competent');
    type('handover-by', 'Kit Varley');
    type('handover-competent', 'R. Quayle');
    type('handover-tag', 'LP-TAG-0419');
    await submit();
    expect(api.changeAccessState).toHaveBeenCalledWith('b1', {
      state: 'erected',
      handover: { handedOverOn: '2027-02-26', handedOverBy: 'Kit Varley', competentPersonName: 'R. Quayle', tagReference: 'LP-TAG-0419', notes: null },
      version: 2,
    });
    expect(toast.showSaved).toHaveBeenCalledWith('Marked as up', 'Kit Varley handed the scaffold over.');
    expect(wrapper.emitted('update:visible')).toEqual([[false]]);
    wrapper.unmount();
  });

  it('asks for the competent person before sending anything', async () => {
    const wrapper = await opened(booking());
    type('handover-by', 'Kit Varley');
    await submit();
    expect(api.changeAccessState).not.toHaveBeenCalled();
    expect(document.querySelector('#handover-competent-error')?.textContent).toContain("The supplier's competent person is required");
    wrapper.unmount();
  });

  it('shows the server’s word on a field of the handover against that field', async () => {
    api.changeAccessState.mockRejectedValue(new ApiError({
      type: 'about:blank', title: 'Some details need fixing', status: 400, code: 'validation-failed',
      errors: [{ path: 'handover.handedOverOn', message: 'The handover cannot be in the future' }],
    }));
    const wrapper = await opened(booking());
    type('handover-by', 'Kit Varley');
    type('handover-competent', 'R. Quayle');
    await submit();
    expect(document.querySelector('#handover-on-error')?.textContent).toContain('The handover cannot be in the future');
    expect(toast.showProblem).not.toHaveBeenCalled();
    wrapper.unmount();
  });

  it('opens with the recorded handover of access already up, and saves a correction against its version', async () => {
    const recorded = { handedOverOn: '2027-02-25', handedOverBy: 'Kit Varley', competentPersonName: 'R. Quayle', tagReference: null, notes: 'Lift 3 loading bay' };
    api.recordHandover.mockResolvedValue(booking({ state: 'erected', handover: { ...recorded, tagReference: 'LP-TAG-0420' }, version: 5 }));
    const wrapper = await opened(booking({ state: 'erected', handover: recorded, version: 4 }));
    expect(dialogText()).toContain('Record the handover');
    expect(field('handover-by').value).toBe('Kit Varley');
    expect(field('handover-notes').value).toBe('Lift 3 loading bay');
    type('handover-tag', 'LP-TAG-0420');
    await submit();
    expect(api.recordHandover).toHaveBeenCalledWith('b1', { ...recorded, tagReference: 'LP-TAG-0420' }, 4);
    expect(api.changeAccessState).not.toHaveBeenCalled();
    expect(useAccessStore().bookings.b1?.handover?.tagReference).toBe('LP-TAG-0420');
    wrapper.unmount();
  });
});
