import { z } from 'zod';
import { priceJob, type PriceBreakdown, type PriceJobInput, type PriceLine } from '../rules/costing.js';
import type { AccessType } from '../terms/access.js';
import { accessTypeSchema } from './access.js';
import { idSchema, optionalText, requiredText } from './common.js';
import type { JobStatus } from './jobs.js';

// Fits a PostgreSQL integer column: £20 million is far beyond any job a small firm prices.
const MAX_PENCE = 2_000_000_000;
export const penceAmountSchema = z
  .number({ message: 'Enter an amount' })
  .int({ message: 'Whole pence only' })
  .min(0, { message: 'Cannot be negative' })
  .max(MAX_PENCE, { message: 'Too large' });

const hasPlaces = (dp: number) => (v: number) => Math.abs(Math.round(v * 10 ** dp) - v * 10 ** dp) < 1e-6;
function decimal(dp: number, min: number, max: number, label: string) {
  return z
    .number({ message: `Enter ${label}` })
    .finite()
    .min(min, { message: `At least ${min}` })
    .max(max, { message: `At most ${max}` })
    .refine(hasPlaces(dp), { message: `Use at most ${dp} decimal places` });
}

export const travelModes = ['bands', 'per-mile'] as const;
export type TravelMode = (typeof travelModes)[number];

export const breakdownLevels = ['total', 'sections', 'lines'] as const;
export type BreakdownLevel = (typeof breakdownLevels)[number];
export const breakdownLevelLabels: Record<BreakdownLevel, string> = {
  total: 'One price for the whole job',
  sections: 'Materials, labour and access as three sums',
  lines: 'Every material and labour line',
};

export const costingSettingsSchema = z
  .object({
    runningCosts: z
      .array(z.object({ description: requiredText(120, 'Description'), monthlyPence: penceAmountSchema }))
      .max(50, { message: 'At most 50 running costs' }),
    /** The fixed costs are spread over this many working days a month. */
    workingDaysPerMonth: decimal(2, 1, 31, 'the working days a month'),
    travelMode: z.enum(travelModes),
    /** Each band covers distances up to its miles; the last band also covers anything further. */
    travelBands: z
      .array(z.object({ upToMiles: z.number().int({ message: 'Whole miles' }).min(1).max(500), perDayPence: penceAmountSchema }))
      .max(10, { message: 'At most 10 bands' }),
    /** Charged for the return trip, every day on site. */
    travelPerMilePence: penceAmountSchema,
    labourRates: z
      .array(z.object({ label: requiredText(80, 'Name or role'), dayRatePence: penceAmountSchema }))
      .max(50, { message: 'At most 50 day rates' }),
    defaultMarginPct: decimal(2, 0, 200, 'a margin'),
    vatRegistered: z.boolean(),
    vatRatePct: decimal(2, 0, 100, 'a VAT rate'),
    quoteValidityDays: z.number().int({ message: 'Whole days' }).min(1, { message: 'At least 1 day' }).max(365),
    paymentTerms: requiredText(2000, 'Payment terms'),
    depositPct: decimal(2, 0, 100, 'a deposit percentage'),
    defaultWastePct: decimal(2, 0, 50, 'a waste allowance'),
    defaultExclusions: optionalText(4000),
  })
  .superRefine((settings, ctx) => {
    settings.travelBands.forEach((band, index) => {
      const previous = settings.travelBands[index - 1];
      if (previous && band.upToMiles <= previous.upToMiles) {
        ctx.addIssue({ code: 'custom', path: ['travelBands', index, 'upToMiles'], message: 'Each band must reach further than the one before' });
      }
    });
    if (settings.travelMode === 'bands' && settings.travelBands.length === 0) {
      ctx.addIssue({ code: 'custom', path: ['travelBands'], message: 'Add at least one distance band, or charge per mile' });
    }
  });
export type CostingSettingsInput = z.input<typeof costingSettingsSchema>;
export type CostingSettings = z.output<typeof costingSettingsSchema>;
export interface CostingSettingsDto extends CostingSettings {
  version: number;
  updatedAt: string | null;
}

export const materialInputSchema = z.object({
  name: requiredText(160, 'Name'),
  unit: requiredText(20, 'Unit'),
  /** Before VAT, as the supplier quotes it. */
  unitPricePence: penceAmountSchema,
  isVatable: z.boolean().default(true),
  supplier: optionalText(120),
});
export type MaterialInput = z.input<typeof materialInputSchema>;
export type MaterialValues = z.output<typeof materialInputSchema>;
export interface MaterialDto extends MaterialValues {
  id: string;
  updatedAt: string;
  version: number;
}
export interface MaterialImportResultDto {
  created: number;
  updated: number;
}

export const quoteMaterialLineSchema = z.object({
  materialId: idSchema.nullable().default(null),
  description: requiredText(200, 'Description'),
  unit: z.string().trim().max(20).default(''),
  quantity: decimal(3, 0.001, 10_000_000, 'a quantity'),
  unitPricePence: penceAmountSchema,
  wastePct: decimal(2, 0, 100, 'a waste allowance'),
});
export const quoteLabourLineSchema = z.object({
  description: requiredText(200, 'Who or which role'),
  people: z.number({ message: 'Enter how many people' }).int({ message: 'Whole people' }).min(1).max(50),
  days: decimal(2, 0.25, 1000, 'the days'),
  dayRatePence: penceAmountSchema,
});
export const quoteAccessLineSchema = z.object({
  description: requiredText(200, 'What is hired'),
  /** Which kind of access this is, so the job's access booking of that kind starts from the weeks priced here. */
  accessType: accessTypeSchema.nullable().default(null),
  weeks: z.number({ message: 'Enter the weeks' }).int({ message: 'Whole weeks' }).min(1).max(520),
  minimumWeeks: z.number().int({ message: 'Whole weeks' }).min(0).max(520),
  weeklyRatePence: penceAmountSchema,
});
export const wallTypes = ['half-brick', 'one-brick'] as const;
export const brickCalcSchema = z.object({
  areaM2: decimal(3, 0.001, 100_000, 'the wall area'),
  wall: z.enum(wallTypes),
  wastePct: decimal(2, 0, 100, 'a waste allowance'),
});

export const quoteContentSchema = z.object({
  scope: requiredText(5000, 'Scope of work'),
  exclusions: optionalText(4000),
  materials: z.array(quoteMaterialLineSchema).max(200, { message: 'At most 200 material lines' }),
  labour: z.array(quoteLabourLineSchema).max(50, { message: 'At most 50 labour lines' }),
  /** Working days on site: running costs accrue per day, and travel too unless travelDays says otherwise. */
  jobDays: decimal(2, 0.5, 1000, 'the days on site'),
  /** Days someone drives to the site, survey and delivery trips included; empty means one trip a day on site. */
  travelDays: decimal(2, 0, 1000, 'the travel days').nullable().default(null),
  /** One way, from the yard to the site. */
  distanceMiles: decimal(1, 0, 500, 'the distance'),
  accessHire: z.array(quoteAccessLineSchema).max(20, { message: 'At most 20 hire lines' }),
  marginPct: decimal(2, 0, 200, 'a margin'),
  breakdownLevel: z.enum(breakdownLevels).default('sections'),
  /** What the brick calculator was last run with, so a revision can pick it up again. */
  brickCalc: brickCalcSchema.nullable().default(null),
});
export type QuoteContentInput = z.input<typeof quoteContentSchema>;
export type QuoteContent = z.output<typeof quoteContentSchema>;

export const quoteCreateSchema = z.object({ jobId: idSchema, content: quoteContentSchema });
export const quoteUpdateSchema = z.object({ content: quoteContentSchema, version: z.number().int().min(1) });
export const quoteSendSchema = z.object({
  version: z.number().int().min(1),
  /** Defaults to the client's e-mail. */
  email: z.union([z.literal(''), z.email({ message: 'Enter a valid e-mail address' })]).optional(),
});
export const quoteVersionOnlySchema = z.object({ version: z.number().int().min(1) });
export const quoteListQuerySchema = z.object({
  jobId: idSchema.optional(),
  status: z.enum(['draft', 'sent', 'accepted', 'declined', 'expired']).optional(),
});
export const quotePdfQuerySchema = z.object({ version: z.coerce.number().int().min(1).optional() });

export const quoteAcceptSchema = z.object({
  name: requiredText(120, 'Your name'),
  agree: z.literal(true, { message: 'Tick the box to accept the quote and its terms' }),
});
export const quoteDeclineSchema = z.object({ reason: optionalText(1000) });
export const quoteTokenParamsSchema = z.object({ token: z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, { message: 'Not a quote link' }) });

/** Only open jobs are quoted: one cancelled, done or invoiced has nothing left to price. */
export function canQuoteJob(status: JobStatus): boolean {
  return status !== 'cancelled' && status !== 'complete' && status !== 'invoiced';
}

export const quoteStatuses = ['draft', 'sent', 'accepted', 'declined', 'expired'] as const;
export type QuoteStatus = (typeof quoteStatuses)[number];
export const quoteStatusLabels: Record<QuoteStatus, string> = {
  draft: 'Draft',
  sent: 'With the client',
  accepted: 'Accepted',
  declined: 'Declined',
  expired: 'Lapsed',
};

export type DepositStatus = 'pending' | 'paid';
export interface DepositDto {
  amountPence: number;
  status: DepositStatus;
  paidAt: string | null;
}

export interface QuoteVersionDto {
  id: string;
  number: number;
  content: QuoteContent;
  breakdown: PriceBreakdown;
  travelPerDayPence: number;
  depositPence: number;
  validityDays: number;
  paymentTerms: string;
  isFrozen: boolean;
  sentAt: string | null;
  createdAt: string;
}

export interface QuoteVersionSummaryDto {
  id: string;
  number: number;
  grossPence: number;
  isFrozen: boolean;
  sentAt: string | null;
}

export interface QuoteDto {
  id: string;
  reference: string;
  jobId: string;
  jobReference: string;
  jobTitle: string;
  jobStatus: JobStatus;
  clientName: string;
  clientEmail: string | null;
  siteAddress: string;
  status: QuoteStatus;
  current: QuoteVersionDto;
  versions: QuoteVersionSummaryDto[];
  sentTo: string | null;
  validUntil: string | null;
  acceptance: { name: string; at: string; ip: string } | null;
  declinedAt: string | null;
  declineReason: string | null;
  deposit: DepositDto | null;
  version: number;
  createdAt: string;
}

export interface QuoteSummaryDto {
  id: string;
  reference: string;
  jobId: string;
  jobReference: string;
  jobTitle: string;
  clientName: string;
  status: QuoteStatus;
  versionNumber: number;
  grossPence: number;
  validUntil: string | null;
  depositStatus: DepositStatus | null;
  createdAt: string;
}

export interface ClientLine {
  description: string;
  pence: number;
}

export interface PublicQuoteDto {
  reference: string;
  versionNumber: number;
  status: QuoteStatus;
  firm: { name: string; email: string | null; phone: string | null; address: string | null };
  clientName: string;
  siteAddress: string;
  jobTitle: string;
  scope: string;
  exclusions: string | null;
  lines: ClientLine[];
  netPence: number;
  vatPence: number;
  grossPence: number;
  vatRegistered: boolean;
  vatRatePct: number;
  validUntil: string | null;
  paymentTerms: string;
  /** Asked for on acceptance; zero when the firm takes no deposit. */
  depositPence: number;
  /** The usual cautions, shown when the price includes access equipment. */
  accessCaution: string | null;
  acceptance: { name: string; at: string } | null;
  deposit: (DepositDto & { canPay: boolean }) | null;
}

export interface QuoteAcceptedDto {
  status: QuoteStatus;
  /** Where to pay the deposit, when one is asked for and card payments are set up. */
  depositUrl: string | null;
}

/**
 * What only the office knows about a finished job. Days on site, days lost to weather and extra hire weeks
 * are never typed in: the report reads them from the board, the stand-downs and the access bookings.
 */
export const jobActualInputSchema = z.object({
  extraMaterialsPence: penceAmountSchema,
  notes: optionalText(2000),
  version: z.number().int().min(1).optional(),
});
export type JobActualInput = z.input<typeof jobActualInputSchema>;

const monthSchema = z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, { message: 'Use a month like 2027-03' });
export const costingReportQuerySchema = z
  .object({ from: monthSchema, to: monthSchema })
  .refine((q) => q.from <= q.to, { message: 'The end month must not be before the start month', path: ['to'] });
export type CostingReportQuery = z.infer<typeof costingReportQuerySchema>;

export interface CostingReportRowDto {
  jobId: string;
  jobReference: string;
  jobTitle: string;
  quoteId: string;
  quoteReference: string;
  month: string;
  estimate: { days: number; costPence: number; accessPence: number; marginPence: number; netPence: number; marginPct: number };
  actual: {
    /** Working days on site: the board's days for the job, less any stood down for weather. */
    days: number;
    /** done: the crew marked the job done (or it is complete); board: as placed so far; estimate: not placed yet. */
    daysFrom: ActualDaysSource;
    /** Days in the job's weather stand-downs (withdrawn ones excluded). */
    weatherDaysLost: number;
    /** Hire weeks beyond the weeks priced, over the job's access bookings. */
    extraAccessWeeks: number;
    extraAccessPence: number;
    extraMaterialsPence: number;
    costPence: number;
    marginPence: number;
    marginPct: number;
    notes: string | null;
    version: number | null;
  };
}

export const actualDaysSources = ['done', 'board', 'estimate'] as const;
export type ActualDaysSource = (typeof actualDaysSources)[number];
export const actualDaysSourceLabels: Record<ActualDaysSource, string> = {
  done: 'marked done',
  board: 'as on the board',
  estimate: 'as quoted, not on the board yet',
};

export interface CostingReportMonthDto {
  month: string;
  jobs: number;
  netPence: number;
  estimatedMarginPence: number;
  actualMarginPence: number;
}

export interface CostingReportDto {
  from: string;
  to: string;
  months: CostingReportMonthDto[];
  rows: CostingReportRowDto[];
}

/** num / den rounded half up, both non-negative integers. */
function roundHalfUp(num: bigint, den: bigint): number {
  return Number((num * 2n + den) / (den * 2n));
}
const scaled = (v: number, dp: number): bigint => BigInt(Math.round(v * 10 ** dp));

/** Pence per day on site: the band that covers the distance (the last band beyond it), or the return trip per mile. */
export function travelPerDayPence(settings: Pick<CostingSettings, 'travelMode' | 'travelBands' | 'travelPerMilePence'>, distanceMiles: number): number {
  if (distanceMiles <= 0) return 0;
  if (settings.travelMode === 'per-mile') {
    return roundHalfUp(scaled(distanceMiles, 1) * 2n * BigInt(settings.travelPerMilePence), 10n);
  }
  const band = settings.travelBands.find((b) => distanceMiles <= b.upToMiles) ?? settings.travelBands[settings.travelBands.length - 1];
  return band?.perDayPence ?? 0;
}

/** Hire is charged for whole weeks and never below the supplier's minimum. */
export function accessChargedWeeks(line: Pick<z.output<typeof quoteAccessLineSchema>, 'weeks' | 'minimumWeeks'>): number {
  return Math.max(line.weeks, line.minimumWeeks);
}

/**
 * Hire weeks a quote priced for one kind of access: the charged weeks of its lines of that kind, summed;
 * null when the quote prices none. Lines saved before they carried a kind count as no kind.
 */
export function quotedHireWeeks(content: Pick<QuoteContent, 'accessHire'>, accessType: AccessType): number | null {
  const lines = content.accessHire.filter((line) => (line.accessType ?? null) === accessType);
  return lines.length === 0 ? null : lines.reduce((t, line) => t + accessChargedWeeks(line), 0);
}

/**
 * What a price-list item costs the firm per unit. A VAT-registered firm reclaims the VAT it pays
 * suppliers, so its cost is the price before VAT; a firm that is not registered bears that VAT.
 * Source: HMRC, "What you can and can't reclaim VAT on" (input tax); only registered businesses reclaim it
 * (secondary summary). The VAT is rounded to the nearer penny, which VAT Notice 700 para 17.5 allows (VATREC12010).
 */
export function materialCostPence(material: Pick<MaterialValues, 'unitPricePence' | 'isVatable'>, settings: Pick<CostingSettings, 'vatRegistered' | 'vatRatePct'>): number {
  if (settings.vatRegistered || !material.isVatable) return material.unitPricePence;
  return roundHalfUp(BigInt(material.unitPricePence) * (10_000n + scaled(settings.vatRatePct, 2)), 10_000n);
}

/** The one place a quote's content and the firm's settings become `priceJob` input, on the server and in the browser. */
export function quotePriceInput(content: QuoteContent, settings: CostingSettings): PriceJobInput {
  return {
    materials: content.materials.map((m) => ({
      description: m.description,
      quantity: m.quantity,
      unitPricePence: m.unitPricePence,
      wastePct: m.wastePct,
    })),
    labour: content.labour.map((l) => ({ description: l.description, people: l.people, days: l.days, dayRatePence: l.dayRatePence })),
    jobDays: content.jobDays,
    travelDays: quotedTravelDays(content),
    runningCosts: {
      monthly: settings.runningCosts.map((c) => ({ description: c.description, pence: c.monthlyPence })),
      workingDaysPerMonth: settings.workingDaysPerMonth,
    },
    travelPerDayPence: travelPerDayPence(settings, content.distanceMiles),
    marginPct: content.marginPct,
    accessHire: content.accessHire.map((a) => {
      const weeks = accessChargedWeeks(a);
      return { description: `${a.description}, ${weeks} ${weeks === 1 ? 'week' : 'weeks'}`, pence: weeks * a.weeklyRatePence };
    }),
    vat: { registered: settings.vatRegistered, ratePct: settings.vatRatePct },
  };
}

/** Travel days as priced: the quote's own, else one trip a day on site. Content saved before the field counts as empty. */
export function quotedTravelDays(content: Pick<QuoteContent, 'jobDays' | 'travelDays'>): number {
  return content.travelDays ?? content.jobDays;
}

export function priceQuote(content: QuoteContent, settings: CostingSettings): PriceBreakdown {
  return priceJob(quotePriceInput(content, settings));
}

/** Deposit on the price the client pays (VAT included), rounded half up to whole pence. */
export function depositPence(grossPence: number, depositPct: number): number {
  return roundHalfUp(BigInt(grossPence) * scaled(depositPct, 2), 10_000n);
}

const sumPence = (lines: readonly PriceLine[]): number => lines.reduce((t, l) => t + l.pence, 0);

/**
 * The price as the client sees it, at the level the firm chose. Running costs, travel and margin are never
 * shown on their own: they travel with the labour, so every level adds up to the same price before VAT.
 */
export function clientLines(breakdown: PriceBreakdown, level: BreakdownLevel): ClientLine[] {
  const of = (kind: PriceLine['kind']) => breakdown.lines.filter((l) => l.kind === kind);
  const materials = of('materials');
  const labour = of('labour');
  const overheads = sumPence([...of('running-cost'), ...of('travel'), ...of('margin')]);
  const access = of('access');
  if (level === 'total') return [{ description: 'The work described above', pence: breakdown.totals.netPence }];
  if (level === 'sections') {
    const out: ClientLine[] = [];
    if (materials.length) out.push({ description: 'Materials', pence: sumPence(materials) });
    out.push({ description: 'Labour, travel and site costs', pence: sumPence(labour) + overheads });
    if (access.length) out.push({ description: 'Access equipment hire', pence: sumPence(access) });
    return out;
  }
  return [
    ...materials.map((l) => ({ description: l.description, pence: l.pence })),
    ...labour.map((l) => ({ description: l.description, pence: l.pence })),
    { description: 'Travel, site running costs and overheads', pence: overheads },
    ...access.map((l) => ({ description: l.description, pence: l.pence })),
  ];
}

export interface ActualFigures {
  /** Working days on site. */
  days: number;
  weatherDaysLost: number;
  /** Hire beyond the weeks priced, at the hire's own weekly rates. */
  extraAccessPence: number;
  extraMaterialsPence: number;
}

/**
 * What the job cost the firm once done: labour scaled to the days worked, running costs and travel for every
 * day on site including rained-off ones (the trip and the overheads are spent either way — common practice,
 * no source), the hire as priced plus any extra weeks, and materials added. Trips priced beyond the days on
 * site (or fewer than them) are taken to have happened as priced.
 */
export function actualCostPence(content: QuoteContent, settings: CostingSettings, actual: ActualFigures): number {
  const input = quotePriceInput(content, settings);
  const ratio = content.jobDays > 0 ? actual.days / content.jobDays : 1;
  const daysOnSite = actual.days + actual.weatherDaysLost;
  const otherTrips = quotedTravelDays(content) - content.jobDays;
  const priced = priceJob({
    ...input,
    labour: input.labour.map((l) => ({ ...l, days: Math.round(l.days * ratio * 100) / 100 })),
    jobDays: Math.round(daysOnSite * 100) / 100,
    travelDays: Math.max(0, Math.round((daysOnSite + otherTrips) * 100) / 100),
    marginPct: 0,
    accessHire: [],
    vat: { registered: false, ratePct: 0 },
  });
  const accessPence = input.accessHire.reduce((t, a) => t + a.pence, 0);
  return priced.totals.costPence + accessPence + actual.extraAccessPence + actual.extraMaterialsPence;
}

/** Margin as a share of the price before VAT, to one decimal place, so estimate and actual compare on one base. */
export function marginPctOf(marginPence: number, netPence: number): number {
  return netPence > 0 ? Math.round((marginPence / netPence) * 1000) / 10 : 0;
}

/** Pounds and pence as people write them, from integer pence. */
export function formatPence(pence: number): string {
  const sign = pence < 0 ? '-' : '';
  const abs = Math.abs(pence);
  const pounds = Math.floor(abs / 100).toLocaleString('en-GB');
  return `${sign}£${pounds}.${String(abs % 100).padStart(2, '0')}`;
}

/** Parses "12.5", "£1,234.50" or "0.62" into integer pence without floating-point drift; null when it is not money. */
export function parsePounds(text: string): number | null {
  const cleaned = text.trim().replace(/^£/, '').replaceAll(',', '');
  const match = /^(\d{1,9})(?:\.(\d{1,2}))?$/.exec(cleaned);
  if (!match) return null;
  return Number(match[1]) * 100 + Number((match[2] ?? '').padEnd(2, '0'));
}
