import type { JobDto, JobHistoryEntryDto, JobInput, JobListQuery, JobStatus, Page } from '@hodboard/shared';
import { http } from './http';

export type JobQuery = Partial<JobListQuery>;

export function listJobs(query: JobQuery = {}): Promise<Page<JobDto>> {
  return http.get<Page<JobDto>>('/jobs', { query });
}

export function getJob(id: string): Promise<JobDto> {
  return http.get<JobDto>(`/jobs/${encodeURIComponent(id)}`);
}

export function createJob(input: JobInput): Promise<JobDto> {
  return http.post<JobDto>('/jobs', input);
}

export function updateJob(id: string, input: JobInput, version: number): Promise<JobDto> {
  return http.put<JobDto>(`/jobs/${encodeURIComponent(id)}`, { ...input, version });
}

export function changeJobStatus(id: string, status: JobStatus, version: number): Promise<JobDto> {
  return http.post<JobDto>(`/jobs/${encodeURIComponent(id)}/status`, { status, version });
}

export function getJobHistory(id: string): Promise<JobHistoryEntryDto[]> {
  return http.get<JobHistoryEntryDto[]>(`/jobs/${encodeURIComponent(id)}/history`);
}
