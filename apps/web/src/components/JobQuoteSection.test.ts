import { flushPromises, mount } from '@vue/test-utils';
import { createPinia } from 'pinia';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { createMemoryHistory, createRouter } from 'vue-router';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { costingSettingsSchema, type CostingSettingsDto, type JobDto, type QuoteSummaryDto } from '@hodboard/shared';
import JobQuoteSection from './JobQuoteSection.vue';

const api = vi.hoisted(() => ({ listQuotes: vi.fn(), createQuote: vi.fn() }));
vi.mock('@/api/quotes', () => api);
const costing = vi.hoisted(() => ({ getCostingSettings: vi.fn() }));
vi.mock('@/api/costing', () => costing);
vi.mock('@/api/materials', () => ({ listMaterials: vi.fn().mockResolvedValue([]) }));

const job: JobDto = {
  id: 'aaaaaaaa-0000-4000-8000-000000000001', reference: 'J0042', clientId: 'c1', clientName: 'Mo Hartigan', siteId: 's1',
  siteAddress: '7 Cobble Lane, Wrenfold', title: 'Rebuild front garden wall', description: 'Rebuild the leaning wall in reclaimed brick.',
  workTypes: ['garden-wall'], estimatedWorkingDays: 3, accessNeeds: [], earliestStart: null, targetFinish: null, priority: 'normal',
  siteNotes: null, status: 'enquiry', assignment: null, version: 1, createdAt: '2027-03-01T09:00:00.000Z',
};
const summary: QuoteSummaryDto = {
  id: 'bbbbbbbb-0000-4000-8000-000000000001', reference: 'Q0042', jobId: job.id, jobReference: 'J0042', jobTitle: job.title,
  clientName: 'Mo Hartigan', status: 'sent', versionNumber: 2, grossPence: 242_405, validUntil: '2027-03-31', depositStatus: null,
  createdAt: '2027-03-01T09:00:00.000Z',
};
const settings: CostingSettingsDto = {
  ...costingSettingsSchema.parse({
    runningCosts: [], workingDaysPerMonth: 21, travelMode: 'per-mile', travelBands: [], travelPerMilePence: 45,
    labourRates: [{ label: 'Bricklayer', dayRatePence: 22_000 }], defaultMarginPct: 15, vatRegistered: true, vatRatePct: 20,
    quoteValidityDays: 30, paymentTerms: 'Balance on completion.', depositPct: 25, defaultWastePct: 5, defaultExclusions: 'Making good the lawn.',
  }),
  version: 1,
  updatedAt: null,
};

async function mounted(props: Partial<JobDto> = {}) {
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/', component: { template: '<div />' } },
      { path: '/quotes/:id', name: 'quote', component: { template: '<div />' } },
    ],
  });
  await router.push('/');
  const wrapper = mount(JobQuoteSection, {
    props: { job: { ...job, ...props } },
    global: { plugins: [createPinia(), PrimeVue, ToastService, router] },
    attachTo: document.body,
  });
  await flushPromises();
  return { wrapper, router };
}

describe('JobQuoteSection', () => {
  beforeEach(() => {
    vi.clearAllMocks();
    costing.getCostingSettings.mockResolvedValue(settings);
  });
  afterEach(() => {
    document.body.innerHTML = '';
  });

  it("shows the job's quote with its state and total, linked to the quote", async () => {
    api.listQuotes.mockResolvedValue([summary]);
    const { wrapper } = await mounted();
    expect(api.listQuotes).toHaveBeenCalledWith({ jobId: job.id });
    expect(wrapper.text()).toContain('Quote Q0042');
    expect(wrapper.text()).toContain('With the client');
    expect(wrapper.get('[data-testid="job-quote-total"]').text()).toBe('£2,424.05');
    expect(wrapper.text()).toContain('version 2');
    expect(wrapper.get('a').attributes('href')).toBe(`/quotes/${summary.id}`);
    expect(wrapper.text()).not.toContain('Start a quote');
  });

  it('starts a draft from the job and the firm defaults, then opens it', async () => {
    api.listQuotes.mockResolvedValue([]);
    api.createQuote.mockResolvedValue({ id: summary.id });
    const { wrapper, router } = await mounted();
    const button = wrapper.findAll('button').find((b) => b.text().includes('Start a quote'));
    expect(button).toBeDefined();
    await button!.trigger('click');
    await flushPromises();
    expect(api.createQuote).toHaveBeenCalledWith(job.id, expect.objectContaining({
      scope: 'Rebuild the leaning wall in reclaimed brick.',
      exclusions: 'Making good the lawn.',
      labour: [{ description: 'Bricklayer', people: 1, days: 3, dayRatePence: 22_000 }],
      jobDays: 3,
      marginPct: 15,
    }));
    expect(router.currentRoute.value.fullPath).toBe(`/quotes/${summary.id}`);
  });

  it('offers no quote for a cancelled job, and says why', async () => {
    api.listQuotes.mockResolvedValue([]);
    const { wrapper } = await mounted({ status: 'cancelled' });
    expect(wrapper.text()).toContain('Only open jobs can be quoted');
    expect(wrapper.findAll('button').some((b) => b.text().includes('Start a quote'))).toBe(false);
  });
});
