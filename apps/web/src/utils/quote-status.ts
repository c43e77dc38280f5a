import type { QuoteStatus } from '@hodboard/shared';

type TagSeverity = 'secondary' | 'info' | 'success' | 'warn' | 'danger';

const severities: Record<QuoteStatus, TagSeverity> = {
  draft: 'secondary',
  sent: 'info',
  accepted: 'success',
  declined: 'danger',
  expired: 'warn',
};

export function quoteStatusSeverity(status: QuoteStatus): TagSeverity {
  return severities[status];
}
