import { z } from 'zod';
import { PRIVILEGE_TREATMENTS, PRIVILEGE_TYPE_MAX_LENGTH, type PrivilegeTreatment } from './codes';
import { idSchema, text } from './common';

// The privilege log (in-app screen and CSV): one row per withheld or redacted document,
// a family's members as their own rows under the top-level item.

export const PRIVILEGE_LOG_COLUMNS = [
  ['controlNumber', 'Control number'],
  ['familyBegin', 'Family begin'],
  ['familyEnd', 'Family end'],
  ['relation', 'Family relation'],
  ['date', 'Date'],
  ['author', 'Author'],
  ['from', 'From'],
  ['to', 'To'],
  ['cc', 'Cc'],
  ['bcc', 'Bcc'],
  ['subject', 'Subject or title'],
  ['custodian', 'Custodian'],
  ['documentType', 'Document type'],
  ['privilegeType', 'Privilege type'],
  ['basis', 'Basis'],
  ['description', 'Description'],
  ['treatment', 'Withheld or redacted'],
] as const;
export type PrivilegeLogField = (typeof PRIVILEGE_LOG_COLUMNS)[number][0];

export const TREATMENT_LABELS: Record<PrivilegeTreatment, string> = {
  withheld: 'Withheld',
  redacted: 'Redacted',
};

export interface PrivilegeLogRow {
  documentId: number;
  familyId: number;
  controlNumber: string;
  /** First and last control number of the family; empty for a document without a family. */
  familyBegin: string;
  familyEnd: string;
  relation: 'Parent' | 'Attachment' | '';
  /** YYYY-MM-DD or ''. */
  date: string;
  author: string;
  from: string;
  to: string;
  cc: string;
  bcc: string;
  subject: string;
  custodian: string;
  documentType: string;
  privilegeType: string;
  basis: string;
  description: string;
  treatment: string;
  /** On the log because its top-level item is privileged (no privilege code of its own). */
  inherited: boolean;
}

export interface PrivilegeLogResponse {
  rows: PrivilegeLogRow[];
}

export const privilegeLogParams = z.object({ matterId: idSchema, docId: idSchema });

/** PATCH /api/matters/:matterId/privilege-log/:docId (privilege_log.edit): edit in place. */
export const privilegeLogPatchSchema = z
  .object({
    description: text().trim().max(2000, 'must be at most 2000 characters').optional(),
    basis: text().trim().max(200, 'must be at most 200 characters').optional(),
    privilegeType: text()
      .trim()
      .max(PRIVILEGE_TYPE_MAX_LENGTH, `must be at most ${PRIVILEGE_TYPE_MAX_LENGTH} characters`)
      .optional(),
    treatment: z
      .enum(PRIVILEGE_TREATMENTS, { error: `must be one of ${PRIVILEGE_TREATMENTS.join(', ')}` })
      .optional(),
  })
  .refine((v) => Object.keys(v).length > 0, {
    message: 'change at least one field',
    path: ['description'],
  });
export type PrivilegeLogPatchReq = z.infer<typeof privilegeLogPatchSchema>;

const BY_TYPE: Record<string, string> = {
  email: 'E-mail',
  msg: 'E-mail',
  pdf: 'PDF',
  docx: 'Word document',
  doc: 'Word document',
  xlsx: 'Spreadsheet',
  xls: 'Spreadsheet',
  csv: 'Spreadsheet',
  spreadsheet: 'Spreadsheet',
  pptx: 'Presentation',
  html: 'Web page',
  text: 'Text file',
  markdown: 'Text file',
  zip: 'Archive',
  image: 'Image',
};

/** The document type as a person reads it on a log ("E-mail", "Word document"), never an extension. */
export function documentTypeLabel(docType: string, mime = '', name = ''): string {
  if (BY_TYPE[docType]) return BY_TYPE[docType];
  const ext = name.toLowerCase().match(/\.([a-z0-9]+)$/)?.[1] ?? '';
  if (BY_TYPE[ext]) return BY_TYPE[ext];
  if (/spreadsheet|excel|csv/.test(mime)) return 'Spreadsheet';
  if (/presentation|powerpoint/.test(mime)) return 'Presentation';
  if (/wordprocessing|msword/.test(mime)) return 'Word document';
  if (/^image\//.test(mime)) return 'Image';
  if (/^message\//.test(mime)) return 'E-mail';
  return 'Other file';
}
