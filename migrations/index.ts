import type { Migration } from 'kysely';
import * as initial from './2026_12_01_0001_initial';
import * as indexBlobs from './2026_12_01_0100_index_blobs';
import * as accountSetupTokens from './2026_12_02_0200_account_setup_tokens';
import * as conceptInsights from './2026_12_02_0400_concept_insights';
import * as matterIndexSettings from './2026_12_02_0500_matter_index_settings';
import * as searchFilterIndex from './2026_12_02_0600_search_filter_index';
import * as keywordChanges from './2026_12_02_0700_keyword_changes';
import * as documentFamilies from './2026_12_04_0100_document_families';
import * as documentMetadata from './2026_12_04_0200_document_metadata';
import * as authHardening from './2026_12_04_1100_auth_hardening';
import * as legalHoldsAndTrash from './2026_12_04_1180_legal_holds_and_trash';
import * as reviewBatches from './2026_12_04_1400_review_batches';
import * as codeGroups from './2026_12_04_1401_code_groups';
import * as qualityControl from './2026_12_04_1402_quality_control';
import * as exactWordsIndex from './2026_12_04_1200_exact_words_index';
import * as documentRelationships from './2026_12_04_1300_document_relationships';
import * as productions from './2026_12_04_1500_productions';
import * as prioritisedValidation from './2026_12_04_1600_prioritised_validation';

// Every migration, in order. A static list (rather than a folder scan) works the
// same under tsx, Vitest and worker threads. Add new files at the end.
export const migrations: Record<string, Migration> = {
  '2026_12_01_0001_initial': initial,
  '2026_12_01_0100_index_blobs': indexBlobs,
  '2026_12_02_0200_account_setup_tokens': accountSetupTokens,
  '2026_12_02_0400_concept_insights': conceptInsights,
  '2026_12_02_0500_matter_index_settings': matterIndexSettings,
  '2026_12_02_0600_search_filter_index': searchFilterIndex,
  '2026_12_02_0700_keyword_changes': keywordChanges,
  '2026_12_04_0100_document_families': documentFamilies,
  '2026_12_04_0200_document_metadata': documentMetadata,
  '2026_12_04_1100_auth_hardening': authHardening,
  '2026_12_04_1180_legal_holds_and_trash': legalHoldsAndTrash,
  '2026_12_04_1200_exact_words_index': exactWordsIndex,
  '2026_12_04_1300_document_relationships': documentRelationships,
  '2026_12_04_1400_review_batches': reviewBatches,
  '2026_12_04_1401_code_groups': codeGroups,
  '2026_12_04_1402_quality_control': qualityControl,
  '2026_12_04_1500_productions': productions,
  '2026_12_04_1600_prioritised_validation': prioritisedValidation,
};
