import type { CostingSettings, JobDto, QuoteContentInput } from '@hodboard/shared';

/** A first draft for a job: its description as the scope, the firm's defaults, and a labour line at the first day rate. */
export function starterQuoteContent(job: Pick<JobDto, 'title' | 'description' | 'estimatedWorkingDays'>, settings: CostingSettings): QuoteContentInput {
  const rate = settings.labourRates[0];
  return {
    scope: job.description ?? job.title,
    exclusions: settings.defaultExclusions,
    materials: [],
    labour: rate ? [{ description: rate.label, people: 1, days: job.estimatedWorkingDays, dayRatePence: rate.dayRatePence }] : [],
    jobDays: job.estimatedWorkingDays,
    distanceMiles: 0,
    accessHire: [],
    marginPct: settings.defaultMarginPct,
    breakdownLevel: 'sections',
  };
}
