import { flushPromises, mount } from '@vue/test-utils';
import { createPinia } from 'pinia';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { AccessBookingDto, AccessType, SupplierDto } from '@hodboard/shared';
import AccessBookingDialog from './AccessBookingDialog.vue';

const api = vi.hoisted(() => ({
  listSuppliers: vi.fn(),
  createAccessBooking: vi.fn(),
  getQuotedHireWeeks: vi.fn(),
}));
vi.mock('@/api/access', () => api);

const jobId = 'bbbbbbbb-0000-4000-8000-000000000001';
const supplier: SupplierDto = {
  id: 'cccccccc-0000-4000-8000-000000000001', name: 'Tallpole Hire', contactName: null, email: 'hire@tallpole.example', phone: null,
  leadTimeWorkingDays: 3, minimumWeeks: 1, weeklyRates: { tower: 9_000 }, version: 1,
};
const booking = { id: 'dddddddd-0000-4000-8000-000000000001', jobIds: [jobId], accessType: 'tower', supplierName: 'Tallpole Hire' } as AccessBookingDto;

function mounted(accessType: AccessType = 'tower') {
  return mount(AccessBookingDialog, {
    props: { jobIds: [jobId], jobReference: 'J0042', accessType, visible: false, 'onUpdate:visible': () => {} },
    global: { plugins: [createPinia(), PrimeVue, ToastService], stubs: { RouterLink: true } },
    attachTo: document.body,
  });
}

const pricedInput = () => document.querySelector<HTMLInputElement>('#access-priced')!;
async function submit(): Promise<void> {
  document.querySelector<HTMLFormElement>('#access-booking-form')!.dispatchEvent(new Event('submit', { cancelable: true }));
  await flushPromises();
}

describe('AccessBookingDialog', () => {
  beforeEach(() => {
    vi.clearAllMocks();
    api.listSuppliers.mockResolvedValue([supplier]);
    api.createAccessBooking.mockResolvedValue(booking);
  });
  afterEach(() => {
    document.body.innerHTML = '';
  });

  it("fills the weeks priced from the job's accepted quote for the kind of access, and books with them", async () => {
    api.getQuotedHireWeeks.mockResolvedValue({ pricedWeeks: 2, quoteReferences: ['Q0042'] });
    const wrapper = mounted('tower');
    await wrapper.setProps({ visible: true });
    await flushPromises();
    expect(api.getQuotedHireWeeks).toHaveBeenCalledWith([jobId], 'tower');
    expect(pricedInput().value).toBe('2');
    expect(document.body.textContent).toContain('2 weeks priced in quote Q0042');
    await submit();
    expect(api.createAccessBooking).toHaveBeenCalledWith(expect.objectContaining({ jobIds: [jobId], accessType: 'tower', pricedWeeks: 2 }));
  });

  it('leaves the weeks priced empty and says so when no accepted quote prices that access', async () => {
    api.getQuotedHireWeeks.mockResolvedValue({ pricedWeeks: null, quoteReferences: [] });
    const wrapper = mounted('mewp');
    await wrapper.setProps({ visible: true });
    await flushPromises();
    expect(api.getQuotedHireWeeks).toHaveBeenCalledWith([jobId], 'mewp');
    expect(pricedInput().value).toBe('');
    expect(document.body.textContent).toContain('No accepted quote prices this access');
    await submit();
    expect(api.createAccessBooking).toHaveBeenCalledWith(expect.objectContaining({ accessType: 'mewp', pricedWeeks: null }));
  });
});
