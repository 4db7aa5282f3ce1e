import { z } from 'zod';
import { idSchema, text, type PersonRef } from './common';

// A matter's code set and coding of documents.

export const CODE_NAME_MAX_LENGTH = 60;
export const BULK_CODING_MAX = 10_000;

export const CODE_GROUP_NAME_MAX_LENGTH = 60;

/**
 * single: at most one code per document (a second choice replaces the first);
 * multi: any number; privilege: single-choice, and choosing a code that marks privilege
 * needs a privilege type and a basis (the privilege log's fields).
 */
export const CODE_GROUP_KINDS = ['single', 'multi', 'privilege'] as const;
export type CodeGroupKind = (typeof CODE_GROUP_KINDS)[number];

/**
 * Chip colours: text on background, each pair at least 4.5:1 (WCAG 2.2 SC 1.4.3, checked in
 * src/features/codes/code-colours.test.ts). Hues far apart so Hot, Privileged and
 * Responsive read apart at a glance.
 */
export const CODE_COLOURS = {
  green: { bg: '#dcfce7', fg: '#14532d', label: 'Green' },
  slate: { bg: '#e2e8f0', fg: '#1e293b', label: 'Slate' },
  violet: { bg: '#ede9fe', fg: '#4c1d95', label: 'Violet' },
  teal: { bg: '#ccfbf1', fg: '#134e4a', label: 'Teal' },
  red: { bg: '#fee2e2', fg: '#7f1d1d', label: 'Red' },
  amber: { bg: '#fef3c7', fg: '#78350f', label: 'Amber' },
  blue: { bg: '#dbeafe', fg: '#1e3a8a', label: 'Blue' },
  pink: { bg: '#fce7f3', fg: '#831843', label: 'Pink' },
  orange: { bg: '#ffedd5', fg: '#7c2d12', label: 'Orange' },
  indigo: { bg: '#e0e7ff', fg: '#312e81', label: 'Indigo' },
} as const;
export type CodeColour = keyof typeof CODE_COLOURS;
export const CODE_COLOUR_NAMES = Object.keys(CODE_COLOURS) as CodeColour[];

/** The privilege types the log offers; the lead may type another (PRIVILEGE_TYPE_MAX_LENGTH). */
export const PRIVILEGE_TYPES = [
  'Attorney-client privilege',
  'Work product',
  'Common interest',
] as const;
export const PRIVILEGE_TYPE_MAX_LENGTH = 80;
export const PRIVILEGE_TREATMENTS = ['withheld', 'redacted'] as const;
export type PrivilegeTreatment = (typeof PRIVILEGE_TREATMENTS)[number];

/** Created with every matter (server/codes/defaults.ts), group by group; shortcuts are digit keys. */
export const DEFAULT_CODE_GROUPS = [
  {
    name: 'Responsiveness',
    kind: 'single',
    required: true,
    followFamily: false,
    followDuplicates: true,
    codes: [
      { name: 'Responsive', shortcut: '1', marksPrivileged: false, colour: 'green' },
      { name: 'Not responsive', shortcut: '2', marksPrivileged: false, colour: 'slate' },
    ],
  },
  {
    name: 'Privilege',
    kind: 'privilege',
    required: false,
    followFamily: false,
    followDuplicates: true,
    codes: [
      { name: 'Privileged', shortcut: '3', marksPrivileged: true, colour: 'violet' },
      { name: 'Not privileged', shortcut: '6', marksPrivileged: false, colour: 'teal' },
    ],
  },
  {
    name: 'Flags',
    kind: 'multi',
    required: false,
    followFamily: false,
    followDuplicates: false,
    codes: [
      { name: 'Hot', shortcut: '4', marksPrivileged: false, colour: 'red' },
      { name: 'Needs second look', shortcut: '5', marksPrivileged: false, colour: 'amber' },
    ],
  },
  {
    name: 'Issues',
    kind: 'multi',
    required: false,
    followFamily: false,
    followDuplicates: false,
    codes: [],
  },
] as const satisfies readonly {
  name: string;
  kind: CodeGroupKind;
  required: boolean;
  followFamily: boolean;
  followDuplicates: boolean;
  codes: readonly {
    name: string;
    shortcut: string;
    marksPrivileged: boolean;
    colour: CodeColour;
  }[];
}[];

/** Every default code in display order. */
export const DEFAULT_CODES: readonly {
  name: string;
  shortcut: string;
  marksPrivileged: boolean;
  colour: CodeColour;
}[] = DEFAULT_CODE_GROUPS.flatMap(
  (
    g,
  ): readonly { name: string; shortcut: string; marksPrivileged: boolean; colour: CodeColour }[] =>
    g.codes,
);

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

const colour = z.enum(CODE_COLOUR_NAMES as [CodeColour, ...CodeColour[]], {
  error: `must be one of ${CODE_COLOUR_NAMES.join(', ')}`,
});

/** POST /api/matters/:matterId/codes (codes.manage). Without groupId the code joins the first multi-choice group. */
export const createCodeSchema = z.object({
  name: codeName,
  shortcut: shortcut.optional(),
  marksPrivileged: z.boolean({ error: 'must be true or false' }).default(false),
  groupId: idSchema.optional(),
  colour: colour.optional(),
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
    groupId: idSchema.optional(),
    colour: colour.optional(),
  })
  .refine((v) => Object.keys(v).length > 0, {
    message: 'change at least one field',
    path: ['name'],
  });
export type UpdateCodeReq = z.infer<typeof updateCodeSchema>;

export const codeGroupParams = z.object({ matterId: idSchema, groupId: idSchema });

const groupName = text()
  .trim()
  .min(1, 'is required')
  .max(CODE_GROUP_NAME_MAX_LENGTH, `must be at most ${CODE_GROUP_NAME_MAX_LENGTH} characters`);
const flag = z.boolean({ error: 'must be true or false' });

/** POST /api/matters/:matterId/code-groups (codes.manage). */
export const createCodeGroupSchema = z.object({
  name: groupName,
  kind: z.enum(CODE_GROUP_KINDS, { error: `must be one of ${CODE_GROUP_KINDS.join(', ')}` }),
  required: flag.default(false),
  followFamily: flag.default(false),
  followDuplicates: flag.default(false),
});
export type CreateCodeGroupReq = z.input<typeof createCodeGroupSchema>;

/** PATCH /api/matters/:matterId/code-groups/:groupId (codes.manage). The kind is fixed once made. */
export const updateCodeGroupSchema = z
  .object({
    name: groupName.optional(),
    required: flag.optional(),
    followFamily: flag.optional(),
    followDuplicates: flag.optional(),
    sortOrder: z.number({ error: 'must be a number' }).int().min(0).max(10_000).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, {
    message: 'change at least one field',
    path: ['name'],
  });
export type UpdateCodeGroupReq = z.infer<typeof updateCodeGroupSchema>;

export interface CodeGroup {
  id: number;
  name: string;
  kind: CodeGroupKind;
  /** A reviewer may not move on (or check a batch in) until the group has a code. */
  required: boolean;
  /** Coding in this group is carried to the rest of the document's family. */
  followFamily: boolean;
  /** ... and to its exact duplicates. */
  followDuplicates: boolean;
  sortOrder: number;
}

export interface CodeGroupResponse {
  group: CodeGroup;
}

/** What the coding rules need of a code (the API's Code satisfies it). */
export interface RuleCode {
  id: number;
  name: string;
  groupId: number | null;
  marksPrivileged: boolean;
  archivedAt: string | null;
}

/** Single-choice groups (the privilege group is one). */
export const isSingleChoice = (group: Pick<CodeGroup, 'kind'> | undefined) =>
  group !== undefined && group.kind !== 'multi';

/**
 * The set after choosing `codeId` (a key press or a click): in a single-choice group it
 * replaces the group's other code; choosing a code already applied removes it. The
 * server's PUT follows the same rule (resolveWanted), so both sides agree.
 */
export function chooseCode(
  codes: readonly RuleCode[],
  groups: readonly Pick<CodeGroup, 'id' | 'kind'>[],
  current: readonly number[],
  codeId: number,
): { next: number[]; removed: number | null; replaced: number | null } {
  if (current.includes(codeId))
    return { next: current.filter((id) => id !== codeId), removed: codeId, replaced: null };
  const code = codes.find((c) => c.id === codeId);
  const group = groups.find((g) => g.id === code?.groupId);
  let replaced: number | null = null;
  let next = [...current];
  if (code && isSingleChoice(group)) {
    const sibling = next.find((id) => codes.find((c) => c.id === id)?.groupId === code.groupId);
    if (sibling !== undefined) {
      replaced = sibling;
      next = next.filter((id) => id !== sibling);
    }
  }
  next.push(codeId);
  return { next, removed: null, replaced };
}

export type WantedResult =
  | { ok: true; codeIds: number[]; replaced: { groupId: number; from: number; to: number }[] }
  | { ok: false; message: string };

/**
 * A document's wanted set against its current one: where a single-choice group would hold
 * two codes, the newly chosen one replaces the one already applied; two new choices in one
 * such group are refused with a message naming the group.
 */
export function resolveWanted(
  codes: readonly RuleCode[],
  groups: readonly Pick<CodeGroup, 'id' | 'kind' | 'name'>[],
  current: readonly number[],
  wanted: readonly number[],
): WantedResult {
  const byId = new Map(codes.map((c) => [c.id, c]));
  const keep = new Set(wanted);
  const replaced: { groupId: number; from: number; to: number }[] = [];
  for (const group of groups) {
    if (!isSingleChoice(group)) continue;
    const inGroup = [...keep].filter((id) => byId.get(id)?.groupId === group.id);
    if (inGroup.length < 2) continue;
    const fresh = inGroup.filter((id) => !current.includes(id));
    if (fresh.length !== 1) {
      const names = inGroup.map((id) => byId.get(id)?.name ?? String(id)).join(', ');
      return {
        ok: false,
        message: `"${group.name}" takes one code; choose one of ${names}`,
      };
    }
    for (const old of inGroup.filter((id) => id !== fresh[0])) {
      keep.delete(old);
      replaced.push({ groupId: group.id, from: old, to: fresh[0] });
    }
  }
  return { ok: true, codeIds: [...keep], replaced };
}

/** Required groups the set leaves empty (archived codes still count: they were applied). */
export function missingRequiredGroups<G extends Pick<CodeGroup, 'id' | 'required'>>(
  codes: readonly RuleCode[],
  groups: readonly G[],
  codeIds: readonly number[],
): G[] {
  const filled = new Set(codeIds.map((id) => codes.find((c) => c.id === id)?.groupId));
  return groups.filter((g) => g.required && !filled.has(g.id));
}

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
  groupId: number | null;
  colour: CodeColour;
}

/** GET /api/matters/:matterId/codes: every code, archived ones included, in sortOrder; the groups in theirs. */
export interface CodesResponse {
  codes: Code[];
  groups: CodeGroup[];
}

export interface CodeResponse {
  code: Code;
}

/** PUT /api/matters/:matterId/documents/:docId/codes (documents.code): the document's full set. */
export const privilegeFieldsSchema = z.object({
  /** One of PRIVILEGE_TYPES or the lead's own. */
  type: text()
    .trim()
    .max(PRIVILEGE_TYPE_MAX_LENGTH, `must be at most ${PRIVILEGE_TYPE_MAX_LENGTH} characters`)
    .optional(),
  basis: text().trim().max(200, 'must be at most 200 characters').optional(),
  description: text().trim().max(2000, 'must be at most 2000 characters').optional(),
  treatment: z
    .enum(PRIVILEGE_TREATMENTS, { error: `must be one of ${PRIVILEGE_TREATMENTS.join(', ')}` })
    .optional(),
});
export type PrivilegeFieldsReq = z.infer<typeof privilegeFieldsSchema>;

export const setDocumentCodesSchema = z.object({
  codeIds: z
    .array(idSchema, { error: 'must be a list of code ids' })
    .max(100, 'must list at most 100 codes'),
  /** Privilege type and basis: required (here or already stored) when a privilege code is chosen. */
  privilege: privilegeFieldsSchema.optional(),
  /** The reviewer is moving on: every required group must have a code. */
  complete: z.boolean({ error: 'must be true or false' }).default(false),
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
    /** Widen the documents to their whole families (parent e-mail and attachments). */
    withFamilies: z.boolean({ error: 'must be true or false' }).default(false),
    privilege: privilegeFieldsSchema.optional(),
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
  /** Single-choice replacements made (a second choice replaced the first). */
  replaced: { groupId: number; from: number; to: number }[];
  /** Other documents changed because a group follows families or duplicates. */
  propagated: DocumentCoding[];
}

/** Answer of POST .../codes/bulk: `changed` documents got one coding.changed audit row each. */
export interface BulkCodingResponse {
  changed: number;
  unchanged: number;
  /** Documents left alone because quality control locked their coding. */
  locked: number;
  documents: DocumentCoding[];
}
