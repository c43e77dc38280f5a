import type { PhotoDto, PhotoSettings } from '@hodboard/shared';
import { ApiError, http, toProblem } from './http';

export interface PhotoUpload {
  jobId: string;
  file: Blob;
  fileName: string;
  caption?: string | null;
  idempotencyKey?: string;
}

function send(upload: PhotoUpload, token: string | null, onProgress?: (fraction: number) => void): Promise<{ status: number; statusText: string; body: unknown }> {
  return new Promise((resolve, reject) => {
    const form = new FormData();
    form.set('jobId', upload.jobId);
    if (upload.caption) form.set('caption', upload.caption);
    if (upload.idempotencyKey) form.set('idempotencyKey', upload.idempotencyKey);
    form.set('photo', upload.file, upload.fileName);
    // XMLHttpRequest, because fetch cannot report upload progress.
    const xhr = new XMLHttpRequest();
    xhr.open('POST', '/api/photos');
    xhr.withCredentials = true;
    xhr.setRequestHeader('Accept', 'application/json, application/problem+json');
    if (token) xhr.setRequestHeader('Authorization', `Bearer ${token}`);
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress?.(Math.min(1, event.loaded / event.total));
    };
    xhr.onload = () => {
      let body: unknown = undefined;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
      } catch {
        body = xhr.responseText;
      }
      resolve({ status: xhr.status, statusText: xhr.statusText, body });
    };
    xhr.onerror = () =>
      reject(new ApiError({ type: 'about:blank', title: 'Network error', status: 0, code: 'service-unavailable', detail: 'No connection; the photo will be sent when the signal is back.' }));
    xhr.send(form);
  });
}

/** Uploads one photo with progress; a 401 renews the session once, as every other request does. */
export async function uploadPhoto(upload: PhotoUpload, onProgress?: (fraction: number) => void): Promise<PhotoDto> {
  let result = await send(upload, http.getAccessToken(), onProgress);
  if (result.status === 401 && (await http.refresh())) result = await send(upload, http.getAccessToken(), onProgress);
  if (result.status < 200 || result.status >= 300) throw new ApiError(toProblem(result.status, result.statusText, result.body));
  return result.body as PhotoDto;
}

export function getPhotoSettings(): Promise<PhotoSettings> {
  return http.get<PhotoSettings>('/photos/settings');
}

export function savePhotoSettings(settings: PhotoSettings): Promise<PhotoSettings> {
  return http.put<PhotoSettings>('/photos/settings', settings);
}
