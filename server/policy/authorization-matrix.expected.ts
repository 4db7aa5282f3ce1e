// Who may call each API route: the authorization matrix (authorization-matrix.test.ts)
// checks every route against this table over HTTP, for each matter role, a signed-in
// non-member, a firm admin who is not a member, and an anonymous caller. It is written
// out by hand from the product's roles table, NOT derived from the routes' own `access`
// declarations, so a route declaring the wrong permission fails.
//
// A new route needs one row, keyed "METHOD /path" exactly as declared (path relative
// to /api). A route without a row, or a row without a route, fails the test by name.
import type { MatterRole } from '../../shared/roles';

export type ExpectedAccess =
  | { kind: 'public' }
  | { kind: 'signed-in' }
  | { kind: 'firm-admin' }
  | { kind: 'members'; roles: readonly MatterRole[] };

/** Anyone, signed in or not. */
const PUBLIC: ExpectedAccess = { kind: 'public' };
/** Any signed-in account; anonymous callers get 401. */
const SIGNED_IN: ExpectedAccess = { kind: 'signed-in' };
/** Firm admins; other accounts 403, anonymous 401. */
const FIRM_ADMIN: ExpectedAccess = { kind: 'firm-admin' };
/** Members of the matter holding one of these roles; other members 403; non-members 404. */
const members = (...roles: MatterRole[]): ExpectedAccess => ({ kind: 'members', roles });

export const EXPECTED_ACCESS: Record<string, ExpectedAccess> = {
  'POST /auth/sign-in': PUBLIC,
  'POST /auth/sign-out': PUBLIC,
  'GET /auth/me': SIGNED_IN,
  'POST /auth/password': SIGNED_IN,
  'GET /account-setup/:token': PUBLIC,
  'POST /account-setup/:token': PUBLIC,
  'GET /admin/users': FIRM_ADMIN,
  'POST /admin/users': FIRM_ADMIN,
  'PATCH /admin/users/:userId': FIRM_ADMIN,
  'GET /admin/matters': FIRM_ADMIN,
  'PUT /admin/matters/:matterId/lead': FIRM_ADMIN,
  'GET /matters': SIGNED_IN,
  'POST /matters': FIRM_ADMIN,
  'GET /matters/:matterId': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'GET /matters/:matterId/members': members('lead'),
  'POST /matters/:matterId/members': members('lead'),
  'PATCH /matters/:matterId/members/:userId': members('lead'),
  'DELETE /matters/:matterId/members/:userId': members('lead'),
  'POST /matters/:matterId/invitations': members('lead'),
  'DELETE /matters/:matterId/invitations/:id': members('lead'),
  'GET /invitations/:token': PUBLIC,
  'POST /invitations/:token/accept': PUBLIC,
  'GET /matters/:matterId/audit': members('lead'),
  'GET /matters/:matterId/audit.csv': members('lead'),
  // The dev mailbox: firm admins only (in development it is not mounted behind sign-in).
  'GET /dev/mail': FIRM_ADMIN,
  'GET /instance': PUBLIC,
  'POST /matters/:matterId/search': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'GET /matters/:matterId/documents/:docId/similar': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'GET /matters/:matterId/searches/recent': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'GET /matters/:matterId/codes': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'POST /matters/:matterId/codes': members('lead'),
  'PATCH /matters/:matterId/codes/:codeId': members('lead'),
  'DELETE /matters/:matterId/codes/:codeId': members('lead'),
  'POST /matters/:matterId/codes/bulk': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'PUT /matters/:matterId/documents/:docId/codes': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'GET /matters/:matterId/documents/:docId/review': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'GET /matters/:matterId/documents/:docId/notes': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'POST /matters/:matterId/documents/:docId/notes': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'PUT /matters/:matterId/documents/:docId/privilege': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'GET /matters/:matterId/saved-searches': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'POST /matters/:matterId/saved-searches': members('lead', 'attorney'),
  'DELETE /matters/:matterId/saved-searches/:savedSearchId': members('lead', 'attorney'),
  'GET /matters/:matterId/exports/results.csv': members('lead', 'attorney'),
  'GET /matters/:matterId/exports/privilege-log.csv': members('lead', 'attorney'),
  'POST /matters/:matterId/documents': members('lead', 'paralegal'),
  'GET /matters/:matterId/documents': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'GET /matters/:matterId/documents/:docId': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'GET /matters/:matterId/documents/:docId/text': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'GET /matters/:matterId/documents/:docId/original': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'POST /matters/:matterId/documents/:docId/retry': members('lead', 'paralegal'),
  'DELETE /matters/:matterId/documents/:docId': members('lead', 'paralegal'),
  'GET /matters/:matterId/custodians': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'POST /matters/:matterId/custodians': members('lead', 'paralegal'),
  'GET /jobs/:jobId': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'GET /matters/:matterId/jobs': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'GET /matters/:matterId/index': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'POST /matters/:matterId/index/rebuild': members('lead'),
  'GET /matters/:matterId/concepts/spectrum': members('lead', 'attorney'),
  'GET /matters/:matterId/concepts/dimensions': members('lead', 'attorney'),
  'PUT /matters/:matterId/concepts/dimensions/:dim/label': members('lead'),
  'DELETE /matters/:matterId/concepts/dimensions/:dim/label': members('lead'),
  'GET /matters/:matterId/concepts/terms/neighbours': members('lead', 'attorney'),
  'GET /matters/:matterId/concepts/map': members('lead', 'attorney'),
  'GET /matters/:matterId/concepts/groupings': members('lead', 'attorney'),
  'POST /matters/:matterId/concepts/groupings': members('lead', 'attorney'),
  'GET /matters/:matterId/concepts/groupings/:groupingId': members('lead', 'attorney'),
  'GET /matters/:matterId/concepts/health': members('lead', 'attorney'),
  // Legal holds and the trash (docs/ARCHITECTURE.md "Deleting documents"): every member
  // reads the holds; only the lead sets, releases, restores and purges.
  'GET /matters/:matterId/holds': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'POST /matters/:matterId/holds': members('lead'),
  'POST /matters/:matterId/holds/:holdId/release': members('lead'),
  'GET /matters/:matterId/trash': members('lead'),
  'POST /matters/:matterId/trash/:trashId/restore': members('lead'),
  'DELETE /matters/:matterId/trash/:trashId': members('lead'),
  // Search term reports (#12): anyone who searches runs one; the CSV for opposing counsel is an export.
  'POST /matters/:matterId/search-term-report': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'POST /matters/:matterId/search-term-report.csv': members('lead', 'attorney'),
  // Collections (#13): every member reads threads and near-duplicates; the lead keeps the password list and near-duplicate settings.
  'GET /matters/:matterId/documents/:docId/thread': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'GET /matters/:matterId/documents/:docId/near-duplicates': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'PUT /matters/:matterId/near-duplicates/settings': members('lead'),
  'GET /matters/:matterId/passwords': members('lead'),
  'POST /matters/:matterId/passwords': members('lead'),
  'DELETE /matters/:matterId/passwords/:passwordId': members('lead'),
  // Review workflow (#14): the lead shapes the layout; leads and attorneys cut and hand out batches, anyone who codes works one; QC is the lead's, the items are answered by whoever is asked; the privilege log is the lawyers'.
  'POST /matters/:matterId/code-groups': members('lead'),
  'PATCH /matters/:matterId/code-groups/:groupId': members('lead'),
  'GET /matters/:matterId/batches': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'POST /matters/:matterId/batches': members('lead', 'attorney'),
  'GET /matters/:matterId/batches/progress': members('lead', 'attorney'),
  'GET /matters/:matterId/batches/:batchId': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'POST /matters/:matterId/batches/:batchId/assign': members('lead', 'attorney'),
  'POST /matters/:matterId/batches/:batchId/checkout': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'POST /matters/:matterId/batches/:batchId/checkin': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'GET /matters/:matterId/qc/samples': members('lead'),
  'POST /matters/:matterId/qc/samples': members('lead'),
  'GET /matters/:matterId/qc/samples/:sampleId': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'POST /matters/:matterId/qc/items/:itemId/decision': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'GET /matters/:matterId/qc/overturn-rates': members('lead'),
  'DELETE /matters/:matterId/documents/:docId/lock': members('lead'),
  'GET /matters/:matterId/privilege-log': members('lead', 'attorney'),
  'PATCH /matters/:matterId/privilege-log/:docId': members('lead', 'attorney'),
  // Redactions and productions (#15): anyone reviewing marks redactions; leads and attorneys build productions.
  'GET /matters/:matterId/documents/:docId/redactions': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'POST /matters/:matterId/documents/:docId/redactions': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'DELETE /matters/:matterId/documents/:docId/redactions/:redactionId': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'GET /matters/:matterId/productions': members('lead', 'attorney'),
  'POST /matters/:matterId/productions': members('lead', 'attorney'),
  'GET /matters/:matterId/productions/:productionId': members('lead', 'attorney'),
  'POST /matters/:matterId/productions/:productionId/family': members('lead', 'attorney'),
  'POST /matters/:matterId/productions/:productionId/build': members('lead', 'attorney'),
  'GET /matters/:matterId/productions/:productionId/download': members('lead', 'attorney'),
  // Prioritised review and validation (#16): anyone who searches sees the ranked order; leads and attorneys train it and cut its batches and read validation; the lead draws the samples.
  'GET /matters/:matterId/prioritised': members('lead', 'attorney', 'paralegal', 'reviewer'),
  'POST /matters/:matterId/prioritised/more-like-responsive': members(
    'lead',
    'attorney',
    'paralegal',
    'reviewer',
  ),
  'POST /matters/:matterId/prioritised/train': members('lead', 'attorney'),
  'POST /matters/:matterId/prioritised/batches': members('lead', 'attorney'),
  'GET /matters/:matterId/validation/samples': members('lead', 'attorney'),
  'POST /matters/:matterId/validation/samples': members('lead'),
  'GET /matters/:matterId/validation/samples/:sampleId': members('lead', 'attorney'),
  'GET /matters/:matterId/validation/samples/:sampleId/report.csv': members('lead', 'attorney'),
};
