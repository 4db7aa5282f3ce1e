import type { MatterPermission } from '@shared/roles';

/**
 * The sections of a matter, in the order the matter's navigation lists them.
 * To add a section: add its route under the matter layout in src/app/router.tsx
 * and one entry here. A section is shown only to roles holding `permission`
 * (shared/roles.ts); the server refuses the same requests anyway.
 */
export interface MatterSection {
  /** Stable id, also used as data-testid `matter-nav-<id>`. */
  id: string;
  label: string;
  /** Path below /matters/:matterId ('' is the matter's home). */
  path: string;
  permission: MatterPermission;
  /** One line for the matter home's overview of sections. */
  summary: string;
}

export const MATTER_SECTIONS: readonly MatterSection[] = [
  {
    id: 'overview',
    label: 'Overview',
    path: '',
    permission: 'matter.view',
    summary: 'The matter at a glance and your role on it.',
  },
  {
    id: 'search',
    label: 'Search',
    path: 'search',
    permission: 'search.run',
    summary: 'Concept, keyword and hybrid search; review, code and export the results.',
  },
  {
    id: 'concepts',
    label: 'Concept space',
    path: 'concepts',
    permission: 'concepts.view',
    summary:
      'The spectrum, leading concepts, related terms, a map of the documents, groups and index health.',
  },
  {
    id: 'documents',
    label: 'Documents',
    path: 'documents',
    permission: 'documents.read',
    summary: 'Every file loaded, its control number and status, and the concept index.',
  },
  {
    id: 'codes',
    label: 'Codes',
    path: 'codes',
    permission: 'documents.read',
    summary: 'The code set reviewers apply and the viewer key for each; the lead edits it.',
  },
  {
    id: 'upload',
    label: 'Upload',
    path: 'upload',
    permission: 'documents.upload',
    summary: 'Add files or a .zip for a custodian and follow their extraction and indexing.',
  },
  {
    id: 'productions',
    label: 'Productions',
    path: 'productions',
    permission: 'productions.manage',
    summary: 'Bates-numbered production sets with redactions burned in, built and downloaded.',
  },
  {
    id: 'access',
    label: 'Access',
    path: 'access',
    permission: 'members.view',
    summary: 'Who may work on this matter, their roles, and pending invitations.',
  },
  {
    id: 'activity',
    label: 'Activity log',
    path: 'activity',
    permission: 'audit.read',
    summary: 'Every sign-in, invitation and access change, newest first.',
  },
  {
    id: 'batches',
    label: 'Batches',
    path: 'batches',
    permission: 'documents.code',
    summary: 'Your review batches; for leads and attorneys, cutting, assigning and team progress.',
  },
  {
    id: 'qc',
    label: 'Quality control',
    path: 'qc',
    permission: 'qc.manage',
    summary: 'Second-level review of first-level calls: samples, verdicts and overturn rates.',
  },
  {
    id: 'privilege-log',
    label: 'Privilege log',
    path: 'privilege-log',
    permission: 'privilege_log.edit',
    summary: 'Withheld and redacted documents with their families; edit descriptions, export CSV.',
  },
  {
    id: 'trash',
    label: 'Trash',
    path: 'trash',
    permission: 'documents.delete',
    summary: 'Deleted coded documents: restore them, or purge them for good.',
  },
  {
    id: 'prioritised',
    label: 'Prioritised review',
    path: 'prioritised',
    permission: 'search.run',
    summary: 'Uncoded documents most likely responsive, learned from the team’s codes.',
  },
  {
    id: 'validation',
    label: 'Validation',
    path: 'validation',
    permission: 'validation.view',
    summary:
      'Prevalence and elusion samples with exact confidence intervals and a recall estimate.',
  },
];

export function matterSectionHref(matterId: number, section: MatterSection): string {
  return section.path ? `/matters/${matterId}/${section.path}` : `/matters/${matterId}`;
}
