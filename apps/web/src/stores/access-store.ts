import { defineStore } from 'pinia';
import { computed, ref, shallowRef } from 'vue';
import { accessStateLabels, accessTypeLabels } from '@hodboard/shared';
import type {
  AccessBookingDto,
  AccessBookingInput,
  AccessState,
  AccessType,
  HandoverInput,
  InspectionInput,
  InspectionStatusDto,
  ResourceChangedMessage,
  ScaffoldInspectionDto,
  SupplierDto,
  SupplierInput,
} from '@hodboard/shared';
import * as accessApi from '@/api/access';
import { isApiError } from '@/api/http';
import type { RealtimeClient } from '@/realtime/socket';
import { compareCodes } from '@/utils/compare';

/** What the board draws under a job: the window the access is (or should be) up. */
export interface AccessBandView {
  bookingId: string;
  jobIds: string[];
  accessType: AccessType;
  state: AccessState;
  erect: string;
  strike: string;
  inspection: InspectionStatusDto['status'];
  hasPendingChange: boolean;
}

const liveStates = new Set<AccessState>(['requested', 'confirmed', 'erected']);

/**
 * The same window the API draws: the day it actually went up wins over the confirmed date, which wins over the
 * requested one. Only bookings still in play get a band.
 */
export function bandOf(booking: AccessBookingDto): AccessBandView | null {
  if (!liveStates.has(booking.state)) return null;
  const erect = booking.hire?.erect ?? booking.confirmedErect ?? booking.requestedErect;
  const strike = booking.hire?.strike ?? booking.confirmedStrike ?? booking.requestedStrike;
  if (!erect || !strike) return null;
  return {
    bookingId: booking.id,
    jobIds: booking.jobIds,
    accessType: booking.accessType,
    state: booking.state,
    erect,
    strike,
    inspection: booking.inspection.status,
    hasPendingChange: booking.pendingChange?.status === 'pending',
  };
}

/** The next steps a booking can take, in the order the office usually takes them. */
export const nextStates: Record<AccessState, AccessState[]> = {
  requested: ['confirmed', 'cancelled'],
  confirmed: ['erected', 'requested', 'cancelled'],
  erected: ['struck'],
  struck: [],
  cancelled: ['requested'],
};

export const inspectionStatusLabels: Record<InspectionStatusDto['status'], string> = {
  none: 'Not up yet',
  ok: 'Inspected, in date',
  due: 'Inspection due today',
  overdue: 'Inspection overdue',
  unsafe: 'Marked not safe',
};

/** How a band is named on the board, and what about it needs a look; the grid and the phone list say the same. */
export function bandSummary(band: AccessBandView): { text: string; flags: string[]; isWarn: boolean } {
  const flags: string[] = [];
  if (band.inspection === 'due' || band.inspection === 'overdue' || band.inspection === 'unsafe') flags.push(inspectionStatusLabels[band.inspection]);
  if (band.hasPendingChange) flags.push('New dates asked of the supplier');
  if (band.state === 'requested') flags.push('Not confirmed yet');
  return {
    text: `${accessTypeLabels[band.accessType]} ${accessStateLabels[band.state].toLowerCase()}`,
    flags,
    isWarn: band.inspection === 'overdue' || band.inspection === 'unsafe',
  };
}

export interface AccessWorkNotice {
  /** A few words for a tray card. */
  short: string;
  /** What happened and what the office should do, for the booking card. */
  long: string;
  isWarn: boolean;
}

/**
 * A booking whose jobs no longer have days on the board: still booked (the supplier needs telling), or cancelled by
 * Hodboard with its jobs. Null for a booking in step with its work.
 */
export function accessWorkNotice(booking: AccessBookingDto): AccessWorkNotice | null {
  const kind = accessTypeLabels[booking.accessType];
  if (booking.hasNoWork && booking.state === 'erected') {
    return { short: `${kind} up, no work on the board`, long: `The ${kind.toLowerCase()} is up but none of its work is on the board. Arrange the strike with ${booking.supplierName}, then mark it struck.`, isWarn: true };
  }
  if (booking.hasNoWork) {
    return { short: `${kind} still booked`, long: `None of this booking's work is on the board, but ${booking.supplierName} still holds the dates. Cancel the booking to tell them, or put the job back on the board.`, isWarn: true };
  }
  if (booking.cancelledBecause === 'job-unscheduled') {
    return { short: `${kind} request lapsed`, long: `Cancelled when the job went back to the tray. Request it again once the job is on the board.`, isWarn: false };
  }
  if (booking.cancelledBecause === 'job-cancelled') {
    const told = booking.confirmedErect ? ` ${booking.supplierName} was e-mailed to cancel it.` : '';
    return { short: `${kind} cancelled with the job`, long: `Cancelled with the job.${told}`, isWarn: false };
  }
  return null;
}

export const useAccessStore = defineStore('access', () => {
  const suppliers = shallowRef<SupplierDto[]>([]);
  const bookings = ref<Record<string, AccessBookingDto>>({});
  const isLoading = ref(false);
  const hasLoadedAll = ref(false);
  const error = shallowRef<unknown>(null);
  const savingIds = ref<Set<string>>(new Set());
  /** Jobs whose bookings this session has asked for; live updates refresh only what someone is looking at. */
  const watchedJobIds = new Set<string>();
  let unbind: (() => void) | null = null;

  const bookingList = computed(() =>
    Object.values(bookings.value).sort((a, b) => compareCodes(a.hire?.erect ?? a.requestedErect ?? '', b.hire?.erect ?? b.requestedErect ?? '') || compareCodes(a.id, b.id)),
  );

  const bandsByJob = computed(() => {
    const byJob = new Map<string, AccessBandView[]>();
    for (const booking of bookingList.value) {
      const band = bandOf(booking);
      if (!band) continue;
      for (const jobId of band.jobIds) byJob.set(jobId, [...(byJob.get(jobId) ?? []), band]);
    }
    return byJob;
  });

  function bookingsForJob(jobId: string): AccessBookingDto[] {
    return bookingList.value.filter((booking) => booking.jobIds.includes(jobId));
  }

  function put(booking: AccessBookingDto): void {
    const existing = bookings.value[booking.id];
    if (existing && existing.version > booking.version) return;
    bookings.value[booking.id] = booking;
  }

  async function loadAll(): Promise<void> {
    isLoading.value = true;
    error.value = null;
    try {
      const list = await accessApi.listAccessBookings();
      bookings.value = Object.fromEntries(list.map((booking) => [booking.id, booking]));
      hasLoadedAll.value = true;
    } catch (caught) {
      error.value = caught;
    } finally {
      isLoading.value = false;
    }
  }

  async function loadForJob(jobId: string): Promise<void> {
    watchedJobIds.add(jobId);
    const list = await accessApi.listAccessBookings({ jobId });
    for (const booking of Object.values(bookings.value)) {
      if (booking.jobIds.includes(jobId) && !list.some((b) => b.id === booking.id)) delete bookings.value[booking.id];
    }
    for (const booking of list) put(booking);
  }

  async function refreshOne(bookingId: string): Promise<void> {
    try {
      put(await accessApi.getAccessBooking(bookingId));
    } catch (caught) {
      if (isApiError(caught, 'not-found')) delete bookings.value[bookingId];
      else throw caught;
    }
  }

  async function loadSuppliers(): Promise<SupplierDto[]> {
    suppliers.value = (await accessApi.listSuppliers()).sort((a, b) => a.name.localeCompare(b.name));
    return suppliers.value;
  }

  async function saveSupplier(input: SupplierInput, existing: SupplierDto | null): Promise<SupplierDto> {
    const saved = existing ? await accessApi.updateSupplier(existing.id, input, existing.version) : await accessApi.createSupplier(input);
    suppliers.value = [...suppliers.value.filter((s) => s.id !== saved.id), saved].sort((a, b) => a.name.localeCompare(b.name));
    return saved;
  }

  async function removeSupplier(supplierId: string): Promise<void> {
    await accessApi.deleteSupplier(supplierId);
    suppliers.value = suppliers.value.filter((s) => s.id !== supplierId);
  }

  async function saving<T>(id: string, task: () => Promise<T>): Promise<T> {
    savingIds.value = new Set(savingIds.value).add(id);
    try {
      return await task();
    } finally {
      const next = new Set(savingIds.value);
      next.delete(id);
      savingIds.value = next;
    }
  }

  async function create(input: AccessBookingInput): Promise<AccessBookingDto> {
    const created = await accessApi.createAccessBooking(input);
    for (const jobId of created.jobIds) watchedJobIds.add(jobId);
    put(created);
    return created;
  }

  /** Optimistic: the booking shows its new state at once and goes back if the server refuses. */
  async function changeState(
    bookingId: string,
    state: AccessState,
    extra: { confirmedErect?: string; confirmedStrike?: string; handover?: HandoverInput } = {},
  ): Promise<AccessBookingDto> {
    const before = bookings.value[bookingId];
    if (!before) throw new Error('That booking is no longer listed.');
    bookings.value[bookingId] = { ...before, state };
    try {
      const saved = await saving(bookingId, () => accessApi.changeAccessState(bookingId, { state, ...extra, version: before.version }));
      bookings.value[bookingId] = saved;
      return saved;
    } catch (caught) {
      if (bookings.value[bookingId]?.state === state) bookings.value[bookingId] = before;
      if (isApiError(caught, 'stale-version')) void refreshOne(bookingId).catch(() => undefined);
      throw caught;
    }
  }

  async function recordHandover(bookingId: string, input: HandoverInput): Promise<AccessBookingDto> {
    const before = bookings.value[bookingId];
    if (!before) throw new Error('That booking is no longer listed.');
    try {
      const saved = await saving(bookingId, () => accessApi.recordHandover(bookingId, input, before.version));
      put(saved);
      return saved;
    } catch (caught) {
      if (isApiError(caught, 'stale-version')) void refreshOne(bookingId).catch(() => undefined);
      throw caught;
    }
  }

  async function recordInspection(bookingId: string, input: InspectionInput): Promise<ScaffoldInspectionDto> {
    const saved = await saving(bookingId, () => accessApi.recordInspection(bookingId, input));
    await refreshOne(bookingId);
    return saved;
  }

  /** A push for the office room: refresh the one booking if anything on screen shows it. */
  function applyEvent(message: ResourceChangedMessage): Promise<void> | undefined {
    if (!message.type.startsWith('access:')) return undefined;
    const known = bookings.value[message.id];
    if (!known && !hasLoadedAll.value && watchedJobIds.size === 0) return undefined;
    return refreshOne(message.id).catch(() => undefined);
  }

  /** Idempotent: every view showing access calls it; the store listens once for the life of the app. */
  function bindRealtime(client: RealtimeClient): void {
    if (unbind) return;
    client.start();
    unbind = client.onResourceChanged((message) => void applyEvent(message));
  }

  function clear(): void {
    bookings.value = {};
    suppliers.value = [];
    hasLoadedAll.value = false;
    watchedJobIds.clear();
  }

  return {
    suppliers,
    bookings,
    bookingList,
    bandsByJob,
    isLoading,
    hasLoadedAll,
    error,
    savingIds,
    bookingsForJob,
    loadAll,
    loadForJob,
    refreshOne,
    loadSuppliers,
    saveSupplier,
    removeSupplier,
    create,
    changeState,
    recordHandover,
    recordInspection,
    applyEvent,
    bindRealtime,
    clear,
  };
});
