import { useQueryClient } from '@tanstack/react-query';
import { useCallback, useEffect, useRef, useState } from 'react';
import type { UploadBatchResponse, UploadedFile } from '@shared/schemas/documents';
import { isApiError } from '@/lib/api-client';
import { describeError } from '@/components/ui';
import { indexStateQueryKey } from '@/features/indexing/api/get-index-state';
import { matterJobsQueryKey } from '@/features/jobs/api/get-matter-jobs';
import { matterQueryOptions } from '@/features/matters/api/get-matter';
import { custodiansQueryKey } from '../api/get-custodians';
import { documentsQueryKey } from '../api/get-documents';
import { perFileFractions, uploadDocuments } from '../api/upload-documents';
import { chunkForUpload, matchResults } from './upload-plan';

/** One file the person picked, from selection to the server's answer. */
export interface UploadItem {
  key: string;
  file: File;
  phase: 'ready' | 'uploading' | 'uploaded' | 'error';
  /** Share of the file's bytes sent, 0..1. */
  fraction: number;
  /** Why the upload itself failed (network, 413, refused). */
  error?: string;
  batchId?: number;
  /** What the server made of it: one row, or one per entry for a .zip. */
  results: UploadedFile[];
}

export interface UploadedBatch {
  id: number;
  jobId: number | null;
  skipped: UploadBatchResponse['skipped'];
}

let sequence = 0;

export function useUploadQueue(matterId: number) {
  const queryClient = useQueryClient();
  const [items, setItems] = useState<UploadItem[]>([]);
  const [batches, setBatches] = useState<UploadedBatch[]>([]);
  const [running, setRunning] = useState(false);
  const abortRef = useRef<AbortController | null>(null);

  const patch = useCallback((keys: readonly string[], change: (item: UploadItem) => UploadItem) => {
    const wanted = new Set(keys);
    setItems((list) => list.map((item) => (wanted.has(item.key) ? change(item) : item)));
  }, []);

  const add = useCallback((files: readonly File[]) => {
    setItems((list) => [
      ...list,
      ...files.map((file) => ({
        key: `f${++sequence}`,
        file,
        phase: 'ready' as const,
        fraction: 0,
        results: [],
      })),
    ]);
  }, []);

  const remove = useCallback((key: string) => {
    setItems((list) => list.filter((item) => item.key !== key || item.phase === 'uploading'));
  }, []);

  const clearFinished = useCallback(() => {
    setItems((list) => list.filter((item) => item.phase === 'ready' || item.phase === 'uploading'));
    setBatches([]);
  }, []);

  const refreshAfterUpload = useCallback(async () => {
    await Promise.all([
      queryClient.invalidateQueries({ queryKey: documentsQueryKey(matterId) }),
      queryClient.invalidateQueries({ queryKey: indexStateQueryKey(matterId) }),
      queryClient.invalidateQueries({ queryKey: matterJobsQueryKey(matterId) }),
      queryClient.invalidateQueries({ queryKey: custodiansQueryKey(matterId) }),
      queryClient.invalidateQueries({
        queryKey: matterQueryOptions(matterId).queryKey,
        exact: true,
      }),
    ]);
  }, [queryClient, matterId]);

  const sendChunk = useCallback(
    async (chunk: UploadItem[], custodian: string, signal: AbortSignal): Promise<void> => {
      const keys = chunk.map((item) => item.key);
      const sizes = chunk.map((item) => item.file.size);
      patch(keys, (item) => ({ ...item, phase: 'uploading', fraction: 0, error: undefined }));
      try {
        const batch = await uploadDocuments<UploadBatchResponse>({
          matterId,
          files: chunk.map((item) => item.file),
          custodian: custodian || undefined,
          signal,
          onProgress: (progress) => {
            const fractions = perFileFractions(sizes, progress);
            const byKey = new Map(keys.map((key, index) => [key, fractions[index]]));
            setItems((list) =>
              list.map((item) =>
                byKey.has(item.key) ? { ...item, fraction: byKey.get(item.key) ?? 0 } : item,
              ),
            );
          },
        });
        const matched = matchResults(
          chunk.map((item) => item.file.name),
          batch.files,
        );
        const resultsByKey = new Map(keys.map((key, index) => [key, matched[index]]));
        patch(keys, (item) => ({
          ...item,
          phase: 'uploaded',
          fraction: 1,
          batchId: batch.id,
          results: resultsByKey.get(item.key) ?? [],
        }));
        setBatches((list) => [
          ...list,
          { id: batch.id, jobId: batch.jobId, skipped: batch.skipped },
        ]);
        void refreshAfterUpload();
      } catch (error) {
        if (error instanceof DOMException && error.name === 'AbortError') {
          patch(keys, (item) => ({ ...item, phase: 'ready', fraction: 0 }));
          return;
        }
        // A request over the server's size limit: send its files one by one, so only the
        // file that is really too large fails.
        if (isApiError(error) && error.status === 413 && chunk.length > 1) {
          patch(keys, (item) => ({ ...item, phase: 'ready', fraction: 0 }));
          for (const item of chunk) {
            if (signal.aborted) return;
            await sendChunk([item], custodian, signal);
          }
          return;
        }
        patch(keys, (item) => ({ ...item, phase: 'error', error: describeError(error) }));
      }
    },
    [matterId, patch, refreshAfterUpload],
  );

  /** Sends every file that is ready (or failed to send) with the custodian given. */
  const start = useCallback(
    async (custodian: string) => {
      const pending = items.filter((item) => item.phase === 'ready' || item.phase === 'error');
      if (pending.length === 0) return;
      const controller = new AbortController();
      abortRef.current = controller;
      setRunning(true);
      try {
        for (const chunk of chunkForUpload(pending)) {
          if (controller.signal.aborted) break;
          await sendChunk(chunk, custodian, controller.signal);
        }
      } finally {
        setRunning(false);
        abortRef.current = null;
      }
    },
    [items, sendChunk],
  );

  const cancel = useCallback(() => abortRef.current?.abort(), []);

  // Closing the tab mid-upload would cut the files still on their way: ask first
  // (HTML Standard, "beforeunload"; browsers show their own wording).
  useEffect(() => {
    if (!running) return;
    const warn = (event: BeforeUnloadEvent) => event.preventDefault();
    window.addEventListener('beforeunload', warn);
    return () => window.removeEventListener('beforeunload', warn);
  }, [running]);

  return { items, batches, running, add, remove, clearFinished, start, cancel };
}
