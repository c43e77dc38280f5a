import { accessTypeLabels, type AccessBookingDto } from '@hodboard/shared';
import { formatDay } from '@/utils/format';

export interface SupplierAnswerNotice {
  severity: 'info' | 'warn';
  summary: string;
  detail: string;
}

/** The office's note of a supplier's answer: a counter-proposal asks for a look, an acceptance only informs. */
export function describeSupplierAnswer(booking: AccessBookingDto): SupplierAnswerNotice {
  const kind = accessTypeLabels[booking.accessType].toLowerCase();
  const jobs = booking.jobReferences.filter(Boolean).join(', ');
  const forJobs = jobs ? ` for ${jobs}` : '';
  const change = booking.pendingChange;
  if (change?.status === 'countered' && change.counterErect && change.counterStrike) {
    const note = change.supplierNote ? ` Their note: “${change.supplierNote}”` : '';
    return {
      severity: 'warn',
      summary: `${booking.supplierName} proposed other dates`,
      detail: `The ${kind}${forJobs} is now booked up ${formatDay(change.counterErect)}, down ${formatDay(change.counterStrike)}; check it still suits the work.${note}`,
    };
  }
  const erect = booking.confirmedErect ? formatDay(booking.confirmedErect) : 'not set';
  const strike = booking.confirmedStrike ? formatDay(booking.confirmedStrike) : 'not set';
  return {
    severity: 'info',
    summary: `${booking.supplierName} accepted the new dates`,
    detail: `The ${kind}${forJobs} is confirmed up ${erect}, down ${strike}.`,
  };
}
