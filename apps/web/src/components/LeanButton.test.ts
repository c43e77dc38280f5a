import { mount } from '@vue/test-utils';
import Button from 'primevue/button';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import LeanButton from './LeanButton.vue';

/** What the theme's selectors and a screen reader see of a rendered button: tags, classes, type, state, name and text. */
function shape(element: Element): unknown {
  const aria = element.getAttribute('aria-label');
  return {
    tag: element.tagName,
    classes: [...element.classList].sort(),
    type: element.getAttribute('type'),
    disabled: element.hasAttribute('disabled'),
    ...(aria === null ? {} : { aria }),
    text: element.children.length === 0 ? element.textContent : undefined,
    children: [...element.children].map(shape),
  };
}

// Every prop LeanButton takes, alone and in the combinations the crew home and the board use.
const cases: Array<{ props: Record<string, unknown>; attrs?: Record<string, string> }> = [
  { props: { label: 'Add note' } },
  { props: { label: 'Add note', icon: 'pi pi-pencil', outlined: true } },
  { props: { label: 'Inspections', icon: 'pi pi-list', size: 'small', text: true } },
  { props: { label: 'Stand down for weather', icon: 'pi pi-pause', severity: 'danger' } },
  { props: { label: 'Mark progress', icon: 'pi pi-check-square', severity: 'secondary' } },
  { props: { label: 'Save note', icon: 'pi pi-send', type: 'submit', disabled: true } },
  { props: { label: 'Week', icon: 'pi pi-angle-right', iconPos: 'right', severity: 'secondary', outlined: true }, attrs: { 'aria-label': 'Next week' } },
  { props: { icon: 'pi pi-times', text: true, rounded: true }, attrs: { 'aria-label': 'Dismiss' } },
  { props: { label: 'Bigger', size: 'large', severity: 'contrast' } },
  { props: { label: 'Help', severity: 'help', rounded: true, disabled: false } },
];

describe('LeanButton', () => {
  // Source: PrimeVue 4.5's own Button, rendered beside it; the prebuilt theme styles a button by these classes.
  it.each(cases)('renders what PrimeVue Button renders for %o', ({ props, attrs }) => {
    const options = { props, attrs, slots: {} };
    const theirs = mount(Button, { ...options, global: { plugins: [[PrimeVue, { theme: 'none', ripple: false }]] } });
    const ours = mount(LeanButton, options);
    expect(shape(ours.element)).toEqual(shape(theirs.element));
  });

  it('passes its click to the listener and keeps a class set where it is used', async () => {
    let clicks = 0;
    const button = mount(LeanButton, { props: { label: 'Add photos' }, attrs: { class: 'action', onClick: () => (clicks += 1) } });
    await button.trigger('click');
    expect(clicks).toBe(1);
    expect(button.classes()).toEqual(expect.arrayContaining(['p-button', 'action']));
  });

  it('sends no click while disabled', async () => {
    let clicks = 0;
    const button = mount(LeanButton, { props: { label: 'Save note', disabled: true }, attrs: { onClick: () => (clicks += 1) } });
    await button.trigger('click');
    expect(clicks).toBe(0);
  });
});
