// What each format's extractor fills in, and the small helpers every extractor shares.
import type { ExtractSuccess, FailureReason } from './types';

export type Fields = Omit<ExtractSuccess, 'ok' | 'kind' | 'mime' | 'charset'> & {
  charset?: string | null;
};

/** Thrown by an extractor to fail the file with a reason worded for a paralegal. */
export class Refused extends Error {
  constructor(readonly reason: FailureReason) {
    super(reason);
  }
}

export const blank = (): Fields => ({
  title: null,
  author: null,
  recipients: null,
  sentAt: null,
  createdAt: null,
  modifiedAt: null,
  lastAuthor: null,
  email: null,
  ocr: false,
  pageCount: null,
  text: '',
  attachments: [],
});

export const cleanString = (value: unknown): string | null => {
  if (typeof value !== 'string') return null;
  const trimmed = value.replace(/\s+/g, ' ').trim();
  return trimmed === '' ? null : trimmed;
};

export const isoOrNull = (value: Date | string | null | undefined): string | null => {
  const date = typeof value === 'string' ? new Date(value) : value;
  return date instanceof Date && !Number.isNaN(date.getTime()) ? date.toISOString() : null;
};

/** Normalises extracted text: Unix newlines, no trailing spaces, at most one blank line in a row. */
export function tidyText(text: string): string {
  return text
    .replace(/\r\n?/g, '\n')
    .replace(/[ \t\f\v]+\n/g, '\n')
    .replace(/\n{3,}/g, '\n\n')
    .trim();
}

const XML_ENTITIES: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };
/** XML 1.0 §4.6 predefined entities and character references. */
export const decodeXml = (text: string) =>
  text.replace(/&(#x[0-9a-f]+|#\d+|amp|lt|gt|quot|apos);/gi, (_m, entity: string) =>
    entity[0] === '#'
      ? String.fromCodePoint(
          entity[1].toLowerCase() === 'x'
            ? parseInt(entity.slice(2), 16)
            : parseInt(entity.slice(1), 10),
        )
      : XML_ENTITIES[entity.toLowerCase()],
  );

/** Reads one element of an OOXML docProps/core.xml (ECMA-376 Part 2 §11, Dublin Core terms). */
export function coreProperty(xml: string, tag: string): string | null {
  const match = new RegExp(`<${tag}(?:\\s[^>]*)?>([\\s\\S]*?)</${tag}>`).exec(xml);
  return match ? cleanString(decodeXml(match[1])) : null;
}

/** Title, authors and dates of an OOXML package's core properties. */
export function applyCoreProperties(fields: Fields, xml: string): void {
  fields.title = coreProperty(xml, 'dc:title');
  fields.author = coreProperty(xml, 'dc:creator');
  fields.lastAuthor = coreProperty(xml, 'cp:lastModifiedBy');
  const created = coreProperty(xml, 'dcterms:created');
  fields.createdAt = created ? isoOrNull(new Date(created)) : null;
  const modified = coreProperty(xml, 'dcterms:modified');
  fields.modifiedAt = modified ? isoOrNull(new Date(modified)) : null;
}
