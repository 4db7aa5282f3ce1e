// Loading files into a matter: the one path shared by the upload route, the CLI import and
// the demo seed. Archives are expanded safely, each file's type is decided by its content,
// originals go once into the content-addressed blob store, and every file gets a control
// number in load order in the same transaction that records it.
import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import type {
  CustodianRef,
  SkippedFile,
  UploadBatchResponse,
  UploadedFile,
} from '../../shared/schemas/documents';
import { recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import type { ExtractStatus } from '../db/schema';
import { expandContainer } from '../extraction/containers';
import { sniffFile } from '../extraction/sniff';
import { isContainerKind, type FailureReason, type FileKind } from '../extraction/types';
import { matterNotFound, payloadTooLarge } from '../http/errors';
import { makeTempDir, removeTempDir } from '../storage/temp-dirs';
import { formatControlNumber } from './control-numbers';
import {
  addCustodiansOfCopy,
  findCustodianByName,
  findFirstBySha,
  findMatterForLoad,
  insertBatch,
  insertCustodian,
  insertDocument,
  takeControlSequence,
} from './queries';

export interface Actor {
  id: string | null;
  email: string | null;
  ip: string | null;
}

/** A file on disk to load, with the name and path the person gave it. */
export interface IncomingFile {
  filePath: string;
  /** Path inside the upload or imported folder, "/"-separated (just the name for a single file). */
  relativePath: string;
}

export interface LoadOptions {
  matterId: number;
  custodianName?: string | null;
  source: 'upload' | 'import' | 'demo';
  actor: Actor;
  /** Called after each file is stored (the CLI's progress bar). */
  onFileStored?: (done: number, total: number) => void;
}

/** Payload of an extract-batch job. */
export interface ExtractBatchPayload {
  documentIds: number[];
  /** E-mail document id -> control-number sequences reserved right after it for attachments. */
  reserved?: Record<string, number[]>;
}

// Archive failures that are limits: the request is refused (413) rather than recorded.
const ARCHIVE_LIMIT_SETTINGS: Partial<Record<FailureReason, [string, (c: AppContext) => number]>> =
  {
    'archive exceeds the unpacked-size limit': [
      'QUARRY_MAX_ARCHIVE_UNPACKED_BYTES',
      (c) => c.config.upload.maxArchiveUnpackedBytes,
    ],
    'archive has too many files': [
      'QUARRY_MAX_ARCHIVE_ENTRIES',
      (c) => c.config.upload.maxArchiveEntries,
    ],
    'archive nesting too deep': [
      'QUARRY_MAX_ARCHIVE_DEPTH',
      (c) => c.config.upload.maxArchiveDepth,
    ],
  };

interface PreparedFile {
  sourcePath: string;
  name: string;
  relativePath: string;
  kind: FileKind;
  mime: string;
  /** A failure already known at load time (a broken archive). */
  failure: string | null;
  /** Attachments an e-mail declares, so their control numbers can follow it. */
  attachmentsExpected: number;
}

/**
 * Counts MIME parts marked "Content-Disposition: attachment" (RFC 2183 §2.2). Only used to
 * reserve control numbers next to the e-mail; extraction decides what the attachments are.
 */
async function countDeclaredAttachments(filePath: string): Promise<number> {
  const text = (await readFile(filePath)).toString('latin1');
  return (text.match(/^content-disposition:[ \t]*attachment/gim) ?? []).length;
}

async function prepare(
  ctx: AppContext,
  files: IncomingFile[],
  scratch: string[],
): Promise<{ prepared: PreparedFile[]; skipped: SkippedFile[] }> {
  const prepared: PreparedFile[] = [];
  const skipped: SkippedFile[] = [];
  const { upload } = ctx.config;
  const limits = {
    maxArchiveEntries: upload.maxArchiveEntries,
    maxArchiveUnpackedBytes: upload.maxArchiveUnpackedBytes,
    maxArchiveDepth: upload.maxArchiveDepth,
    maxFileBytes: upload.maxFileBytes,
  };
  // Containers (zip, MBOX, PST) are unpacked here; a mailbox inside a zip is unpacked too,
  // within the nesting limit.
  const add = async (sourcePath: string, relativePath: string, depth: number): Promise<void> => {
    const name = path.posix.basename(relativePath);
    const sniffed = await sniffFile(sourcePath, name);
    if (isContainerKind(sniffed.kind) && depth < limits.maxArchiveDepth + 1) {
      const target = await makeTempDir(ctx.config.dataDir, 'expand');
      scratch.push(target);
      const expanded = await expandContainer(sniffed.kind, sourcePath, target, limits);
      if (!expanded.ok) {
        const limit = ARCHIVE_LIMIT_SETTINGS[expanded.reason];
        if (limit) {
          throw payloadTooLarge(
            limit[0],
            `${relativePath}: ${expanded.reason}, ${expanded.detail}; the limit is ${limit[1](ctx)}`,
          );
        }
        // Kept, listed and counted as an exception with its reason (never dropped).
        prepared.push({
          sourcePath,
          name,
          relativePath,
          kind: sniffed.kind,
          mime: sniffed.mime,
          failure: expanded.reason,
          attachmentsExpected: 0,
        });
        return;
      }
      for (const entry of expanded.skipped)
        skipped.push({ path: `${relativePath}/${entry.relativePath}`, reason: entry.reason });
      const entries = [...expanded.files].sort((a, b) =>
        a.relativePath < b.relativePath ? -1 : a.relativePath > b.relativePath ? 1 : 0,
      );
      for (const entry of entries)
        await add(entry.absolutePath, `${relativePath}/${entry.relativePath}`, depth + 1);
      return;
    }
    prepared.push({
      sourcePath,
      name,
      relativePath,
      kind: sniffed.kind,
      mime: sniffed.mime,
      failure: isContainerKind(sniffed.kind) ? 'archive nesting too deep' : null,
      attachmentsExpected:
        sniffed.kind === 'email' ? await countDeclaredAttachments(sourcePath) : 0,
    });
  };
  for (const file of files) await add(file.filePath, file.relativePath, 1);
  return { prepared, skipped };
}

/** Finds the custodian by name (case-insensitive) or creates it; returns whether it is new. */
async function resolveCustodian(
  trx: Parameters<typeof insertCustodian>[0],
  matterId: number,
  name: string | null | undefined,
): Promise<{ custodian: CustodianRef | null; created: boolean }> {
  if (!name) return { custodian: null, created: false };
  const existing = await findCustodianByName(trx, matterId, name);
  if (existing) return { custodian: { id: existing.id, name: existing.name }, created: false };
  const row = await insertCustodian(trx, matterId, name);
  return { custodian: { id: row.id, name: row.name }, created: true };
}

/**
 * Loads files into a matter as one batch and queues their extraction. Throws 413 (naming
 * the setting) when an archive breaks a limit; then nothing is stored. Other bad files are
 * recorded and fail in extraction with a reason, without stopping the rest.
 */
export async function loadFiles(
  ctx: AppContext,
  files: IncomingFile[],
  options: LoadOptions,
): Promise<UploadBatchResponse> {
  const matter = await findMatterForLoad(ctx.db, options.matterId);
  if (!matter) throw matterNotFound();
  const scratch: string[] = [];
  try {
    const { prepared, skipped } = await prepare(ctx, files, scratch);
    const stored: { sha256: string; size: number }[] = [];
    for (const [index, file] of prepared.entries()) {
      const blob = await ctx.blobs.putFile(file.sourcePath);
      stored.push({ sha256: blob.sha256, size: blob.size });
      options.onFileStored?.(index + 1, prepared.length);
    }

    let jobId: number | null = null;
    const result = await ctx.db.transaction().execute(async (trx) => {
      const { custodian, created } = await resolveCustodian(
        trx,
        options.matterId,
        options.custodianName,
      );
      const batchId = await insertBatch(trx, {
        matterId: options.matterId,
        custodianId: custodian?.id ?? null,
        source: options.source,
        fileCount: prepared.length,
        createdBy: options.actor.id,
      });
      const seqCount = prepared.reduce((sum, f) => sum + 1 + f.attachmentsExpected, 0);
      let seq = await takeControlSequence(trx, options.matterId, seqCount);
      const now = new Date().toISOString();
      const firstOfSha = new Map<string, { id: number; controlNumber: string }>();
      const out: UploadedFile[] = [];
      const toExtract: number[] = [];
      const reserved: Record<string, number[]> = {};
      for (const [index, file] of prepared.entries()) {
        const { sha256, size } = stored[index];
        const controlNumber = formatControlNumber(matter.control_prefix, seq);
        seq += 1;
        const first =
          firstOfSha.get(sha256) ??
          (await findFirstBySha(trx, options.matterId, sha256).then((row) =>
            row ? { id: row.id, controlNumber: row.control_number } : undefined,
          ));
        const status: ExtractStatus = first ? 'duplicate' : file.failure ? 'failed' : 'pending';
        const id = await insertDocument(trx, {
          matter_id: options.matterId,
          batch_id: batchId,
          custodian_id: custodian?.id ?? null,
          parent_id: null,
          control_number: controlNumber,
          original_name: file.name,
          original_path: file.relativePath,
          sha256,
          mime: file.mime,
          doc_type: file.kind,
          size,
          sent_at: null,
          page_count: null,
          extract_status: status,
          extract_error: status === 'failed' ? file.failure : null,
          duplicate_of: first?.id ?? null,
          created_at: now,
        });
        if (!first) firstOfSha.set(sha256, { id, controlNumber });
        // The copy's custodian is kept on the first copy (and its family): "all custodians".
        else await addCustodiansOfCopy(trx, first.id, id);
        if (status === 'pending') toExtract.push(id);
        // Numbers reserved for a duplicate's attachments are simply never used (never reused).
        if (file.attachmentsExpected > 0 && status === 'pending') {
          reserved[String(id)] = Array.from(
            { length: file.attachmentsExpected },
            (_, i) => seq + i,
          );
        }
        seq += file.attachmentsExpected;
        out.push({
          id,
          name: file.name,
          path: file.relativePath,
          controlNumber,
          status,
          ...(first
            ? { duplicateOf: first.id, duplicateOfControlNumber: first.controlNumber }
            : {}),
          ...(status === 'failed' && file.failure ? { error: file.failure } : {}),
        });
      }
      if (toExtract.length > 0) {
        const payload: ExtractBatchPayload = { documentIds: toExtract, reserved };
        jobId = await ctx.jobs.enqueue(trx, {
          matterId: options.matterId,
          kind: 'extract-batch',
          payload,
          total: toExtract.length,
          createdBy: options.actor.id,
          message: `Waiting to extract ${toExtract.length} file${toExtract.length === 1 ? '' : 's'}`,
        });
      }
      const actor = {
        actorId: options.actor.id,
        actorEmail: options.actor.email,
        ip: options.actor.ip,
      };
      if (custodian && created) {
        await recordAudit(trx, {
          ...actor,
          matterId: options.matterId,
          action: 'custodian.created',
          targetType: 'custodian',
          targetId: custodian.id,
          detail: { name: custodian.name },
        });
      }
      await recordAudit(trx, {
        ...actor,
        matterId: options.matterId,
        action: 'document.uploaded',
        targetType: 'batch',
        targetId: batchId,
        detail: {
          source: options.source,
          custodian: custodian?.name ?? null,
          files: out.length,
          queued: toExtract.length,
          duplicates: out.filter((f) => f.status === 'duplicate').length,
          failed: out.filter((f) => f.status === 'failed').length,
          skipped: skipped.length,
          firstControlNumber: out[0]?.controlNumber ?? null,
          lastControlNumber: out.at(-1)?.controlNumber ?? null,
        },
      });
      for (const file of out.filter((f) => f.status === 'failed')) {
        await recordAudit(trx, {
          ...actor,
          matterId: options.matterId,
          action: 'document.failed',
          targetType: 'document',
          targetId: file.id,
          detail: { controlNumber: file.controlNumber, path: file.path, reason: file.error },
        });
      }
      return { id: batchId, custodian, files: out, skipped };
    });
    if (jobId !== null) ctx.jobs.wake('extract-batch');
    return { ...result, jobId };
  } finally {
    for (const dir of scratch) await removeTempDir(ctx.config.dataDir, dir).catch(() => undefined);
  }
}

/** Every regular file under `root`, sorted by path (load order), "/"-separated. */
export async function listFolder(root: string): Promise<IncomingFile[]> {
  const out: IncomingFile[] = [];
  async function walk(dir: string, prefix: string) {
    const entries = (await readdir(dir, { withFileTypes: true })).sort((a, b) =>
      a.name < b.name ? -1 : a.name > b.name ? 1 : 0,
    );
    for (const entry of entries) {
      const full = path.join(dir, entry.name);
      const relative = prefix ? `${prefix}/${entry.name}` : entry.name;
      if (entry.isDirectory()) await walk(full, relative);
      else if (entry.isFile()) out.push({ filePath: full, relativePath: relative });
    }
  }
  await walk(root, '');
  return out;
}
