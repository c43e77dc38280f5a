import type {
  PublicQuoteDto,
  QuoteAcceptedDto,
  QuoteContentInput,
  QuoteDto,
  QuoteStatus,
  QuoteSummaryDto,
} from '@hodboard/shared';
import { http } from './http';
import { fetchAuthorisedBlob } from './materials';

const one = (id: string) => `/quotes/${encodeURIComponent(id)}`;
const link = (token: string) => `/public/quotes/${encodeURIComponent(token)}`;

export function listQuotes(query: { jobId?: string; status?: QuoteStatus } = {}): Promise<QuoteSummaryDto[]> {
  return http.get<QuoteSummaryDto[]>('/quotes', { query });
}

export function getQuote(id: string): Promise<QuoteDto> {
  return http.get<QuoteDto>(one(id));
}

export function createQuote(jobId: string, content: QuoteContentInput): Promise<QuoteDto> {
  return http.post<QuoteDto>('/quotes', { jobId, content });
}

export function saveQuote(id: string, content: QuoteContentInput, version: number): Promise<QuoteDto> {
  return http.put<QuoteDto>(one(id), { content, version });
}

export function sendQuote(id: string, version: number, email?: string): Promise<QuoteDto> {
  return http.post<QuoteDto>(`${one(id)}/send`, { version, ...(email ? { email } : {}) });
}

export function reviseQuote(id: string, version: number): Promise<QuoteDto> {
  return http.post<QuoteDto>(`${one(id)}/revise`, { version });
}

/** The PDF needs the bearer token, so it is fetched here and shown from a blob URL. */
export function fetchQuotePdf(id: string, versionNumber?: number): Promise<Blob> {
  return fetchAuthorisedBlob(`${one(id)}/pdf${versionNumber ? `?version=${versionNumber}` : ''}`);
}

export function publicQuotePdfUrl(token: string, download = false): string {
  return `/api${link(token)}/pdf${download ? '?download=1' : ''}`;
}

export function getPublicQuote(token: string): Promise<PublicQuoteDto> {
  return http.get<PublicQuoteDto>(link(token), { skipRefresh: true });
}

export function acceptQuote(token: string, name: string, agree: boolean): Promise<QuoteAcceptedDto> {
  return http.post<QuoteAcceptedDto>(`${link(token)}/accept`, { name, agree }, { skipRefresh: true });
}

export function declineQuote(token: string, reason: string): Promise<PublicQuoteDto> {
  return http.post<PublicQuoteDto>(`${link(token)}/decline`, { reason }, { skipRefresh: true });
}

export function startDepositPayment(token: string): Promise<{ url: string }> {
  return http.post<{ url: string }>(`${link(token)}/deposit`, undefined, { skipRefresh: true });
}
