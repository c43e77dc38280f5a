import type {
  AccessBookingDto,
  AccessBookingInput,
  AccessState,
  AccessType,
  HandoverInput,
  InspectionInput,
  QuotedHireWeeksDto,
  ScaffoldInspectionDto,
  SupplierDto,
  SupplierInput,
  SupplierLinkDto,
  SupplierResponseInput,
} from '@hodboard/shared';
import { http } from './http';
import { fetchAuthorisedBlob } from './materials';
import { uploadPhoto } from './photos';

const id = (value: string) => encodeURIComponent(value);

export function listSuppliers(): Promise<SupplierDto[]> {
  return http.get<SupplierDto[]>('/suppliers');
}

export function createSupplier(input: SupplierInput): Promise<SupplierDto> {
  return http.post<SupplierDto>('/suppliers', input);
}

export function updateSupplier(supplierId: string, input: SupplierInput, version: number): Promise<SupplierDto> {
  return http.put<SupplierDto>(`/suppliers/${id(supplierId)}`, { ...input, version });
}

export function deleteSupplier(supplierId: string): Promise<void> {
  return http.delete(`/suppliers/${id(supplierId)}`);
}

export interface AccessBookingQuery {
  jobId?: string;
  state?: AccessState;
}

export function listAccessBookings(query: AccessBookingQuery = {}): Promise<AccessBookingDto[]> {
  return http.get<AccessBookingDto[]>('/access-bookings', { query: { ...query } });
}

export function getAccessBooking(bookingId: string): Promise<AccessBookingDto> {
  return http.get<AccessBookingDto>(`/access-bookings/${id(bookingId)}`);
}

/** The weeks priced for this kind of access in the jobs' accepted quotes, which a booking left without weeks priced takes. */
export function getQuotedHireWeeks(jobIds: string[], accessType: AccessType): Promise<QuotedHireWeeksDto> {
  return http.get<QuotedHireWeeksDto>('/access-bookings/quoted-weeks', { query: { jobIds: jobIds.join(','), accessType } });
}

export function createAccessBooking(input: AccessBookingInput): Promise<AccessBookingDto> {
  return http.post<AccessBookingDto>('/access-bookings', input);
}

export interface AccessStateInput {
  state: AccessState;
  confirmedErect?: string;
  confirmedStrike?: string;
  /** With erected: the supplier's handover. */
  handover?: HandoverInput;
  version: number;
}

export function changeAccessState(bookingId: string, input: AccessStateInput): Promise<AccessBookingDto> {
  return http.post<AccessBookingDto>(`/access-bookings/${id(bookingId)}/state`, input);
}

export function recordHandover(bookingId: string, input: HandoverInput, version: number): Promise<AccessBookingDto> {
  return http.put<AccessBookingDto>(`/access-bookings/${id(bookingId)}/handover`, { ...input, version });
}

export function listInspections(bookingId: string): Promise<ScaffoldInspectionDto[]> {
  return http.get<ScaffoldInspectionDto[]>(`/access-bookings/${id(bookingId)}/inspections`);
}

export function recordInspection(bookingId: string, input: InspectionInput): Promise<ScaffoldInspectionDto> {
  return http.post<ScaffoldInspectionDto>(`/access-bookings/${id(bookingId)}/inspections`, input);
}

/** Booking's inspection register as a PDF; it needs the bearer token, so it comes back as a blob to save. */
export function fetchInspectionReport(bookingId: string): Promise<Blob> {
  return fetchAuthorisedBlob(`/access-bookings/${id(bookingId)}/inspections/pdf`);
}

export function discardInspection(bookingId: string, inspectionId: string): Promise<void> {
  return http.delete(`/access-bookings/${id(bookingId)}/inspections/${id(inspectionId)}`);
}

export interface InspectionPhotoFile {
  file: File;
  /** Sent with the upload, so a retry after a dropped signal stores the photo once. */
  key: string;
  /** Set once the photo service has it. */
  photoId?: string;
}

/**
 * Sends the inspection's photos through the job photo upload, one at a time, and returns their ids in order.
 * Photos already sent keep their id, so trying again after a failure sends only the rest.
 */
export async function uploadInspectionPhotos(
  jobId: string,
  photos: InspectionPhotoFile[],
  caption: string,
  onProgress?: (index: number, fraction: number) => void,
): Promise<string[]> {
  for (const [index, photo] of photos.entries()) {
    if (photo.photoId) continue;
    const saved = await uploadPhoto({ jobId, file: photo.file, fileName: photo.file.name || `inspection-${index + 1}.jpg`, caption, idempotencyKey: photo.key }, (fraction) => onProgress?.(index, fraction));
    photo.photoId = saved.id;
    onProgress?.(index, 1);
  }
  return photos.map((photo) => photo.photoId!);
}

/** The supplier's side: the token in their e-mail is the only credential, so a stale session must not be refreshed. */
export function getSupplierLink(token: string): Promise<SupplierLinkDto> {
  return http.get<SupplierLinkDto>(`/public/supplier-links/${id(token)}`, { skipRefresh: true });
}

export function answerSupplierLink(token: string, answer: SupplierResponseInput): Promise<SupplierLinkDto> {
  return http.post<SupplierLinkDto>(`/public/supplier-links/${id(token)}`, answer, { skipRefresh: true });
}
