import type { Generated, Insertable, Selectable, Updateable } from 'kysely';

// Table types for Kysely. Rows of these types never leave the server: each
// feature's service maps them to the API types in shared/schemas.

export interface UsersTable {
  id: string;
  email: string;
  name: string;
  password_hash: string;
  is_admin: number;
  disabled_at: string | null;
  password_changed_at: string;
  created_at: string;
  /** 1: a firm admin set a temporary password; nothing but changing it is allowed. */
  password_must_change: Generated<number>;
  /** When a temporary password stops working (ISO 8601); null for chosen passwords. */
  password_expires_at: Generated<string | null>;
}

export interface SessionsTable {
  id: string;
  user_id: string;
  expires_at: number;
  /** Unix seconds; the absolute lifetime counts from here. */
  created_at: number;
}

export interface MattersTable {
  id: Generated<number>;
  name: string;
  description: Generated<string>;
  control_prefix: string;
  next_control_seq: Generated<number>;
  current_index_id: number | null;
  /** k and weighting of the last requested rebuild; null: not chosen (k follows size). */
  index_k: Generated<number | null>;
  index_weighting: Generated<string | null>;
  created_by: string | null;
  created_at: string;
  /** Jaccard resemblance at which documents are near-duplicates (default 0.8). */
  near_dup_threshold: Generated<number>;
}

export interface MatterMembersTable {
  matter_id: number;
  user_id: string;
  role: string;
  granted_by: string | null;
  granted_at: string;
}

export interface InvitationsTable {
  id: Generated<number>;
  matter_id: number;
  email: string;
  role: string;
  token_hash: string;
  invited_by: string;
  created_at: string;
  expires_at: string;
  accepted_at: string | null;
  accepted_by: string | null;
  revoked_at: string | null;
}

export interface AccountSetupTokensTable {
  id: Generated<number>;
  user_id: string;
  token_hash: string;
  created_by: string | null;
  created_at: string;
  expires_at: string;
  used_at: string | null;
}

export interface CustodiansTable {
  id: Generated<number>;
  matter_id: number;
  name: string;
  created_at: string;
}

export interface UploadBatchesTable {
  id: Generated<number>;
  matter_id: number;
  custodian_id: number | null;
  source: 'upload' | 'import' | 'demo';
  file_count: Generated<number>;
  created_by: string | null;
  created_at: string;
}

export type ExtractStatus = 'pending' | 'extracting' | 'extracted' | 'failed' | 'duplicate';

export interface DocumentsTable {
  id: Generated<number>;
  matter_id: number;
  batch_id: number | null;
  custodian_id: number | null;
  parent_id: number | null;
  /** The top-level document of this one's family (its own id when top-level); set by a trigger. */
  family_id: Generated<number | null>;
  // E-mail header fields kept apart (RFC 5322 3.6), display text "Name <addr>, ...".
  email_from: Generated<string>;
  email_to: Generated<string>;
  email_cc: Generated<string>;
  email_bcc: Generated<string>;
  message_id: string | null;
  in_reply_to: string | null;
  /** The References header as written (space-separated message ids). */
  email_references: Generated<string>;
  received_at: string | null;
  file_created_at: string | null;
  file_modified_at: string | null;
  last_author: Generated<string>;
  /** The top-level item's date (an attachment sorts with its e-mail). */
  family_date: string | null;
  /** 1 when the text came from OCR. */
  ocr: Generated<number>;
  control_number: string;
  original_name: string;
  original_path: Generated<string>;
  sha256: string;
  mime: Generated<string>;
  doc_type: Generated<string>;
  size: number;
  title: Generated<string>;
  author: Generated<string>;
  recipients: Generated<string>;
  sent_at: string | null;
  page_count: number | null;
  extract_status: Generated<ExtractStatus>;
  extract_error: string | null;
  duplicate_of: number | null;
  created_at: string;
  /** SHA-256 of an e-mail's normalised header fields and body (migration 2026_12_04_1300). */
  email_hash: string | null;
  /** The thread's first message (RFC 5322 3.6.4 threads); null for documents not e-mail. */
  thread_id: number | null;
  thread_parent_id: number | null;
  /** 1: an inclusive message of its thread; 0: contained in a later reply; null: not e-mail. */
  inclusive: number | null;
  /** The near-duplicate group's principal document; null when in no group. */
  near_dup_group_id: number | null;
  near_dup_similarity: number | null;
}

/** A document's MinHash signature (little-endian Uint32 per hash function). */
export interface DocumentMinhashTable {
  document_id: number;
  signature: Uint8Array;
}

/** A matter's passwords for encrypted files: AES-256-GCM ciphertext, never returned. */
export interface MatterPasswordsTable {
  id: Generated<number>;
  matter_id: number;
  label: Generated<string>;
  ciphertext: Uint8Array;
  iv: Uint8Array;
  tag: Uint8Array;
  created_by: string | null;
  created_at: string;
}

/** Every custodian who held a copy of a document (its own, plus those of de-duplicated copies). */
export interface DocumentCustodiansTable {
  document_id: number;
  custodian_id: number;
}

export interface DocumentTextsTable {
  document_id: number;
  title: Generated<string>;
  body: Generated<string>;
}

/** Logged by triggers (migration 2026_12_02_0700): documents whose searchable text may have changed. */
export interface KeywordChangesTable {
  id: Generated<number>;
  matter_id: number;
  document_id: number;
}

export interface DocumentsFtsTable {
  rowid: number;
  title: string;
  body: string;
  documents_fts: string;
  rank: number;
}

export type JobStatus = 'queued' | 'running' | 'succeeded' | 'failed' | 'cancelled';

export interface JobsTable {
  id: Generated<number>;
  matter_id: number | null;
  kind: string;
  status: Generated<JobStatus>;
  progress: Generated<number>;
  total: Generated<number>;
  message: Generated<string>;
  error: string | null;
  payload: Generated<string>;
  created_by: string | null;
  created_at: string;
  started_at: string | null;
  finished_at: string | null;
}

export type IndexStatus = 'building' | 'ready' | 'failed' | 'superseded';

/** A concept space build of a matter (server/indexing/persist.ts writes and reads it). */
export interface IndexVersionsTable {
  id: Generated<number>;
  matter_id: number;
  version: number;
  status: IndexStatus;
  k: number;
  weighting: string;
  n_docs: Generated<number>;
  n_terms: Generated<number>;
  nnz: Generated<number>;
  /** Float64 little-endian (server/engine/index/blob-codec.ts). */
  singular_values: Uint8Array | null;
  frobenius_sq: number | null;
  energy: number | null;
  orthogonality_u: number | null;
  orthogonality_v: number | null;
  build_ms: number | null;
  peak_rss_mb: number | null;
  /** The space's settings with the codec's format version (JSON). */
  params: Generated<string>;
  error: string | null;
  job_id: number | null;
  requested_by: string | null;
  created_at: string;
  completed_at: string | null;
}

export interface IndexTermsTable {
  index_id: number;
  term_id: number;
  term: string;
  df: number;
  global_weight: number;
  vector: Uint8Array;
}

export interface IndexDocsTable {
  index_id: number;
  document_id: number;
  vector: Uint8Array;
  folded_in: Generated<number>;
}

/** One BLOB per matrix, for fast loading (migrations/2026_12_01_0100_index_blobs.ts). */
export interface IndexBlobsTable {
  index_id: number;
  name: string;
  data: Uint8Array;
}

/** A matter lead's name for a concept dimension of an index version. */
export interface IndexDimensionLabelsTable {
  index_id: number;
  dim: number;
  label: string;
  labelled_by: string | null;
  labelled_at: string;
}

/** A k-means grouping of an index version's documents (server/concepts). */
export interface ConceptGroupingsTable {
  id: Generated<number>;
  index_id: number;
  groups: number;
  seed: number;
  dims: number;
  documents: number;
  iterations: number;
  converged: number;
  inertia: number;
  /** groups x dims little-endian Float32. */
  centres: Uint8Array;
  created_by: string | null;
  created_at: string;
}

export interface ConceptGroupsTable {
  id: Generated<number>;
  grouping_id: number;
  number: number;
  size: number;
  /** JSON [{ term, label, weight }]. */
  top_terms: Generated<string>;
}

export interface ConceptGroupMembersTable {
  group_id: number;
  document_id: number;
}

export interface CodesTable {
  id: Generated<number>;
  matter_id: number;
  name: string;
  shortcut: string | null;
  sort_order: Generated<number>;
  marks_privileged: Generated<number>;
  archived_at: string | null;
  created_at: string;
  /** Its code group (migration 2026_12_04_1401); null only for a code made outside the layout. */
  group_id: number | null;
  /** A colour name of CODE_COLOURS (shared/schemas/codes.ts). */
  colour: Generated<string>;
}

export interface CodeGroupsTable {
  id: Generated<number>;
  matter_id: number;
  name: string;
  kind: 'single' | 'multi' | 'privilege';
  required: Generated<number>;
  follow_family: Generated<number>;
  follow_duplicates: Generated<number>;
  sort_order: Generated<number>;
  created_at: string;
}

export interface DocumentCodesTable {
  document_id: number;
  code_id: number;
  coded_by: string;
  coded_at: string;
}

export interface PrivilegeEntriesTable {
  document_id: number;
  basis: Generated<string>;
  description: Generated<string>;
  privilege_type: Generated<string>;
  treatment: Generated<'withheld' | 'redacted'>;
  updated_by: string;
  updated_at: string;
}

export interface NotesTable {
  id: Generated<number>;
  document_id: number;
  author_id: string;
  body: string;
  created_at: string;
}

export interface SavedSearchesTable {
  id: Generated<number>;
  matter_id: number;
  name: string;
  query: string;
  mode: string;
  filters: Generated<string>;
  created_by: string;
  created_at: string;
}

export interface AuditEventsTable {
  id: Generated<number>;
  at: string;
  actor_id: string | null;
  actor_email: string | null;
  matter_id: number | null;
  action: string;
  target_type: string | null;
  target_id: string | null;
  detail: Generated<string>;
  ip: string | null;
}

export type BatchKind = 'review' | 'qc' | 'validation';
export type BatchState = 'unassigned' | 'assigned' | 'checked_out' | 'checked_in';

export interface ReviewBatchesTable {
  id: Generated<number>;
  matter_id: number;
  name: string;
  kind: BatchKind;
  state: Generated<BatchState>;
  assignee_id: string | null;
  /** How the batch was cut, as a person reads it ("Search: pricing (hybrid)"). */
  source: Generated<string>;
  /** JSON of the request that cut it. */
  source_detail: Generated<string>;
  created_by: string | null;
  created_at: string;
  assigned_at: string | null;
  checked_out_at: string | null;
  checked_in_at: string | null;
}

export interface ReviewBatchDocumentsTable {
  batch_id: number;
  document_id: number;
  position: number;
  /** The batch's kind while it is open, NULL once checked in (unique per document and kind). */
  open_kind: string | null;
}

export interface QcSamplesTable {
  id: Generated<number>;
  matter_id: number;
  batch_id: number;
  method: 'share' | 'count' | 'targeted';
  seed: number | null;
  share: number | null;
  requested: number | null;
  population: number;
  criteria: Generated<string>;
  created_by: string | null;
  created_at: string;
}

export interface QcItemsTable {
  id: Generated<number>;
  sample_id: number;
  document_id: number;
  code_id: number;
  first_coder_id: string | null;
  first_coded_at: string | null;
  verdict: 'confirmed' | 'overturned' | null;
  replacement_code_id: number | null;
  decided_by: string | null;
  decided_at: string | null;
  note: Generated<string>;
}

export interface CodingLocksTable {
  document_id: number;
  matter_id: number;
  sample_id: number | null;
  locked_by: string | null;
  locked_at: string;
}

/** A legal hold on a matter (custodian_id null) or one custodian (migration 2026_12_04_1180). */
export interface LegalHoldsTable {
  id: Generated<number>;
  matter_id: number;
  custodian_id: number | null;
  reason: string;
  set_by: string | null;
  set_at: string;
  released_by: string | null;
  released_at: string | null;
  release_reason: string | null;
}

/** A deleted coded document awaiting restore or purge (server/trash). */
export interface DocumentTrashTable {
  id: Generated<number>;
  matter_id: number;
  document_id: number;
  control_number: string;
  title: Generated<string>;
  original_name: string;
  document_count: number;
  /** JSON number[]: custodians of the document and its attachments (holds apply to them). */
  custodian_ids: Generated<string>;
  /** JSON [{ documentId, controlNumber, code }]: the codes it carried. */
  codes: Generated<string>;
  reason: string;
  trashed_by: string | null;
  trashed_at: string;
  /** JSON snapshot of every row that referenced the document (server/trash/snapshot.ts). */
  snapshot: string;
}

export interface DocumentTrashBlobsTable {
  trash_id: number;
  sha256: string;
}

/** A redaction marked on a document (server/redactions); burned into produced pages only. */
export interface RedactionsTable {
  id: Generated<number>;
  matter_id: number;
  document_id: number;
  kind: 'span' | 'pattern' | 'box';
  /** span: character offsets into the document's extracted body text. */
  start_offset: number | null;
  end_offset: number | null;
  /** pattern: a literal term, or a format mask ('#' a digit, '@' a letter). */
  pattern: string | null;
  pattern_kind: 'term' | 'format' | null;
  /** box: 1-based page of the original PDF and the box as fractions of the page, from top left. */
  page: number | null;
  x: number | null;
  y: number | null;
  width: number | null;
  height: number | null;
  reason: string;
  created_by: string;
  created_at: string;
  removed_at: string | null;
  removed_by: string | null;
  /** The built production that burned this redaction in (it can no longer be removed). */
  produced_in: number | null;
}

export type ProductionState = 'draft' | 'building' | 'built' | 'failed';

export interface ProductionsTable {
  id: Generated<number>;
  matter_id: number;
  name: string;
  /** JSON: { savedSearchId } or { codes, excludeCodes } as requested. */
  source: string;
  bates_prefix: string;
  bates_start: number;
  bates_padding: number;
  legend: Generated<string>;
  /** JSON [{ codeId, legend }]: a per-document legend from a code. */
  legend_codes: Generated<string>;
  privileged: 'withhold' | 'redact';
  natives: Generated<string>;
  state: Generated<ProductionState>;
  job_id: number | null;
  first_seq: number | null;
  last_seq: number | null;
  pages: number | null;
  zip_sha256: string | null;
  zip_size: number | null;
  error: string | null;
  created_by: string;
  created_at: string;
  built_at: string | null;
}

export interface ProductionDocumentsTable {
  production_id: number;
  document_id: number;
  /** source: chosen by the production's source; added: a family member added by the user; slip-sheet: a family member replaced by a slip sheet. */
  origin: 'source' | 'added' | 'slip-sheet';
  position: number | null;
  /** After the build: produced, redacted, withheld or native. */
  treatment: string | null;
  begin_seq: number | null;
  end_seq: number | null;
  pages: number | null;
  legend: string | null;
}

export interface Database {
  users: UsersTable;
  sessions: SessionsTable;
  matters: MattersTable;
  matter_members: MatterMembersTable;
  invitations: InvitationsTable;
  account_setup_tokens: AccountSetupTokensTable;
  custodians: CustodiansTable;
  upload_batches: UploadBatchesTable;
  documents: DocumentsTable;
  document_texts: DocumentTextsTable;
  document_custodians: DocumentCustodiansTable;
  document_minhash: DocumentMinhashTable;
  matter_passwords: MatterPasswordsTable;
  documents_fts: DocumentsFtsTable;
  keyword_changes: KeywordChangesTable;
  jobs: JobsTable;
  index_versions: IndexVersionsTable;
  index_terms: IndexTermsTable;
  index_docs: IndexDocsTable;
  index_blobs: IndexBlobsTable;
  index_dimension_labels: IndexDimensionLabelsTable;
  concept_groupings: ConceptGroupingsTable;
  concept_groups: ConceptGroupsTable;
  concept_group_members: ConceptGroupMembersTable;
  codes: CodesTable;
  code_groups: CodeGroupsTable;
  review_batches: ReviewBatchesTable;
  review_batch_documents: ReviewBatchDocumentsTable;
  qc_samples: QcSamplesTable;
  qc_items: QcItemsTable;
  coding_locks: CodingLocksTable;
  document_codes: DocumentCodesTable;
  privilege_entries: PrivilegeEntriesTable;
  notes: NotesTable;
  saved_searches: SavedSearchesTable;
  audit_events: AuditEventsTable;
  legal_holds: LegalHoldsTable;
  document_trash: DocumentTrashTable;
  document_trash_blobs: DocumentTrashBlobsTable;
  redactions: RedactionsTable;
  productions: ProductionsTable;
  production_documents: ProductionDocumentsTable;
  ranking_models: RankingModelsTable;
  validation_samples: ValidationSamplesTable;
  validation_sample_documents: ValidationSampleDocumentsTable;
}

export type UserRow = Selectable<UsersTable>;
export type NewUserRow = Insertable<UsersTable>;
export type MatterRow = Selectable<MattersTable>;
export type MemberRow = Selectable<MatterMembersTable>;
export type InvitationRow = Selectable<InvitationsTable>;
export type DocumentRow = Selectable<DocumentsTable>;
export type NewDocumentRow = Insertable<DocumentsTable>;
export type DocumentUpdate = Updateable<DocumentsTable>;
export type JobRow = Selectable<JobsTable>;
export type IndexVersionRow = Selectable<IndexVersionsTable>;
export type CodeRow = Selectable<CodesTable>;
export type AuditEventRow = Selectable<AuditEventsTable>;

/** A learned ranking of a matter (server/prioritised): counts, timing, and its scores. */
export interface RankingModelsTable {
  id: Generated<number>;
  matter_id: number;
  version: number;
  index_version: number;
  positives: number;
  negatives: number;
  /** Latest coded_at among the codes it was trained on. */
  coded_through: string;
  lambda: number;
  train_ms: number;
  rank_ms: number;
  reason: Generated<string>;
  /** Cross-validated k / hybrid weight measurement (JSON), once 50 codes of each kind exist. */
  tuning: string | null;
  trained_at: string;
  /** Int32 document ids and the Float32 scores in the same order. */
  doc_ids: Uint8Array;
  scores: Uint8Array;
}

export interface ValidationSamplesTable {
  id: Generated<number>;
  matter_id: number;
  kind: 'prevalence' | 'elusion';
  confidence: number;
  margin: number;
  seed: number;
  population: number;
  population_rule: string;
  size: number;
  /** Documents coded Responsive when the sample was drawn. */
  produced: number;
  batch_id: number | null;
  created_by: string | null;
  created_at: string;
}

export interface ValidationSampleDocumentsTable {
  sample_id: number;
  document_id: number;
  position: number;
}
