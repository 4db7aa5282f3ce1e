import type { DocumentListItem, DocumentStatus, IndexState } from '@shared/schemas/documents';

const units = ['bytes', 'KB', 'MB', 'GB'] as const;

/** Sizes in binary multiples (1 KB = 1024 bytes, common practice in file dialogs). */
export function formatBytes(bytes: number): string {
  if (!Number.isFinite(bytes) || bytes < 0) return '—';
  let value = bytes;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit += 1;
  }
  if (unit === 0) return `${value} ${value === 1 ? 'byte' : 'bytes'}`;
  return `${value < 10 ? value.toFixed(1) : Math.round(value)} ${units[unit]}`;
}

export const DOC_TYPE_LABELS: Record<string, string> = {
  pdf: 'PDF',
  docx: 'Word',
  email: 'E-mail',
  html: 'Web page',
  text: 'Text',
  markdown: 'Markdown',
  zip: 'Archive',
  unknown: 'Unknown',
};

export function docTypeLabel(docType: string): string {
  return DOC_TYPE_LABELS[docType] ?? docType;
}

export const STATUS_LABELS: Record<DocumentStatus, string> = {
  pending: 'Waiting',
  extracting: 'Extracting',
  extracted: 'Extracted',
  failed: 'Failed',
  duplicate: 'Duplicate',
};

export const INDEX_STATE_LABELS: Record<IndexState, string> = {
  indexed: 'Indexed',
  folded: 'Folded in',
  waiting: 'Not yet indexed',
  failed: 'Not indexed',
  duplicate: 'Not indexed (copy)',
};

/** The document's date: sent date for e-mail, else nothing (the list shows a dash). */
export function documentDate(document: Pick<DocumentListItem, 'sentAt'>): string | null {
  return document.sentAt;
}
