import type { TermReportReq } from '@shared/schemas/search-term-report';
import { ApiError } from '@/lib/api-client';

/**
 * POST /api/matters/:matterId/search-term-report.csv, saved as a file. Audited as an
 * export. A POST (the terms may be long), so the browser is handed the body as a blob.
 */
export async function downloadTermReport(matterId: number, request: TermReportReq) {
  const response = await fetch(`/api/matters/${matterId}/search-term-report.csv`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Accept: 'text/csv' },
    body: JSON.stringify(request),
    credentials: 'same-origin',
  });
  if (!response.ok) {
    const body = (await response.json().catch(() => null)) as {
      error?: { code: string; message: string };
    } | null;
    throw new ApiError(
      response.status,
      body?.error?.code ?? 'internal_error',
      body?.error?.message ?? 'The download failed.',
    );
  }
  const disposition = response.headers.get('Content-Disposition') ?? '';
  const filename = /filename="([^"]+)"/.exec(disposition)?.[1] ?? 'search-term-report.csv';
  const url = URL.createObjectURL(await response.blob());
  const link = document.createElement('a');
  link.href = url;
  link.download = filename;
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
