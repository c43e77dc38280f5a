import { onScopeDispose, watch } from 'vue';
import { useToast } from 'primevue/usetoast';
import { accessTypeLabels, type AccessBookingDto } from '@hodboard/shared';
import { realtime as appRealtime, type RealtimeClient } from '@/realtime/socket';
import { useAccessStore } from '@/stores/access-store';
import { useSessionStore } from '@/stores/session-store';
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

/**
 * Tells the office the moment a supplier answers a date change, on whichever page they are: the answer arrives from
 * outside the firm, so nobody in the office is watching for it.
 */
export function useSupplierAnswerNotice(client: RealtimeClient = appRealtime): void {
  const toast = useToast();
  const session = useSessionStore();
  const access = useAccessStore();
  const canHear = () => session.isSignedIn && session.hasPermission('access:manage');

  const stopWatch = watch(canHear, (can) => can && client.start(), { immediate: true });
  const stopListening = client.onResourceChanged((message) => {
    if (message.type !== 'access:answered' || !canHear()) return;
    void access
      .refreshOne(message.id)
      .then(() => {
        const booking = access.bookings[message.id];
        if (booking) toast.add({ ...describeSupplierAnswer(booking), life: 12_000 });
      })
      .catch(() => undefined);
  });
  onScopeDispose(() => {
    stopWatch();
    stopListening();
  });
}
