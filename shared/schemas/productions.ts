import { z } from 'zod';
import { idSchema, text, type PersonRef } from './common';

// Redactions (marked in the viewer, kept apart from the original) and production sets
// (Bates-numbered, endorsed PDFs with text, natives and a metadata file, built in the
// background and locked once built). Routes: server/redactions, server/productions.

export const REDACTION_REASON_MAX_LENGTH = 120;
/** Reasons offered in the viewer; the lead may type another. */
export const REDACTION_REASONS = ['Privilege', 'Personal data'] as const;
export const REDACTION_PATTERN_MAX_LENGTH = 80;

const reasonSchema = text()
  .trim()
  .min(1, 'is required')
  .max(REDACTION_REASON_MAX_LENGTH, `must be at most ${REDACTION_REASON_MAX_LENGTH} characters`);

const fraction = (name: string) =>
  z
    .number({ error: `${name} must be a number` })
    .min(0, `${name} must be between 0 and 1`)
    .max(1, `${name} must be between 0 and 1`);

/**
 * POST /api/matters/:matterId/documents/:docId/redactions
 * - span: characters [start, end) of the document's extracted text;
 * - pattern: every hit of a term (case-insensitive, whole text) or of a format mask, where
 *   '#' stands for a digit and '@' for a letter (e.g. '####-####-####' for an account
 *   number); masks compile to patterns without nested repetition, so matching is linear;
 * - box: an area of a PDF page, as fractions of the page's width and height from its top left.
 */
export const createRedactionSchema = z.discriminatedUnion(
  'kind',
  [
    z.object({
      kind: z.literal('span'),
      start: z.number().int('must be a whole number').min(0, 'must be 0 or more'),
      end: z.number().int('must be a whole number').min(1, 'must be 1 or more'),
      reason: reasonSchema,
    }),
    z.object({
      kind: z.literal('pattern'),
      pattern: text()
        .min(1, 'is required')
        .max(
          REDACTION_PATTERN_MAX_LENGTH,
          `must be at most ${REDACTION_PATTERN_MAX_LENGTH} characters`,
        )
        .refine((v) => v.trim().length > 0, 'must not be blank'),
      patternKind: z.enum(['term', 'format'], { error: 'must be term or format' }).default('term'),
      reason: reasonSchema,
    }),
    z.object({
      kind: z.literal('box'),
      page: z.number().int('must be a whole number').min(1, 'must be 1 or more'),
      x: fraction('x'),
      y: fraction('y'),
      width: fraction('width').refine((v) => v > 0, 'width must be more than 0'),
      height: fraction('height').refine((v) => v > 0, 'height must be more than 0'),
      reason: reasonSchema,
    }),
  ],
  { error: 'kind must be span, pattern or box' },
);
export type CreateRedactionReq = z.input<typeof createRedactionSchema>;

export const redactionParams = z.object({
  matterId: idSchema,
  docId: idSchema,
  redactionId: idSchema,
});

export interface Redaction {
  id: number;
  documentId: number;
  kind: 'span' | 'pattern' | 'box';
  start: number | null;
  end: number | null;
  /** The text under a span redaction, as extracted. */
  text: string | null;
  pattern: string | null;
  patternKind: 'term' | 'format' | null;
  /** Hits of a pattern in the document's text now. */
  hits: number | null;
  page: number | null;
  box: { x: number; y: number; width: number; height: number } | null;
  reason: string;
  createdBy: PersonRef | null;
  createdAt: string;
  /** The production that burned it in; a produced redaction cannot be removed. */
  producedIn: number | null;
}

export interface RedactionsResponse {
  redactions: Redaction[];
}

// ---- Production sets ----

export const BATES_PREFIX_PATTERN = /^[A-Z0-9][A-Z0-9_-]{0,19}$/;
export const PRODUCTION_NAME_MAX_LENGTH = 120;
export const LEGEND_MAX_LENGTH = 120;

const codeRef = z.union([idSchema, text().trim().min(1, 'is required')], {
  error: 'must be a code id or name',
});

export const productionSourceSchema = z.union(
  [
    z.object({ savedSearchId: idSchema }).strict(),
    z
      .object({
        codes: z.array(codeRef).min(1, 'needs at least one code'),
        excludeCodes: z.array(codeRef).default([]),
      })
      .strict(),
  ],
  { error: 'must be { savedSearchId } or { codes, excludeCodes }' },
);
export type ProductionSource = z.output<typeof productionSourceSchema>;

/** POST /api/matters/:matterId/productions */
export const createProductionSchema = z.object({
  name: text()
    .trim()
    .min(1, 'is required')
    .max(PRODUCTION_NAME_MAX_LENGTH, `must be at most ${PRODUCTION_NAME_MAX_LENGTH} characters`),
  source: productionSourceSchema,
  bates: z.object({
    prefix: text()
      .trim()
      .toUpperCase()
      .regex(
        BATES_PREFIX_PATTERN,
        'must be 1 to 20 letters, digits, "-" or "_", starting with a letter or digit',
      ),
    /** Omitted: continue after the last number this matter used with the prefix. */
    start: z.number().int('must be a whole number').min(1, 'must be 1 or more').optional(),
    padding: z
      .number()
      .int('must be a whole number')
      .min(1, 'must be at least 1')
      .max(12, 'must be at most 12')
      .default(7),
  }),
  /** Stamped on every page ('' for none). */
  legend: text()
    .trim()
    .max(LEGEND_MAX_LENGTH, `must be at most ${LEGEND_MAX_LENGTH} characters`)
    .default(''),
  /** Per-document legends from codes; the first matching code wins over `legend`. */
  legendByCode: z
    .array(
      z.object({
        code: codeRef,
        legend: text()
          .trim()
          .min(1, 'is required')
          .max(LEGEND_MAX_LENGTH, `must be at most ${LEGEND_MAX_LENGTH} characters`),
      }),
    )
    .default([]),
  /**
   * Privileged documents (coded with a code on the privilege log): withhold them behind a
   * slip sheet, or produce them with their redactions burned in (a privileged document
   * without redactions is withheld either way, so nothing privileged goes out unredacted).
   */
  privileged: z.enum(['withhold', 'redact'], { error: 'must be withhold or redact' }),
  /** Which natives travel with the set: none, files that do not paginate (default), or all. */
  natives: z
    .enum(['none', 'unpaginated', 'all'], { error: 'must be none, unpaginated or all' })
    .default('unpaginated'),
});
export type CreateProductionReq = z.input<typeof createProductionSchema>;

export const productionParams = z.object({ matterId: idSchema, productionId: idSchema });

/** POST .../productions/:productionId/family: resolve what the family check found. */
export const resolveFamilySchema = z
  .object({
    add: z.array(idSchema).default([]),
    slipSheet: z.array(idSchema).default([]),
  })
  .refine((v) => v.add.length + v.slipSheet.length > 0, 'add or slipSheet must list a document');
export type ResolveFamilyReq = z.input<typeof resolveFamilySchema>;

export type ProductionState = 'draft' | 'building' | 'built' | 'failed';
export type ProductionTreatment = 'produced' | 'redacted' | 'withheld' | 'native';

export interface FamilyGap {
  documentId: number;
  controlNumber: string;
  title: string;
  /** What it is to the set: an attachment of a produced e-mail, or the parent of a produced attachment. */
  relation: 'attachment' | 'parent';
  /** The produced document that brings it in. */
  ofDocumentId: number;
  ofControlNumber: string;
}

export interface Production {
  id: number;
  name: string;
  state: ProductionState;
  source: ProductionSource;
  bates: { prefix: string; start: number; padding: number };
  legend: string;
  legendByCode: { codeId: number; legend: string }[];
  privileged: 'withhold' | 'redact';
  natives: 'none' | 'unpaginated' | 'all';
  counts: {
    documents: number;
    added: number;
    slipSheets: number;
    /** After the build. */
    produced: number | null;
    redacted: number | null;
    withheld: number | null;
    natives: number | null;
    pages: number | null;
  };
  /** First and last Bates number, once built. */
  batesRange: { first: string; last: string } | null;
  familyCheck: { gaps: FamilyGap[]; resolved: boolean };
  jobId: number | null;
  error: string | null;
  zip: { sha256: string; size: number } | null;
  createdBy: PersonRef | null;
  createdAt: string;
  builtAt: string | null;
}

export interface ProductionResponse {
  production: Production;
}

export interface ProductionsResponse {
  productions: Production[];
}

/** Columns of the production's metadata file (DATA/metadata.csv), in order. */
export const PRODUCTION_METADATA_COLUMNS = [
  'Begin Bates',
  'End Bates',
  'Begin Family',
  'End Family',
  'Custodian',
  'All Custodians',
  'From',
  'To',
  'Cc',
  'Bcc',
  'Subject',
  'Sent Date',
  'File Name',
  'SHA-256',
  'Page Count',
  'Legend',
  'Redacted',
  'Treatment',
  'Native File',
  'Text File',
] as const;
