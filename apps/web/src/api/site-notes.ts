import type { SiteNoteDto, SiteNoteInput } from '@hodboard/shared';
import { http } from './http';

export function addSiteNote(input: SiteNoteInput): Promise<SiteNoteDto> {
  return http.post<SiteNoteDto>('/site-notes', input);
}

export function listSiteNotes(jobId: string): Promise<SiteNoteDto[]> {
  return http.get<SiteNoteDto[]>('/site-notes', { query: { jobId } });
}
