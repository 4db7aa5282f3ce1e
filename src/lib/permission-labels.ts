import type { MatterPermission } from '@shared/roles';

/** Plain words for each permission, shown on the matter home ("what your role may do"). */
export const PERMISSION_LABELS: Record<MatterPermission, string> = {
  'matter.view': 'Open the matter',
  'documents.read': 'Read documents',
  'documents.upload': 'Upload documents',
  'documents.organise': 'Organise custodians and batches',
  'documents.delete': 'Delete documents',
  'documents.code': 'Code documents',
  'search.run': 'Run searches',
  'searches.save': 'Save searches for the team',
  'codes.manage': 'Edit the code set',
  'exports.create': 'Export results and the privilege log',
  'members.view': 'See who has access',
  'members.manage': 'Grant, change and revoke access',
  'audit.read': 'Read the activity log',
  'index.view': 'See the index status',
  'index.rebuild': 'Rebuild the concept index',
  'concepts.view': 'Explore the concept space',
  'concepts.label': 'Label concepts',
  'batches.manage': 'Cut and assign review batches',
  'qc.manage': 'Draw quality-control samples and unlock checked coding',
  'privilege_log.edit': 'Read and edit the privilege log',
  'holds.manage': 'Set and release legal holds',
  'documents.restore': 'Restore deleted documents from the trash',
  'documents.purge': 'Destroy deleted documents for good',
};
