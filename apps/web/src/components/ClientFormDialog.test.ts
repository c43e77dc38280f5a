import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { ClientDto, Problem } from '@hodboard/shared';
import { ApiError } from '@/api/http';
import ClientFormDialog from './ClientFormDialog.vue';

const api = vi.hoisted(() => ({ createClient: vi.fn(), updateClient: vi.fn(), getClient: vi.fn(), listClients: vi.fn(), deleteClient: vi.fn() }));
vi.mock('@/api/clients', () => api);

const client: ClientDto = {
  id: '3c9e1a7b-5d2f-4e8a-9b6c-1d0e2f3a4b5c',
  name: 'Harrowgate Lettings',
  contacts: [
    { name: 'Petra Lund', role: 'Agent', email: 'petra@harrowgate.example.org', phone: null },
    { name: 'Col Ames', role: 'Tenant', email: null, phone: '07700 900515' },
  ],
  notes: null,
  siteCount: 1,
  version: 4,
  createdAt: '2027-01-04T08:00:00.000Z',
};

function mounted(props: { client: ClientDto | null }) {
  return mount(ClientFormDialog, {
    props: { ...props, visible: false, 'onUpdate:visible': () => {} },
    global: { plugins: [PrimeVue, ToastService] },
    attachTo: document.body,
  });
}

async function open(props: { client: ClientDto | null }) {
  const wrapper = mounted(props);
  await wrapper.setProps({ visible: true });
  await flushPromises();
  return wrapper;
}

const groups = () => [...document.querySelectorAll<HTMLElement>('[role="group"]')];
const group = (label: string) => document.querySelector<HTMLElement>(`[role="group"][aria-label="${label}"]`)!;
const field = (label: string, name: 'name' | 'role' | 'email' | 'phone') => group(label).querySelector<HTMLInputElement>(`input[id$="-${name}"]`)!;
const errorOf = (input: HTMLInputElement) => document.getElementById(`${input.id}-error`)?.textContent?.trim();

async function type(input: HTMLInputElement, value: string): Promise<void> {
  input.value = value;
  input.dispatchEvent(new Event('input'));
  await flushPromises();
}

async function click(button: HTMLElement | null | undefined): Promise<void> {
  if (!button) throw new Error('no such button');
  button.click();
  await flushPromises();
}

const buttonNamed = (name: string) =>
  [...document.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.getAttribute('aria-label') === name || b.textContent?.trim() === name);

async function submit(): Promise<void> {
  document.querySelector<HTMLFormElement>('#client-form')!.dispatchEvent(new Event('submit', { cancelable: true }));
  await flushPromises();
}

describe('ClientFormDialog', () => {
  beforeEach(() => vi.clearAllMocks());
  afterEach(() => {
    document.body.innerHTML = '';
  });

  it('offers one empty main contact for a new client and leaves it out when it stays empty', async () => {
    api.createClient.mockImplementation(async (input: object) => ({ ...client, ...input, id: 'new', version: 1 }));
    const wrapper = await open({ client: null });
    expect(groups().map((g) => g.getAttribute('aria-label'))).toEqual(['Main contact']);
    await type(document.querySelector<HTMLInputElement>('#client-name')!, 'Fellside Chapel');

    await submit();
    expect(api.createClient).toHaveBeenCalledWith({ name: 'Fellside Chapel', contacts: [], notes: null });
    wrapper.unmount();
  });

  it('adds and removes contact rows and saves them in order', async () => {
    api.createClient.mockImplementation(async (input: object) => ({ ...client, ...input, id: 'new', version: 1 }));
    const wrapper = await open({ client: null });
    await type(document.querySelector<HTMLInputElement>('#client-name')!, 'Fellside Chapel');
    await type(field('Main contact', 'name'), 'Dora Fell');
    await click(buttonNamed('Add contact'));
    await type(field('Contact 2', 'name'), 'Wrong Person');
    await click(buttonNamed('Add contact'));
    await type(field('Contact 3', 'name'), 'Ivor Pike');
    await type(field('Contact 3', 'role'), 'Treasurer');
    await type(field('Contact 3', 'phone'), '07700 900777');
    expect(groups()).toHaveLength(3);

    await click(buttonNamed('Remove Wrong Person'));
    expect(groups().map((g) => g.getAttribute('aria-label'))).toEqual(['Main contact', 'Contact 2']);
    expect(field('Contact 2', 'name').value).toBe('Ivor Pike');

    await submit();
    expect(api.createClient).toHaveBeenCalledWith({
      name: 'Fellside Chapel',
      contacts: [
        { name: 'Dora Fell', role: null, email: null, phone: null },
        { name: 'Ivor Pike', role: 'Treasurer', email: null, phone: '07700 900777' },
      ],
      notes: null,
    });
    wrapper.unmount();
  });

  it('shows the shared schema messages beside the contact they are about and does not save', async () => {
    const wrapper = await open({ client: null });
    await type(document.querySelector<HTMLInputElement>('#client-name')!, 'Fellside Chapel');
    await click(buttonNamed('Add contact'));
    await type(field('Contact 2', 'email'), 'not-an-address');
    await click(buttonNamed('Add contact'));
    await type(field('Contact 3', 'phone'), '07700 900778');

    await submit();
    // The empty main contact sits above filled ones, so it is kept and refused rather than dropped.
    expect(errorOf(field('Main contact', 'name'))).toBe('Give a name, e-mail or phone number, or remove this contact');
    expect(errorOf(field('Contact 2', 'email'))).toBe('Enter a valid e-mail address');
    expect(field('Contact 2', 'email').getAttribute('aria-invalid')).toBe('true');
    expect(errorOf(field('Contact 3', 'phone'))).toBeUndefined();
    expect(api.createClient).not.toHaveBeenCalled();

    await type(field('Contact 2', 'email'), 'fell@chapel.example.org');
    expect(errorOf(field('Contact 2', 'email'))).toBeUndefined();
    wrapper.unmount();
  });

  it('fills the rows of a client being edited and puts the API\'s field errors on the right row', async () => {
    const refused: Problem = {
      type: '/problems/validation-failed', title: 'Some details need fixing', status: 400, code: 'validation-failed',
      errors: [{ path: 'contacts.1.phone', message: 'Use digits, spaces and + ( ) - only' }],
    };
    api.updateClient.mockRejectedValueOnce(new ApiError(refused));
    const wrapper = await open({ client });
    expect(document.body.textContent).toContain('Edit client');
    expect(field('Main contact', 'email').value).toBe('petra@harrowgate.example.org');
    expect(field('Contact 2', 'role').value).toBe('Tenant');

    await submit();
    expect(api.updateClient).toHaveBeenCalledWith(client.id, expect.objectContaining({ contacts: client.contacts }), 4);
    expect(errorOf(field('Contact 2', 'phone'))).toBe('Use digits, spaces and + ( ) - only');
    expect(errorOf(field('Main contact', 'phone'))).toBeUndefined();
    expect(wrapper.emitted('saved')).toBeUndefined();
    wrapper.unmount();
  });
});
