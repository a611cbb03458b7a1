import type { AddReportInput, ReportInput } from '@shared/schemas/tickets';
import { PHOTO_FIELD, REPORT_FIELD } from '@shared/schemas/tickets';
import { api, type ProgressHandler } from '@/lib/api-client';

export interface SentReport {
  id: number;
  /** True when the server had this report already (a resend after a lost answer). */
  duplicate?: boolean;
}

function form(body: unknown, photos: readonly { blob: Blob; name: string }[]) {
  const data = new FormData();
  data.append(REPORT_FIELD, JSON.stringify(body));
  for (const p of photos) data.append(PHOTO_FIELD, p.blob, p.name);
  return data;
}

/** A new report with its photos in one multipart request, with upload progress. */
export function createReport(
  input: ReportInput,
  photos: readonly { blob: Blob; name: string }[],
  onProgress?: ProgressHandler,
  signal?: AbortSignal,
) {
  return api.upload<SentReport>('/api/tickets', form(input, photos), onProgress, { signal });
}

/** "I see it too": the report goes onto an open ticket instead. */
export function addReport(
  ticketId: number,
  input: AddReportInput,
  photos: readonly { blob: Blob; name: string }[],
  onProgress?: ProgressHandler,
  signal?: AbortSignal,
) {
  return api.upload<SentReport>(`/api/tickets/${ticketId}/reports`, form(input, photos), onProgress, { signal });
}
