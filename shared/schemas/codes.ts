import { z } from 'zod';
import { idSchema, text, type PersonRef } from './common';

// A matter's code set and coding of documents (issue 5).

export const CODE_NAME_MAX_LENGTH = 60;
export const BULK_CODING_MAX = 10_000;

/** Created with every matter (server/codes/defaults.ts); shortcuts are the digit keys. */
export const DEFAULT_CODES = [
  { name: 'Responsive', shortcut: '1', marksPrivileged: false },
  { name: 'Not responsive', shortcut: '2', marksPrivileged: false },
  { name: 'Privileged', shortcut: '3', marksPrivileged: true },
  { name: 'Hot', shortcut: '4', marksPrivileged: false },
  { name: 'Needs second look', shortcut: '5', marksPrivileged: false },
] as const;

export const codeParams = z.object({ matterId: idSchema, codeId: idSchema });
export type CodeParams = z.infer<typeof codeParams>;

const codeName = text()
  .trim()
  .min(1, 'is required')
  .max(CODE_NAME_MAX_LENGTH, `must be at most ${CODE_NAME_MAX_LENGTH} characters`);

/** One key (a letter or digit) the viewer uses to apply the code; null for none. */
const shortcut = z
  .string({ error: 'must be text' })
  .regex(/^[a-z0-9]$/, 'must be one lower-case letter or digit')
  .nullable();

/** POST /api/matters/:matterId/codes (codes.manage). */
export const createCodeSchema = z.object({
  name: codeName,
  shortcut: shortcut.optional(),
  marksPrivileged: z.boolean({ error: 'must be true or false' }).default(false),
});
export type CreateCodeReq = z.input<typeof createCodeSchema>;

/** PATCH /api/matters/:matterId/codes/:codeId (codes.manage). archived: false restores. */
export const updateCodeSchema = z
  .object({
    name: codeName.optional(),
    shortcut: shortcut.optional(),
    marksPrivileged: z.boolean({ error: 'must be true or false' }).optional(),
    sortOrder: z
      .number({ error: 'must be a number' })
      .int('must be a whole number')
      .min(0)
      .max(10_000)
      .optional(),
    archived: z.boolean({ error: 'must be true or false' }).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, {
    message: 'change at least one field',
    path: ['name'],
  });
export type UpdateCodeReq = z.infer<typeof updateCodeSchema>;

export interface Code {
  id: number;
  name: string;
  shortcut: string | null;
  sortOrder: number;
  /** Documents with this code go on the privilege log. */
  marksPrivileged: boolean;
  /** Archived codes stay on documents already coded but cannot be applied. */
  archivedAt: string | null;
  documentCount: number;
}

/** GET /api/matters/:matterId/codes: every code, archived ones included, in sortOrder. */
export interface CodesResponse {
  codes: Code[];
}

export interface CodeResponse {
  code: Code;
}

/** PUT /api/matters/:matterId/documents/:docId/codes (documents.code): the document's full set. */
export const setDocumentCodesSchema = z.object({
  codeIds: z
    .array(idSchema, { error: 'must be a list of code ids' })
    .max(100, 'must list at most 100 codes'),
});
export type SetDocumentCodesReq = z.infer<typeof setDocumentCodesSchema>;

/** POST /api/matters/:matterId/codes/bulk (documents.code). */
export const bulkCodingSchema = z
  .object({
    documentIds: z
      .array(idSchema, { error: 'must be a list of document ids' })
      .min(1, 'must list at least one document')
      .max(BULK_CODING_MAX, `must list at most ${BULK_CODING_MAX} documents`),
    add: z.array(idSchema, { error: 'must be a list of code ids' }).max(100).default([]),
    remove: z.array(idSchema, { error: 'must be a list of code ids' }).max(100).default([]),
  })
  .refine((v) => v.add.length + v.remove.length > 0, {
    message: 'add or remove at least one code',
    path: ['add'],
  })
  .refine((v) => !v.add.some((id) => v.remove.includes(id)), {
    message: 'a code cannot be both added and removed',
    path: ['remove'],
  });
export type BulkCodingReq = z.input<typeof bulkCodingSchema>;

export interface AppliedCode {
  id: number;
  name: string;
  codedBy: PersonRef | null;
  codedAt: string;
}

export interface DocumentCoding {
  documentId: number;
  codes: AppliedCode[];
}

/** Answer of PUT .../documents/:docId/codes */
export interface DocumentCodesResponse extends DocumentCoding {
  added: number[];
  removed: number[];
}

/** Answer of POST .../codes/bulk: `changed` documents got one coding.changed audit row each. */
export interface BulkCodingResponse {
  changed: number;
  unchanged: number;
  documents: DocumentCoding[];
}
