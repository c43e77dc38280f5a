import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { afterEach, describe, expect, it } from 'vitest';
import { h } from 'vue';
import FormDialog from './FormDialog.vue';

function mounted(isSaving = false) {
  return mount(FormDialog, {
    props: {
      visible: true,
      'onUpdate:visible': () => {},
      header: 'New yard',
      formId: 'yard-form',
      width: '30rem',
      submitLabel: 'Add yard',
      isSaving,
    },
    slots: { default: () => h('input', { id: 'yard-name', 'aria-label': 'Yard name' }) },
    global: { plugins: [PrimeVue] },
    attachTo: document.body,
  });
}

const buttons = () => [...document.querySelectorAll<HTMLButtonElement>('[role="dialog"] button')];
const button = (label: string) => buttons().find((candidate) => candidate.textContent?.trim() === label)!;

describe('FormDialog', () => {
  afterEach(() => {
    document.body.innerHTML = '';
  });

  it('puts the fields in a form named by the submit button in the footer, under the header', async () => {
    const wrapper = mounted();
    await flushPromises();
    const dialog = document.querySelector<HTMLElement>('[role="dialog"]')!;
    expect(dialog.textContent).toContain('New yard');
    expect(dialog.getAttribute('aria-modal')).toBe('true');
    expect(dialog.style.width).toBe('30rem');
    const form = document.querySelector<HTMLFormElement>('form#yard-form')!;
    expect(form.noValidate).toBe(true);
    expect(form.querySelector('#yard-name')).not.toBeNull();
    const submit = button('Add yard');
    expect(submit.type).toBe('submit');
    expect(submit.getAttribute('form')).toBe('yard-form');
    expect(form.contains(submit)).toBe(false);
    wrapper.unmount();
  });

  it('asks to submit when the form is sent, and closes on Cancel without submitting', async () => {
    const wrapper = mounted();
    await flushPromises();
    document.querySelector('form#yard-form')!.dispatchEvent(new Event('submit', { cancelable: true }));
    expect(wrapper.emitted('submit')).toHaveLength(1);

    button('Cancel').click();
    await flushPromises();
    expect(wrapper.emitted('update:visible')).toEqual([[false]]);
    expect(wrapper.emitted('submit')).toHaveLength(1);
    wrapper.unmount();
  });

  it('shows the submit button busy while saving', async () => {
    const wrapper = mounted(true);
    await flushPromises();
    const submit = button('Add yard');
    expect(submit.disabled).toBe(true);
    expect(submit.classList).toContain('p-button-loading');
    wrapper.unmount();
  });
});
