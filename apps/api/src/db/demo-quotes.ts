import type { DataSource } from 'typeorm';
import { costingSettingsSchema, materialInputSchema, quoteContentSchema, type QuoteContentInput } from '@hodboard/shared';
import type { Job } from '../entities/index.js';
import { EventBus } from '../lib/event-bus.js';
import type { Clock } from '../lib/clock.js';
import type { Actor } from '../services/actor.js';
import { CostingSettingsService } from '../services/costing-settings-service.js';
import { MaterialService } from '../services/material-service.js';
import { PaymentService } from '../services/payment-service.js';
import type { MailMessage } from '../services/mailer.js';
import { QuoteService } from '../services/quote-service.js';

/** An invented firm's running costs and price list; the prices are plausible, not anyone's real figures. */
const DEMO_SETTINGS = costingSettingsSchema.parse({
  runningCosts: [
    { description: 'Public liability insurance', monthlyPence: 9_500 },
    { description: 'Van insurance and road tax', monthlyPence: 14_800 },
    { description: 'Van finance', monthlyPence: 32_000 },
    { description: 'Phones and software', monthlyPence: 6_400 },
    { description: 'Tools and plant upkeep', monthlyPence: 12_000 },
  ],
  workingDaysPerMonth: 20,
  travelMode: 'bands',
  travelBands: [
    { upToMiles: 10, perDayPence: 1_800 },
    { upToMiles: 25, perDayPence: 3_500 },
    { upToMiles: 50, perDayPence: 6_000 },
  ],
  travelPerMilePence: 45,
  labourRates: [
    { label: 'Bricklayer', dayRatePence: 23_000 },
    { label: 'Labourer', dayRatePence: 14_500 },
    { label: 'Apprentice', dayRatePence: 9_000 },
  ],
  defaultMarginPct: 18,
  vatRegistered: true,
  vatRatePct: 20,
  quoteValidityDays: 30,
  paymentTerms: 'Deposit on acceptance; the balance within 14 days of completion, by bank transfer.',
  depositPct: 20,
  defaultWastePct: 5,
  defaultExclusions: 'Skip permits on the highway; making good planting and turf; anything below ground not visible at survey.',
});

const DEMO_MATERIALS = [
  { name: 'Red multi facing brick', unit: 'brick', unitPricePence: 78, supplier: 'Callowmere Builders Merchants' },
  { name: 'Reclaimed red facing brick', unit: 'brick', unitPricePence: 112, supplier: 'Old Forge Reclamation' },
  { name: 'Class B engineering brick', unit: 'brick', unitPricePence: 64, supplier: 'Callowmere Builders Merchants' },
  { name: 'Mortar, 1:5 ready-mixed', unit: 'm³', unitPricePence: 16_500, supplier: 'Saltby Ready Mix' },
  { name: 'Natural hydraulic lime NHL 3.5, 25 kg', unit: 'bag', unitPricePence: 1_850, supplier: 'Greenhythe Lime Works' },
  { name: 'Sharp sand', unit: 'tonne', unitPricePence: 5_200, supplier: 'Saltby Ready Mix' },
  { name: 'Wall ties, stainless, box of 250', unit: 'box', unitPricePence: 4_600, supplier: 'Callowmere Builders Merchants' },
  { name: 'Brick-on-edge coping, half round', unit: 'each', unitPricePence: 395, supplier: 'Callowmere Builders Merchants' },
  { name: 'Damp-proof course, 112.5 mm × 30 m', unit: 'roll', unitPricePence: 1_290, supplier: 'Callowmere Builders Merchants' },
];

const GARDEN_WALL: QuoteContentInput = {
  scope: 'Take down the cracked front boundary wall (about 9 m × 0.9 m) and rebuild it in red multi brick on the existing footing, with a DPC and a half-round coping.',
  exclusions: DEMO_SETTINGS.defaultExclusions,
  materials: [
    { description: 'Red multi facing brick', unit: 'brick', quantity: 1_021, unitPricePence: 78, wastePct: 0 },
    { description: 'Mortar, 1:5 ready-mixed', unit: 'm³', quantity: 0.39, unitPricePence: 16_500, wastePct: 0 },
    { description: 'Brick-on-edge coping, half round', unit: 'each', quantity: 30, unitPricePence: 395, wastePct: 5 },
  ],
  labour: [
    { description: 'Bricklayer', people: 1, days: 4, dayRatePence: 23_000 },
    { description: 'Labourer', people: 1, days: 4, dayRatePence: 14_500 },
  ],
  jobDays: 4,
  distanceMiles: 6,
  accessHire: [],
  marginPct: 18,
  breakdownLevel: 'sections',
  brickCalc: { areaM2: 8.1, wall: 'one-brick', wastePct: 5 },
};

const STACK: QuoteContentInput = {
  scope: 'Take the chimney stack down to below the roof line and rebuild it with new pots and flaunching, reusing sound bricks.',
  exclusions: 'Roof repairs beyond the stack flashing.',
  materials: [
    { description: 'Reclaimed red facing brick', unit: 'brick', quantity: 180, unitPricePence: 112, wastePct: 10 },
    { description: 'Natural hydraulic lime NHL 3.5, 25 kg', unit: 'bag', quantity: 6, unitPricePence: 1_850, wastePct: 0 },
  ],
  labour: [{ description: 'Bricklayer', people: 2, days: 3, dayRatePence: 23_000 }],
  jobDays: 3,
  distanceMiles: 14,
  accessHire: [{ description: 'Scaffold to the stack', accessType: 'scaffold', weeks: 2, minimumWeeks: 2, weeklyRatePence: 22_000 }],
  marginPct: 18,
  breakdownLevel: 'lines',
  brickCalc: null,
};

/** The stack job under way this week, priced for its four days on site and the scaffold's two weeks. */
const STACK_UNDER_WAY: QuoteContentInput = {
  ...STACK,
  labour: [{ description: 'Bricklayer', people: 2, days: 4, dayRatePence: 23_000 }],
  jobDays: 4,
};

/**
 * Costing settings, a price list and three quotes for the demo firm: one accepted for the job under way (so the margins
 * report has a job to show), one with the client, one still a draft.
 */
export async function seedDemoQuotes(
  dataSource: DataSource, actor: Actor, jobs: { accepted: Job; sent: Job; draft: Job }, clock: Clock = () => new Date(),
): Promise<void> {
  const events = new EventBus();
  const costing = new CostingSettingsService(dataSource, events);
  await costing.update(actor, { ...DEMO_SETTINGS, version: 0 });
  const materials = new MaterialService(dataSource, events);
  for (const m of DEMO_MATERIALS) await materials.create(actor, materialInputSchema.parse(m));
  // The seed sends no mail: the client's link is made but only ever shown in a real send, or followed here to accept.
  let lastLink: string | null = null;
  const keepLink = async (message: MailMessage) => {
    lastLink = /\/q\/([\w-]+)/.exec(message.text)?.[1] ?? lastLink;
  };
  const quotes = new QuoteService(dataSource, { send: keepLink }, clock, events, costing, new PaymentService(dataSource, clock, events, undefined), {
    appUrl: 'http://localhost:3000',
  });
  const accepted = await quotes.create(actor, { jobId: jobs.accepted.id, content: quoteContentSchema.parse(STACK_UNDER_WAY) });
  await quotes.send(actor, accepted.id, { version: accepted.version });
  if (!lastLink) throw new Error('the demo quote was sent without a client link');
  await quotes.accept(lastLink, { name: 'Helen Ashdown' }, '127.0.0.1');
  const sent = await quotes.create(actor, { jobId: jobs.sent.id, content: quoteContentSchema.parse(GARDEN_WALL) });
  await quotes.send(actor, sent.id, { version: sent.version });
  await quotes.create(actor, { jobId: jobs.draft.id, content: quoteContentSchema.parse(STACK) });
}
