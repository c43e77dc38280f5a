import type { CostingReportDto, CostingSettings, CostingSettingsDto, JobActualInput } from '@hodboard/shared';
import { http } from './http';

export function getCostingSettings(): Promise<CostingSettingsDto> {
  return http.get<CostingSettingsDto>('/costing/settings');
}

export function saveCostingSettings(settings: CostingSettings, version: number): Promise<CostingSettingsDto> {
  return http.put<CostingSettingsDto>('/costing/settings', { ...settings, version });
}

export function getCostingReport(from: string, to: string): Promise<CostingReportDto> {
  return http.get<CostingReportDto>('/costing/report', { query: { from, to } });
}

export function saveJobActual(jobId: string, input: JobActualInput): Promise<void> {
  return http.put<void>(`/costing/actuals/${encodeURIComponent(jobId)}`, input);
}
