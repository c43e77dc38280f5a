import { flushPromises, mount } from '@vue/test-utils';
import { useConfirm } from 'primevue/useconfirm';
import { useToast } from 'primevue/usetoast';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h } from 'vue';
import AppOverlays from '@/components/AppOverlays.vue';
import { overlayComponents } from './overlays';
import { installPrimeVue } from './primevue';

let services: { toast: ReturnType<typeof useToast>; confirm: ReturnType<typeof useConfirm> };
const Host = defineComponent({
  setup() {
    services = { toast: useToast(), confirm: useConfirm() };
    return () => h(AppOverlays);
  },
});

function mountHost() {
  return mount(Host, { attachTo: document.body, global: { plugins: [{ install: installPrimeVue }] } });
}

afterEach(() => {
  document.body.innerHTML = '';
});

// One module state for the file: the overlays load once, so the cases run in this order.
describe('toasts and confirmations loaded when first asked for', () => {
  it('loads neither while nothing has asked', async () => {
    const host = mountHost();
    await flushPromises();
    expect(overlayComponents.value).toBeNull();
    expect(document.body.querySelector('.p-toast')).toBeNull();
    host.unmount();
  });

  it('shows a toast asked for before its code had loaded', async () => {
    const host = mountHost();
    services.toast.add({ severity: 'success', summary: 'Crew saved', detail: 'Stack crew now has three members' });
    await vi.waitFor(() => expect(document.body.textContent).toContain('Stack crew now has three members'));
    host.unmount();
  });

  it('opens a confirmation and passes on the answer', async () => {
    const host = mountHost();
    const accept = vi.fn();
    services.confirm.require({ header: 'Book anyway?', message: 'Stack crew is already booked on Mon 7 Dec.', acceptLabel: 'Book anyway', accept });
    await vi.waitFor(() => expect(document.body.textContent).toContain('Stack crew is already booked on Mon 7 Dec.'));
    const button = [...document.body.querySelectorAll('button')].find((element) => element.textContent?.includes('Book anyway'));
    button!.click();
    expect(accept).toHaveBeenCalledOnce();
    host.unmount();
  });
});
