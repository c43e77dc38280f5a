import type {
  HoldWithdrawInput,
  ReplanInput,
  ReplanPreviewDto,
  WeatherHoldDto,
  WeatherHoldInput,
  WeatherLimitOverrides,
  WeatherLimitsDto,
  WeatherOutlookDto,
} from '@hodboard/shared';
import { http } from './http';

const id = (value: string) => encodeURIComponent(value);

export interface WeatherHoldQuery {
  jobId?: string;
  status?: WeatherHoldDto['status'];
}

export interface WeatherLossSummary {
  byJob: Array<{ jobId: string; days: number }>;
  byCrew: Array<{ crewId: string; days: number }>;
}

export function listWeatherHolds(query: WeatherHoldQuery = {}): Promise<WeatherHoldDto[]> {
  return http.get<WeatherHoldDto[]>('/weather-holds', { query: { ...query } });
}

export function raiseWeatherHold(input: WeatherHoldInput): Promise<WeatherHoldDto> {
  return http.post<WeatherHoldDto>('/weather-holds', input);
}

export function previewReplan(holdId: string, input: ReplanInput): Promise<ReplanPreviewDto> {
  return http.post<ReplanPreviewDto>(`/weather-holds/${id(holdId)}/preview`, input);
}

export function commitReplan(holdId: string, input: ReplanInput): Promise<ReplanPreviewDto> {
  return http.post<ReplanPreviewDto>(`/weather-holds/${id(holdId)}/commit`, input);
}

export function withdrawWeatherHold(holdId: string, input: HoldWithdrawInput): Promise<WeatherHoldDto> {
  return http.post<WeatherHoldDto>(`/weather-holds/${id(holdId)}/withdraw`, input);
}

export function getWeatherLossSummary(): Promise<WeatherLossSummary> {
  return http.get<WeatherLossSummary>('/weather-holds/summary');
}

export function getWeatherOutlook(days = 7): Promise<WeatherOutlookDto> {
  return http.get<WeatherOutlookDto>('/weather/outlook', { query: { days } });
}

export function refreshForecasts(siteId?: string): Promise<{ refreshed: number; failed: number }> {
  return http.post<{ refreshed: number; failed: number }>('/weather/refresh', siteId ? { siteId } : {});
}

export function getWeatherLimits(): Promise<WeatherLimitsDto> {
  return http.get<WeatherLimitsDto>('/weather/limits');
}

export function updateWeatherLimits(overrides: WeatherLimitOverrides, version: number): Promise<WeatherLimitsDto> {
  return http.put<WeatherLimitsDto>('/weather/limits', { overrides, version });
}
