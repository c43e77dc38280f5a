import type { MaterialDto, MaterialImportResultDto, MaterialInput } from '@hodboard/shared';
import { ApiError, http, toProblem } from './http';

export function listMaterials(q?: string): Promise<MaterialDto[]> {
  return http.get<MaterialDto[]>('/materials', { query: { q } });
}

export function createMaterial(input: MaterialInput): Promise<MaterialDto> {
  return http.post<MaterialDto>('/materials', input);
}

export function updateMaterial(id: string, input: MaterialInput, version: number): Promise<MaterialDto> {
  return http.put<MaterialDto>(`/materials/${encodeURIComponent(id)}`, { ...input, version });
}

export function deleteMaterial(id: string): Promise<void> {
  return http.delete(`/materials/${encodeURIComponent(id)}`);
}

async function authorised(path: string, init: RequestInit = {}): Promise<Response> {
  const send = () => {
    const token = http.getAccessToken();
    return fetch(`/api${path}`, {
      ...init,
      credentials: 'include',
      headers: { ...(init.headers as Record<string, string>), ...(token ? { Authorization: `Bearer ${token}` } : {}) },
    });
  };
  let response = await send();
  if (response.status === 401 && (await http.refresh())) response = await send();
  if (!response.ok) {
    const text = await response.text();
    let body: unknown = text;
    try {
      body = JSON.parse(text);
    } catch {
      // Not JSON: toProblem falls back to the status.
    }
    throw new ApiError(toProblem(response.status, response.statusText, body));
  }
  return response;
}

/** CSV goes as text/csv: a price list can be larger than the JSON limit. */
export async function importMaterialsCsv(csv: string): Promise<MaterialImportResultDto> {
  const response = await authorised('/materials/import', { method: 'POST', body: csv, headers: { 'Content-Type': 'text/csv' } });
  return (await response.json()) as MaterialImportResultDto;
}

export async function exportMaterialsCsv(): Promise<Blob> {
  return (await authorised('/materials/export')).blob();
}

export async function fetchAuthorisedBlob(path: string): Promise<Blob> {
  return (await authorised(path)).blob();
}
