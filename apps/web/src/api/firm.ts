import type { FirmDto, FirmSettingsInput } from '@hodboard/shared';
import { http } from './http';

export function getFirm(): Promise<FirmDto> {
  return http.get<FirmDto>('/firm');
}

export function updateFirm(input: FirmSettingsInput, version: number): Promise<FirmDto> {
  return http.put<FirmDto>('/firm', { ...input, version });
}
