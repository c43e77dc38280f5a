import { beforeEach, describe, expect, it, vi } from 'vitest';
import { effectScope, ref } from 'vue';
import { createPinia, setActivePinia } from 'pinia';
import type { AccessBookingDto, ResourceChangedMessage } from '@hodboard/shared';
import type { RealtimeClient } from '@/realtime/socket';

const api = vi.hoisted(() => ({ getAccessBooking: vi.fn(), listAccessBookings: vi.fn() }));
const toast = vi.hoisted(() => ({ add: vi.fn() }));
const session = vi.hoisted(() => ({ isSignedIn: true, permissions: new Set<string>(['access:manage']) }));
vi.mock('@/api/access', () => api);
vi.mock('primevue/usetoast', () => ({ useToast: () => toast }));
vi.mock('@/stores/session-store', () => ({
  useSessionStore: () => ({ get isSignedIn() { return session.isSignedIn; }, hasPermission: (p: string) => session.permissions.has(p) }),
}));

const { useSupplierAnswerNotice } = await import('./use-supplier-answer-notice');
const { describeSupplierAnswer } = await import('./supplier-answer-text');
// Loaded once here, as a page that has used them would have: the composable's own imports then resolve at once.
await import('@/stores/access-store');

/** Lets the next paint pass, after which the connection loads, and the lazily loaded connection, store and words arrive. */
const settle = async () => {
  await new Promise((resolve) => requestAnimationFrame(() => setTimeout(resolve)));
  await new Promise((resolve) => setTimeout(resolve, 0));
};

function booking(overrides: Partial<AccessBookingDto> = {}): AccessBookingDto {
  return {
    id: 'b1', jobIds: ['j1'], jobReferences: ['J-0107'], accessType: 'scaffold', supplierId: 's1', supplierName: 'Lofty Poles Scaffolding',
    state: 'confirmed', requestedErect: '2027-02-26', requestedStrike: '2027-03-04', confirmedErect: '2027-03-09', confirmedStrike: '2027-03-15',
    neededErect: '2027-03-09', neededStrike: '2027-03-15', weeklyRate: 18_000, minimumWeeks: 2, curingDays: 0, reference: null, notes: null, hire: null,
    inspection: { status: 'none', nextDue: null, lastInspectedOn: null, reasons: [], source: null, adverseDays: [] },
    pendingChange: null, handover: null, hasNoWork: false, cancelledBecause: null, version: 3, ...overrides,
  };
}

function fakeRealtime() {
  const listeners = new Set<(message: ResourceChangedMessage) => void>();
  const client = {
    status: ref('offline'),
    start: vi.fn(),
    stop: vi.fn(),
    onScheduleChanged: vi.fn(() => () => undefined),
    onConnected: vi.fn(() => () => undefined),
    onResourceChanged: (listener: (message: ResourceChangedMessage) => void) => {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  } as unknown as RealtimeClient;
  const push = async (message: ResourceChangedMessage) => {
    for (const listener of listeners) listener(message);
    // Let the booking fetch and the toast that follows it settle.
    for (let i = 0; i < 5; i += 1) await new Promise((resolve) => setTimeout(resolve, 0));
  };
  return { client, push, listeners };
}

describe('useSupplierAnswerNotice', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.clearAllMocks();
    session.isSignedIn = true;
    session.permissions = new Set(['access:manage']);
  });

  it('opens the live connection for the office and shows who accepted which dates, whatever page is open', async () => {
    const live = fakeRealtime();
    api.getAccessBooking.mockResolvedValue(booking());
    const scope = effectScope();
    scope.run(() => useSupplierAnswerNotice(async () => live.client));
    await settle();
    expect(live.client.start).toHaveBeenCalledTimes(1);

    await live.push({ type: 'access:answered', id: 'b1', version: 3 });
    expect(api.getAccessBooking).toHaveBeenCalledWith('b1');
    expect(toast.add).toHaveBeenCalledTimes(1);
    expect(toast.add.mock.calls[0]![0]).toEqual({
      severity: 'info',
      summary: 'Lofty Poles Scaffolding accepted the new dates',
      detail: 'The scaffold for J-0107 is confirmed up Tue 9 Mar 2027, down Mon 15 Mar 2027.',
      life: 12_000,
    });
    scope.stop();
  });

  it('asks the office to check a counter-proposal, with the supplier’s dates and note', async () => {
    const live = fakeRealtime();
    api.getAccessBooking.mockResolvedValue(booking({
      confirmedErect: '2027-03-08', confirmedStrike: '2027-03-16',
      pendingChange: {
        id: 'r1', status: 'countered', oldErect: '2027-02-26', oldStrike: '2027-03-04', newErect: '2027-03-09', newStrike: '2027-03-15',
        counterErect: '2027-03-08', counterStrike: '2027-03-16', supplierNote: 'Crew free Monday only', createdAt: '2027-02-01T09:00:00Z', answeredAt: '2027-02-02T09:00:00Z',
      },
    }));
    const scope = effectScope();
    scope.run(() => useSupplierAnswerNotice(async () => live.client));
    await settle();
    await live.push({ type: 'access:answered', id: 'b1', version: 4 });
    expect(toast.add.mock.calls[0]![0]).toMatchObject({
      severity: 'warn',
      summary: 'Lofty Poles Scaffolding proposed other dates',
      detail: 'The scaffold for J-0107 is now booked up Mon 8 Mar 2027, down Tue 16 Mar 2027; check it still suits the work. Their note: “Crew free Monday only”',
    });
    scope.stop();
  });

  it('says nothing for other access changes, and stops listening when its page is gone', async () => {
    const live = fakeRealtime();
    api.getAccessBooking.mockResolvedValue(booking());
    const scope = effectScope();
    scope.run(() => useSupplierAnswerNotice(async () => live.client));
    await settle();
    await live.push({ type: 'access:updated', id: 'b1', version: 3 });
    scope.stop();
    expect(live.listeners.size).toBe(0);
    await live.push({ type: 'access:answered', id: 'b1', version: 3 });
    expect(toast.add).not.toHaveBeenCalled();
  });

  it('leaves a crew lead, who does not manage access, without the notice or the connection', async () => {
    session.permissions = new Set(['inspections:record']);
    const live = fakeRealtime();
    const scope = effectScope();
    scope.run(() => useSupplierAnswerNotice(async () => live.client));
    await settle();
    await live.push({ type: 'access:answered', id: 'b1', version: 3 });
    expect(live.client.start).not.toHaveBeenCalled();
    expect(api.getAccessBooking).not.toHaveBeenCalled();
    expect(toast.add).not.toHaveBeenCalled();
    scope.stop();
  });

  it('names several jobs sharing the booking, and leaves the job out when it has no reference', () => {
    expect(describeSupplierAnswer(booking({ jobReferences: ['J-0107', 'J-0108'] })).detail).toContain('scaffold for J-0107, J-0108 is confirmed');
    expect(describeSupplierAnswer(booking({ jobReferences: [''] })).detail).toMatch(/^The scaffold is confirmed/);
  });
});
