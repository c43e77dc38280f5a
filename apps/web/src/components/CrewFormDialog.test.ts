import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { CrewDto, MemberDto, Problem } from '@hodboard/shared';
import { ApiError } from '@/api/http';
import CrewFormDialog from './CrewFormDialog.vue';

const api = vi.hoisted(() => ({ createCrew: vi.fn(), updateCrew: vi.fn(), getCrew: vi.fn(), listCrews: vi.fn(), deleteCrew: vi.fn() }));
vi.mock('@/api/crews', () => api);

const lead: MemberDto = {
  id: '0d7c4b52-4a8e-4f0e-9a43-6f2d1c0b9e11',
  userId: '8e2f0c1d-3b4a-4c5d-8e6f-7a8b9c0d1e2f',
  name: 'Ned Harrow',
  email: 'ned@harrow-build.example.org',
  role: 'crew-lead',
  status: 'active',
  crewIds: [],
  createdAt: '2027-01-04T08:00:00.000Z',
};
const crew: CrewDto = {
  id: '5b0e6a8c-1f2d-4e3b-8c7a-9d0e1f2a3b4c',
  name: 'Lime crew',
  colour: '#2f7d5b',
  leadMemberId: null,
  members: [],
  version: 3,
  createdAt: '2027-01-04T08:00:00.000Z',
};

function mounted(props: { crew: CrewDto | null }) {
  return mount(CrewFormDialog, {
    props: { ...props, people: [lead], visible: false, 'onUpdate:visible': () => {} },
    global: { plugins: [PrimeVue, ToastService] },
    attachTo: document.body,
  });
}

const dialog = () => document.querySelector<HTMLElement>('[role="dialog"]');
const nameInput = () => document.querySelector<HTMLInputElement>('#crew-name')!;
async function submit(): Promise<void> {
  document.querySelector<HTMLFormElement>('#crew-form')!.dispatchEvent(new Event('submit', { cancelable: true }));
  await flushPromises();
}

describe('CrewFormDialog', () => {
  beforeEach(() => vi.clearAllMocks());
  afterEach(() => {
    document.body.innerHTML = '';
  });

  it('opens empty as a new crew and shows the shared schema message against the name', async () => {
    const wrapper = mounted({ crew: null });
    await wrapper.setProps({ visible: true });
    await flushPromises();
    expect(dialog()?.textContent).toContain('New crew');
    expect(document.body.textContent).toContain('Add crew');
    expect(nameInput().value).toBe('');

    await submit();
    expect(document.body.textContent).toContain('Crew name is required');
    expect(nameInput().getAttribute('aria-invalid')).toBe('true');
    expect(api.createCrew).not.toHaveBeenCalled();
    wrapper.unmount();
  });

  it('saves an edit with the version it opened at, puts the lead on the crew, and closes', async () => {
    api.updateCrew.mockImplementation(async (_id: string, input: object, version: number) => ({ ...crew, ...input, version: version + 1 }));
    const wrapper = mounted({ crew: { ...crew, leadMemberId: lead.id } });
    await wrapper.setProps({ visible: true });
    await flushPromises();
    expect(document.body.textContent).toContain('Edit crew');
    expect(nameInput().value).toBe('Lime crew');

    await submit();
    expect(api.updateCrew).toHaveBeenCalledWith(crew.id, expect.objectContaining({ name: 'Lime crew', memberIds: [lead.id] }), 3);
    expect(wrapper.emitted('saved')?.[0]?.[0]).toMatchObject({ id: crew.id, version: 4 });
    expect(wrapper.emitted('update:visible')?.at(-1)).toEqual([false]);
    wrapper.unmount();
  });

  it('after a stale version, reloads the crew into the form', async () => {
    const stale: Problem = { type: 'about:blank', title: 'Changed', status: 409, code: 'stale-version' };
    api.updateCrew.mockRejectedValueOnce(new ApiError(stale));
    api.getCrew.mockResolvedValueOnce({ ...crew, name: 'Lime crew (renamed)', version: 5 });
    const wrapper = mounted({ crew });
    await wrapper.setProps({ visible: true });
    await flushPromises();
    await submit();
    expect(api.getCrew).toHaveBeenCalledWith(crew.id);
    expect(nameInput().value).toBe('Lime crew (renamed)');
    expect(wrapper.emitted('saved')).toBeUndefined();
    wrapper.unmount();
  });
});
