import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { AccessBookingDto } from '@hodboard/shared';
import { ApiError } from '@/api/http';

const api = vi.hoisted(() => ({
  listSuppliers: vi.fn(),
  createSupplier: vi.fn(),
  updateSupplier: vi.fn(),
  deleteSupplier: vi.fn(),
  listAccessBookings: vi.fn(),
  getAccessBooking: vi.fn(),
  createAccessBooking: vi.fn(),
  changeAccessState: vi.fn(),
  listInspections: vi.fn(),
  recordInspection: vi.fn(),
}));
vi.mock('@/api/access', () => api);

const { accessWorkNotice, bandOf, useAccessStore } = await import('./access-store');

const jobA = 'bbbbbbbb-0000-4000-8000-000000000001';
const jobB = 'bbbbbbbb-0000-4000-8000-000000000002';

function booking(id: string, overrides: Partial<AccessBookingDto> = {}): AccessBookingDto {
  return {
    id, jobIds: [jobA], jobReferences: ['J-101'], accessType: 'scaffold', supplierId: 'sup-1', supplierName: 'Tallpole Hire',
    state: 'requested', requestedErect: '2027-03-01', requestedStrike: '2027-03-12', confirmedErect: null, confirmedStrike: null,
    neededErect: '2027-03-01', neededStrike: '2027-03-12', weeklyRate: 18_000, minimumWeeks: 2, curingDays: 0, reference: null, notes: null,
    hire: { erect: '2027-03-01', strike: '2027-03-12', hireDays: 12, chargedWeeks: 2, pence: 36_000, pricedWeeks: 2, overPricedPence: 0 },
    inspection: { status: 'none', nextDue: null, lastInspectedOn: null, reasons: [], source: null, adverseDays: [] },
    pendingChange: null, handover: null, hasNoWork: false, cancelledBecause: null, version: 1, ...overrides,
  };
}

function stale(): ApiError {
  return new ApiError({ type: 'about:blank', title: 'Conflict', status: 409, code: 'stale-version' });
}

describe('access store', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    for (const fn of Object.values(api)) fn.mockReset();
  });

  it.each([
    ['requested uses the requested dates', booking('a'), { erect: '2027-03-01', strike: '2027-03-12' }],
    ['confirmed dates win over requested ones', booking('b', { state: 'confirmed', hire: null, confirmedErect: '2027-03-02', confirmedStrike: '2027-03-15' }), { erect: '2027-03-02', strike: '2027-03-15' }],
    ['the day it went up wins once erected (the hire window)', booking('c', { state: 'erected', confirmedErect: '2027-03-02', hire: { ...booking('x').hire!, erect: '2027-02-26', strike: '2027-03-15' } }), { erect: '2027-02-26', strike: '2027-03-15' }],
  ])('draws a band where %s', (_name, input, expected) => {
    expect(bandOf(input)).toMatchObject(expected);
  });

  it.each(['struck', 'cancelled'] as const)('draws no band for a %s booking', (state) => {
    expect(bandOf(booking('a', { state }))).toBeNull();
  });

  it.each([
    ['a confirmed booking left without work', { state: 'confirmed', hasNoWork: true, confirmedErect: '2027-03-01' }, 'Scaffold still booked', /Tallpole Hire still holds the dates\. Cancel the booking to tell them/, true],
    ['a scaffold up without work', { state: 'erected', hasNoWork: true, confirmedErect: '2027-03-01' }, 'Scaffold up, no work on the board', /Arrange the strike with Tallpole Hire/, true],
    ['a request that lapsed with the tray', { state: 'cancelled', cancelledBecause: 'job-unscheduled' }, 'Scaffold request lapsed', /went back to the tray/, false],
    ['a confirmed booking cancelled with its job', { state: 'cancelled', cancelledBecause: 'job-cancelled', confirmedErect: '2027-03-01' }, 'Scaffold cancelled with the job', /Tallpole Hire was e-mailed/, false],
  ] as const)('names %s', (_name, overrides, short, long, isWarn) => {
    const notice = accessWorkNotice(booking('a', overrides as Partial<AccessBookingDto>));
    expect(notice).toMatchObject({ short, isWarn });
    expect(notice!.long).toMatch(long);
  });

  it('says nothing of a booking in step with its work, or one the office cancelled itself', () => {
    expect(accessWorkNotice(booking('a'))).toBeNull();
    expect(accessWorkNotice(booking('a', { state: 'cancelled' }))).toBeNull();
    expect(accessWorkNotice(booking('a', { state: 'cancelled', cancelledBecause: 'job-cancelled' }))!.long).toBe('Cancelled with the job.');
  });

  it('lists a booking shared by two jobs under both jobs', async () => {
    api.listAccessBookings.mockResolvedValue([booking('shared', { jobIds: [jobA, jobB] })]);
    const store = useAccessStore();
    await store.loadAll();
    expect(store.bandsByJob.get(jobA)?.map((b) => b.bookingId)).toEqual(['shared']);
    expect(store.bandsByJob.get(jobB)?.map((b) => b.bookingId)).toEqual(['shared']);
  });

  it('shows the new state at once and puts the old one back when the server refuses', async () => {
    api.listAccessBookings.mockResolvedValue([booking('a', { state: 'confirmed', version: 3 })]);
    const store = useAccessStore();
    await store.loadAll();
    let reject!: (error: unknown) => void;
    api.changeAccessState.mockReturnValue(new Promise((_, r) => (reject = r)));
    api.getAccessBooking.mockResolvedValue(booking('a', { state: 'erected', version: 4 }));

    const pending = store.changeState('a', 'erected');
    expect(store.bookings.a?.state).toBe('erected');
    expect(store.savingIds.has('a')).toBe(true);
    expect(api.changeAccessState).toHaveBeenCalledWith('a', { state: 'erected', version: 3 });
    reject(stale());
    await expect(pending).rejects.toBeInstanceOf(ApiError);
    expect(store.savingIds.has('a')).toBe(false);
    // Rolled back first, then the server's newer copy replaces it.
    await vi.waitFor(() => expect(store.bookings.a?.version).toBe(4));
  });

  it('refreshes a booking when the supplier answers, and ignores pushes about other things', async () => {
    api.listAccessBookings.mockResolvedValue([booking('a', { state: 'confirmed', version: 2 })]);
    const store = useAccessStore();
    await store.loadForJob(jobA);
    api.getAccessBooking.mockResolvedValue(booking('a', { state: 'confirmed', confirmedStrike: '2027-03-19', version: 3 }));

    expect(store.applyEvent({ type: 'hold:raised', id: 'a' })).toBeUndefined();
    await store.applyEvent({ type: 'access:answered', id: 'a', version: 3 });
    expect(api.getAccessBooking).toHaveBeenCalledTimes(1);
    expect(store.bookings.a?.confirmedStrike).toBe('2027-03-19');
  });

  it('drops a booking the server no longer has', async () => {
    api.listAccessBookings.mockResolvedValue([booking('a')]);
    const store = useAccessStore();
    await store.loadAll();
    api.getAccessBooking.mockRejectedValue(new ApiError({ type: 'about:blank', title: 'Not found', status: 404, code: 'not-found' }));
    await store.applyEvent({ type: 'access:updated', id: 'a' });
    expect(store.bookings.a).toBeUndefined();
  });

  it('does not let an older copy overwrite a newer one', async () => {
    api.listAccessBookings.mockResolvedValue([booking('a', { version: 5 })]);
    const store = useAccessStore();
    await store.loadAll();
    api.getAccessBooking.mockResolvedValue(booking('a', { version: 4, state: 'cancelled' }));
    await store.refreshOne('a');
    expect(store.bookings.a?.version).toBe(5);
  });
});
