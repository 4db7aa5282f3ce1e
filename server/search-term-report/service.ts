// The search term report: for each negotiated term, the documents it hits, those no
// other term hits, the hits with their families, and the hits per custodian. Every term
// runs through the search query language's match set (server/search/boolean.ts), so a
// term counts exactly what a search for it lists as hits (keyword matching; concept
// similarity plays no part in a term's count).
import {
  TERM_REPORT_CSV_COLUMNS,
  type TermReportParsedReq,
  type TermReportResponse,
  type TermReportRow,
} from '../../shared/schemas/search-term-report';
import { recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import { parseQuery, QuerySyntaxError } from '../engine/index';
import { toCsv } from '../exports/csv';
import { findMatterPrefix } from '../exports/queries';
import { MatchSetEvaluator, matchSetOf } from '../search/boolean';
import { duplicatesOf, filteredDocumentIds, restricts } from '../search/queries';
import { custodiansOfDocuments, familiesOf } from './queries';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

export async function buildTermReport(
  ctx: AppContext,
  matterId: number,
  req: TermReportParsedReq,
): Promise<TermReportResponse> {
  const filters = req.filters;
  const allow = restricts(filters)
    ? new Set(filteredDocumentIds(ctx.db, ctx.sqlite, matterId, filters))
    : null;
  const evaluator = new MatchSetEvaluator(ctx.sqlite, matterId);
  const hitsOf: (Set<number> | null)[] = [];
  const errors: (string | undefined)[] = [];
  for (const term of req.terms) {
    if (term.trim() === '') {
      hitsOf.push(null);
      errors.push('The term is empty');
      continue;
    }
    let hits: Set<number>;
    try {
      hits = matchSetOf(ctx.sqlite, matterId, parseQuery(term), term, evaluator);
    } catch (error) {
      const message =
        error instanceof QuerySyntaxError
          ? error.message
          : // A text leaf's validation error (boolean.ts) carries "query: " first.
            error instanceof Error && 'field' in error
            ? error.message.replace(/^query: /, '')
            : null;
      if (message === null) throw error;
      hitsOf.push(null);
      errors.push(message);
      continue;
    }
    if (allow) hits = new Set([...hits].filter((id) => allow.has(id)));
    if (filters.includeDuplicates && hits.size > 0)
      for (const d of await duplicatesOf(ctx.db, matterId, [...hits], filters)) hits.add(d.id);
    hitsOf.push(hits);
    errors.push(undefined);
  }

  // How many terms hit each document (for the unique count).
  const termsHitting = new Map<number, number>();
  for (const hits of hitsOf)
    if (hits) for (const id of hits) termsHitting.set(id, (termsHitting.get(id) ?? 0) + 1);

  const familyOf = new Map<number, number>();
  const members = new Map<number, number[]>();
  for (const row of familiesOf(ctx.sqlite, matterId, Boolean(filters.includeDuplicates))) {
    const family = row.family_id ?? row.id;
    familyOf.set(row.id, family);
    const list = members.get(family);
    if (list) list.push(row.id);
    else members.set(family, [row.id]);
  }
  const withFamilies = (hits: Iterable<number>) => {
    const out = new Set<number>();
    const families = new Set<number>();
    for (const id of hits) {
      out.add(id);
      const family = familyOf.get(id) ?? id;
      if (families.has(family)) continue;
      families.add(family);
      for (const member of members.get(family) ?? []) out.add(member);
    }
    return out;
  };
  const custodians = new Map<number, string[]>();
  for (const { document_id, name } of custodiansOfDocuments(ctx.sqlite, matterId)) {
    const list = custodians.get(document_id);
    if (list) list.push(name);
    else custodians.set(document_id, [name]);
  }

  const rows: TermReportRow[] = req.terms.map((term, i) => {
    const hits = hitsOf[i];
    if (!hits)
      return {
        term,
        documents: 0,
        uniqueDocuments: 0,
        withFamilies: 0,
        byCustodian: [],
        error: errors[i],
      };
    let unique = 0;
    const perCustodian = new Map<string, number>();
    for (const id of hits) {
      if (termsHitting.get(id) === 1) unique++;
      for (const name of custodians.get(id) ?? [])
        perCustodian.set(name, (perCustodian.get(name) ?? 0) + 1);
    }
    return {
      term,
      documents: hits.size,
      uniqueDocuments: unique,
      withFamilies: withFamilies(hits).size,
      byCustodian: [...perCustodian.entries()]
        .sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0]))
        .map(([custodian, documents]) => ({ custodian, documents })),
    };
  });
  const all = new Set<number>(termsHitting.keys());
  return { rows, total: { documents: all.size, withFamilies: withFamilies(all).size } };
}

/** POST .../search-term-report: the report, audited as search.term_report. */
export async function runTermReport(
  ctx: AppContext,
  matterId: number,
  req: TermReportParsedReq,
  actor: Actor,
): Promise<TermReportResponse> {
  const report = await buildTermReport(ctx, matterId, req);
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'search.term_report',
    targetType: 'search',
    detail: {
      terms: req.terms,
      filters: req.filters,
      documents: report.total.documents,
      errors: report.rows.filter((r) => r.error).length,
    },
  });
  return report;
}

/** The custodians named in the report, for the CSV's per-custodian columns (A-Z). */
function custodianColumns(report: TermReportResponse): string[] {
  const names = new Set<string>();
  for (const row of report.rows) for (const c of row.byCustodian) names.add(c.custodian);
  return [...names].sort((a, b) => a.localeCompare(b));
}

/** POST .../search-term-report.csv: the report as CSV, audited as export.search_term_report. */
export async function exportTermReport(
  ctx: AppContext,
  matterId: number,
  req: TermReportParsedReq,
  actor: Actor,
): Promise<{ filename: string; body: string }> {
  const report = await buildTermReport(ctx, matterId, req);
  const names = custodianColumns(report);
  const header = [...TERM_REPORT_CSV_COLUMNS, ...names.map((n) => `Custodian: ${n}`)];
  const rows: (string | number)[][] = report.rows.map((row) => {
    const counts = new Map(row.byCustodian.map((c) => [c.custodian, c.documents]));
    return [
      row.term,
      row.documents,
      row.uniqueDocuments,
      row.withFamilies,
      row.error ?? '',
      ...names.map((n) => counts.get(n) ?? 0),
    ];
  });
  rows.push([
    'Total (any term)',
    report.total.documents,
    '',
    report.total.withFamilies,
    '',
    ...names.map(() => ''),
  ]);
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'export.search_term_report',
    targetType: 'search',
    detail: { terms: req.terms, filters: req.filters, rows: report.rows.length },
  });
  const prefix = (await findMatterPrefix(ctx.db, matterId))?.control_prefix ?? 'matter';
  return {
    filename: `${prefix}-search-term-report-${new Date().toISOString().slice(0, 10)}.csv`,
    body: toCsv(header, rows),
  };
}
