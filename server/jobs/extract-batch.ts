import type { AppContext } from '../context';
import { extractDocuments } from '../documents/extract-documents';
import type { ExtractBatchPayload } from '../documents/ingest';
import { JobAborted, type JobHandler } from './runner';

/**
 * extract-batch: extracts text and metadata of a batch's pending documents (e-mail
 * attachments included) one by one, then folds them into the matter's concept space or
 * queues its first build.
 */
export function extractBatchHandler(ctx: AppContext): JobHandler<ExtractBatchPayload> {
  return {
    async run({ job, payload, signal, progress }) {
      const total = payload.documentIds.length;
      const outcome = await extractDocuments(ctx, payload.documentIds, {
        reserved: payload.reserved,
        signal,
        onProgress: (done, _total, current) =>
          progress({
            progress: done,
            total,
            message: current ? `Extracting ${done + 1} of ${total}: ${current}` : 'Extracted',
          }),
      });
      if (signal.aborted) throw new JobAborted();
      let indexNote = '';
      if (job.matter_id !== null && outcome.extracted.length > 0) {
        await progress({ message: 'Adding the documents to the concept index' });
        const { folded, queuedBuild } = await ctx.index.afterExtraction(job.matter_id);
        indexNote = queuedBuild
          ? '; index build queued'
          : folded > 0
            ? `; ${folded} folded into the index`
            : '';
      }
      return `${outcome.extracted.length} extracted, ${outcome.failed.length} failed${indexNote}`;
    },
    async requeue(job, payload) {
      // Documents it had not finished are pending (or stuck 'extracting'): queue them again.
      await ctx.db
        .updateTable('documents')
        .set({ extract_status: 'pending' })
        .where('id', 'in', payload.documentIds.length ? payload.documentIds : [-1])
        .where('extract_status', '=', 'extracting')
        .execute();
      await ctx.jobs.enqueue(ctx.db, {
        matterId: job.matter_id,
        kind: 'extract-batch',
        payload,
        total: payload.documentIds.length,
        createdBy: job.created_by,
        message: 'Re-queued after a restart',
      });
    },
  };
}
