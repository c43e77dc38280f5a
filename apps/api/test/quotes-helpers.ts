import { fileURLToPath } from 'node:url';
import request from 'supertest';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import type { CostingSettingsInput, QuoteContentInput } from '@hodboard/shared';
import type { Harness, SignedIn } from './harness.js';

// pdf.js reads the 14 standard fonts' metrics from files it ships; without them it warns on every page.
const STANDARD_FONTS = `${fileURLToPath(new URL('../node_modules/pdfjs-dist/standard_fonts/', import.meta.url))}`;

/** Figures for an invented firm; the expected prices in the tests are worked from these by hand. */
export const gardenWallSettings: CostingSettingsInput = {
  runningCosts: [
    { description: 'Public liability insurance', monthlyPence: 9_000 },
    { description: 'Van insurance and tax', monthlyPence: 12_000 },
    { description: 'Phones and software', monthlyPence: 4_200 },
  ],
  workingDaysPerMonth: 21,
  travelMode: 'bands',
  travelBands: [
    { upToMiles: 10, perDayPence: 1_500 },
    { upToMiles: 25, perDayPence: 3_000 },
  ],
  travelPerMilePence: 45,
  labourRates: [
    { label: 'Bricklayer', dayRatePence: 22_000 },
    { label: 'Labourer', dayRatePence: 14_000 },
  ],
  defaultMarginPct: 15,
  vatRegistered: true,
  vatRatePct: 20,
  quoteValidityDays: 30,
  paymentTerms: 'Balance within 14 days of completion.',
  depositPct: 25,
  defaultWastePct: 5,
  defaultExclusions: 'Removal of tree roots.',
};

export const gardenWallContent: QuoteContentInput = {
  scope: 'Take down the leaning front garden wall and rebuild it in reclaimed red brick on the old footing, with a brick-on-edge coping.',
  exclusions: 'Making good the lawn.',
  materials: [
    { materialId: null, description: 'Reclaimed red facing brick', unit: 'brick', quantity: 660, unitPricePence: 85, wastePct: 0 },
    { materialId: null, description: 'Mortar, 1:5 ready-mixed', unit: 'm³', quantity: 0.216, unitPricePence: 16_000, wastePct: 0 },
  ],
  labour: [
    { description: 'Bricklayer', people: 1, days: 3, dayRatePence: 22_000 },
    { description: 'Labourer', people: 1, days: 3, dayRatePence: 14_000 },
  ],
  jobDays: 3,
  distanceMiles: 8,
  accessHire: [],
  marginPct: 15,
  breakdownLevel: 'sections',
  brickCalc: { areaM2: 11, wall: 'half-brick', wastePct: 0 },
};

export async function setUpCosting(h: Harness, owner: SignedIn, overrides: Partial<CostingSettingsInput> = {}): Promise<void> {
  const current = await request(h.app).get('/api/costing/settings').set(owner.auth).expect(200);
  await request(h.app)
    .put('/api/costing/settings')
    .set(owner.auth)
    .send({ ...gardenWallSettings, ...overrides, version: current.body.version })
    .expect(200);
}

/** A client with an e-mail, a site and an unscheduled job: what an enquiry looks like before it is quoted. */
export async function enquiry(h: Harness, owner: SignedIn, clientEmail = 'mo.hartigan@example.org'): Promise<{ jobId: string; clientId: string }> {
  const client = await request(h.app).post('/api/clients').set(owner.auth).send({ name: 'Mo Hartigan', contacts: [{ email: clientEmail }] }).expect(201);
  const site = await request(h.app)
    .post('/api/sites')
    .set(owner.auth)
    .send({ clientId: client.body.id, addressLine1: '7 Cobble Lane', town: 'Wrenfold', postcode: 'WF4 2LD' })
    .expect(201);
  const job = await request(h.app)
    .post('/api/jobs')
    .set(owner.auth)
    .send({ clientId: client.body.id, siteId: site.body.id, title: 'Rebuild front garden wall', workTypes: ['garden-wall'], estimatedWorkingDays: 3 })
    .expect(201);
  return { jobId: job.body.id as string, clientId: client.body.id as string };
}

export async function pdfText(body: Buffer): Promise<string> {
  const doc = await getDocument({ data: new Uint8Array(body), standardFontDataUrl: STANDARD_FONTS, useSystemFonts: false, isEvalSupported: false }).promise;
  const pages: string[] = [];
  for (let n = 1; n <= doc.numPages; n += 1) {
    const page = await doc.getPage(n);
    const content = await page.getTextContent();
    pages.push(content.items.map((item) => ('str' in item ? item.str : '')).join(' '));
  }
  await doc.destroy();
  return pages.join('\n').replace(/\s+/g, ' ');
}

/** Collects a binary body (supertest would otherwise try to read a PDF as text). */
export function binaryParser(res: unknown, done: (err: Error | null, body: Buffer) => void): void {
  const stream = res as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (chunk: Buffer) => chunks.push(chunk));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
  stream.on('error', (err: Error) => done(err, Buffer.alloc(0)));
}

export function linkToken(text: string): string {
  const match = /\/q\/([A-Za-z0-9_-]+)/.exec(text);
  if (!match?.[1]) throw new Error('no quote link in the mail');
  return match[1];
}

/** One price-list item and one draft quote on a job, for sweeps across firms. */
export async function quoteFixture(h: Harness, owner: SignedIn, jobId: string) {
  const material = await request(h.app)
    .post('/api/materials')
    .set(owner.auth)
    .send({ name: 'Class B engineering brick', unit: 'brick', unitPricePence: 74, supplier: 'Kilnside Supplies' })
    .expect(201);
  const quote = await request(h.app).post('/api/quotes').set(owner.auth).send({ jobId, content: gardenWallContent }).expect(201);
  return { quoteId: quote.body.id as string, materialId: material.body.id as string, content: gardenWallContent };
}
