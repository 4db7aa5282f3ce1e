import {
  CODES_SEPARATOR,
  EXPORT_RESULTS_MAX,
  PRIVILEGE_LOG_CSV_COLUMNS,
  RESULTS_CSV_COLUMNS,
} from '../../shared/schemas/exports';
import type { SearchFilters, SearchMode, SearchSort } from '../../shared/schemas/search';
import { PRIVILEGE_LOG_COLUMNS } from '../../shared/schemas/privilege-log';
import { recordAudit } from '../audit/record';
import { appliedCodesOf } from '../codes/service';
import type { AppContext } from '../context';
import { pageIds } from '../search/service';
import { documentsByIds } from '../search/queries';
import { rankResultSet } from '../search/ranking';
import { toCsv } from './csv';
import { buildPrivilegeLog } from './privilege-log';
import { collectionCells, collectionFieldsOf, findMatterPrefix } from './queries';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

/** The date part of an ISO-8601 timestamp, '' when unknown. */
const dateOf = (iso: string | null) => (iso ? iso.slice(0, 10) : '');
const today = () => new Date().toISOString().slice(0, 10);

async function filePrefix(ctx: AppContext, matterId: number) {
  return (await findMatterPrefix(ctx.db, matterId))?.control_prefix ?? 'matter';
}

export interface ResultsExportInput {
  query: string;
  mode: SearchMode;
  filters: SearchFilters;
  sort?: SearchSort['field'];
  direction?: SearchSort['direction'];
}

/** Every hit of the search (up to EXPORT_RESULTS_MAX), in the requested order. */
export async function exportResults(
  ctx: AppContext,
  matterId: number,
  input: ResultsExportInput,
  actor: Actor,
) {
  const ranked = await rankResultSet(
    ctx,
    matterId,
    { query: input.query, mode: input.mode, filters: input.filters },
    EXPORT_RESULTS_MAX,
  );
  const sort: SearchSort = {
    field: input.sort ?? 'score',
    direction: input.direction ?? (input.sort && input.sort !== 'score' ? 'asc' : 'desc'),
  };
  const ids = await pageIds(ctx, ranked, sort, ranked.ids.length, 0);
  const position = new Map(ranked.ids.map((id, i) => [id, i]));
  const docs = new Map((await documentsByIds(ctx.db, matterId, ids)).map((d) => [d.id, d]));
  const codes = await appliedCodesOf(ctx.db, ids);
  const collection = await collectionFieldsOf(ctx.db, ids);
  const rows: (string | number)[][] = [];
  for (const id of ids) {
    const doc = docs.get(id);
    if (!doc) continue;
    const i = position.get(id)!;
    rows.push([
      i + 1,
      doc.control_number,
      doc.title || doc.original_name,
      doc.custodian_name ?? '',
      dateOf(doc.sent_at),
      doc.doc_type,
      ranked.bar[i].toFixed(4),
      (codes.get(id) ?? []).map((c) => c.name).join(CODES_SEPARATOR),
      ...collectionCells(collection.get(id)),
    ]);
  }
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'export.results',
    targetType: 'search',
    detail: {
      query: input.query,
      mode: ranked.mode,
      requestedMode: input.mode,
      filters: input.filters,
      sort,
      rows: rows.length,
      capped: ranked.capped,
      indexVersion: ranked.indexVersion,
    },
  });
  return {
    filename: `${await filePrefix(ctx, matterId)}-search-results-${today()}.csv`,
    body: toCsv(RESULTS_CSV_COLUMNS, rows),
  };
}

export async function exportPrivilegeLog(ctx: AppContext, matterId: number, actor: Actor) {
  const log = await buildPrivilegeLog(ctx.db, matterId);
  const rows = log.map((r) => PRIVILEGE_LOG_COLUMNS.map(([field]) => r[field]));
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'export.privilege_log',
    targetType: 'matter',
    targetId: matterId,
    detail: {
      rows: rows.length,
      familyRows: log.filter((r) => r.relation !== '').length,
      withoutBasis: log.filter((r) => !r.basis).length,
      withoutDescription: log.filter((r) => !r.description).length,
    },
  });
  return {
    filename: `${await filePrefix(ctx, matterId)}-privilege-log-${today()}.csv`,
    body: toCsv(PRIVILEGE_LOG_CSV_COLUMNS, rows),
  };
}
