import { apiErrorSchema } from '@shared/errors';
import { ApiError } from '@/lib/api-client';

/**
 * POST /api/matters/:matterId/documents, multipart: the files in the field `files` and
 * an optional `custodian`. fetch() cannot report upload progress, so this one call uses
 * XMLHttpRequest and its `upload.onprogress` events (XMLHttpRequest Living Standard,
 * "upload" attribute). The CSRF check reads the Origin header, which the browser adds to
 * a same-origin XHR POST as it does to fetch.
 */
export interface UploadProgress {
  /** Bytes of the request body sent so far. */
  loaded: number;
  /** Bytes of the whole request body (multipart framing included). */
  total: number;
}

export interface UploadRequest {
  matterId: number;
  files: readonly File[];
  custodian?: string;
  onProgress?: (progress: UploadProgress) => void;
  signal?: AbortSignal;
}

export function uploadDocuments<T>({
  matterId,
  files,
  custodian,
  onProgress,
  signal,
}: UploadRequest): Promise<T> {
  const form = new FormData();
  // The custodian goes first so a streaming parser knows it before the first file.
  if (custodian) form.append('custodian', custodian);
  for (const file of files) form.append('files', file, file.name);

  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api/matters/${matterId}/documents`);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.withCredentials = true;
    xhr.responseType = 'text';

    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress?.({ loaded: event.loaded, total: event.total });
    };
    xhr.onload = () => {
      let body: unknown = undefined;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
      } catch {
        body = undefined;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        resolve(body as T);
        return;
      }
      const parsed = apiErrorSchema.safeParse(body);
      reject(
        parsed.success
          ? new ApiError(
              xhr.status,
              parsed.data.error.code,
              parsed.data.error.message,
              parsed.data.error.field,
            )
          : new ApiError(
              xhr.status,
              xhr.status === 413 ? 'payload_too_large' : 'internal_error',
              xhr.status === 413
                ? 'The upload is larger than the server accepts in one request.'
                : `The server answered ${xhr.status} ${xhr.statusText}.`,
            ),
      );
    };
    xhr.onerror = () =>
      reject(
        new ApiError(
          0,
          'network_error',
          'The upload was interrupted: Quarry could not reach the server. Try again.',
        ),
      );
    xhr.onabort = () => reject(new DOMException('The upload was cancelled.', 'AbortError'));

    if (signal) {
      if (signal.aborted) {
        reject(new DOMException('The upload was cancelled.', 'AbortError'));
        return;
      }
      signal.addEventListener('abort', () => xhr.abort(), { once: true });
    }
    xhr.send(form);
  });
}

/**
 * Spreads a request's byte progress over the files it carries. FormData serialises its
 * entries in order (HTML Standard, "multipart/form-data encoding algorithm"), so file i
 * occupies the bytes after files 0..i-1; the framing (boundary and part headers, a few
 * hundred bytes per part) is spread evenly. Returns a fraction 0..1 per file.
 */
export function perFileFractions(sizes: readonly number[], progress: UploadProgress): number[] {
  const payload = sizes.reduce((sum, size) => sum + size, 0);
  const framing = Math.max(0, progress.total - payload);
  const framingPerPart = sizes.length ? framing / sizes.length : 0;
  let start = 0;
  return sizes.map((size) => {
    const span = size + framingPerPart;
    const sent = Math.min(Math.max(progress.loaded - start, 0), span);
    start += span;
    return span === 0 ? (progress.loaded >= start ? 1 : 0) : sent / span;
  });
}
