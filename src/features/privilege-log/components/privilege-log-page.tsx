import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import {
  PRIVILEGE_LOG_COLUMNS,
  type PrivilegeLogField,
  type PrivilegeLogRow,
} from '@shared/schemas/privilege-log';
import { ReviewCaution } from '@/components/review-caution';
import {
  DownloadLink,
  EmptyState,
  Notice,
  PageHeader,
  QueryBoundary,
  describeError,
} from '@/components/ui';
import { useMatterPermission } from '@/lib/authorization';
import { privilegeLogCsvHref } from '@/features/exports/api/export-links';
import { usePatchPrivilegeLogRow } from '../api/patch-privilege-log-row';
import { usePrivilegeLog } from '../api/get-privilege-log';

const SHOWN: PrivilegeLogField[] = [
  'controlNumber',
  'familyBegin',
  'familyEnd',
  'date',
  'from',
  'to',
  'cc',
  'subject',
  'custodian',
  'documentType',
  'privilegeType',
  'basis',
  'description',
  'treatment',
];
const LABEL = Object.fromEntries(PRIVILEGE_LOG_COLUMNS) as Record<PrivilegeLogField, string>;

/**
 * The privilege log: sortable by any column; "Log order" keeps family members under their
 * parent. Descriptions are edited in place (audited); the CSV export is audited too.
 */
export function PrivilegeLogPage({ matterId }: { matterId: number }) {
  const log = usePrivilegeLog(matterId);
  const canExport = useMatterPermission('exports.create');
  const [sort, setSort] = useState<{ field: PrivilegeLogField | null; dir: 1 | -1 }>({
    field: null,
    dir: 1,
  });
  return (
    <div data-testid="privilege-log-page">
      <PageHeader
        title="Privilege log"
        description="Every withheld or redacted document, family members under their parent. Describe each without revealing the privileged content."
        actions={
          canExport ? (
            <DownloadLink href={privilegeLogCsvHref(matterId)} data-testid="privilege-log-csv">
              Export CSV
            </DownloadLink>
          ) : null
        }
      />
      <ReviewCaution className="mb-4" compact />
      <QueryBoundary query={log} errorTitle="The privilege log could not be loaded">
        {(data) =>
          data.rows.length === 0 ? (
            <EmptyState title="Nothing on the log yet">
              Documents coded with a privilege code appear here with their families.
            </EmptyState>
          ) : (
            <LogTable matterId={matterId} rows={data.rows} sort={sort} onSort={setSort} />
          )
        }
      </QueryBoundary>
    </div>
  );
}

function LogTable({
  matterId,
  rows,
  sort,
  onSort,
}: {
  matterId: number;
  rows: PrivilegeLogRow[];
  sort: { field: PrivilegeLogField | null; dir: 1 | -1 };
  onSort: (s: { field: PrivilegeLogField | null; dir: 1 | -1 }) => void;
}) {
  const sorted = useMemo(() => {
    if (!sort.field) return rows;
    const f = sort.field;
    return [...rows].sort((a, b) => String(a[f]).localeCompare(String(b[f])) * sort.dir);
  }, [rows, sort]);
  return (
    <div className="overflow-x-auto rounded-md border border-line bg-panel">
      <table className="w-full border-collapse text-[13px]" data-testid="privilege-log-table">
        <caption className="sr-only">Privilege log</caption>
        <thead className="bg-sunk/70 text-left">
          <tr>
            {SHOWN.map((field) => (
              <th
                key={field}
                scope="col"
                className="border-b border-line px-2 py-1.5 font-semibold whitespace-nowrap"
                aria-sort={
                  sort.field === field ? (sort.dir === 1 ? 'ascending' : 'descending') : 'none'
                }
              >
                <button
                  type="button"
                  onClick={() =>
                    onSort({ field, dir: sort.field === field ? (sort.dir === 1 ? -1 : 1) : 1 })
                  }
                  data-testid={`sort-${field}`}
                >
                  {LABEL[field]}
                  {sort.field === field ? (sort.dir === 1 ? ' ▲' : ' ▼') : ''}
                </button>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {sorted.map((row) => (
            <tr
              key={row.documentId}
              className="border-b border-line align-top"
              data-testid="privilege-log-row"
              data-control={row.controlNumber}
            >
              {SHOWN.map((field) => (
                <td key={field} className="px-2 py-1.5">
                  {field === 'controlNumber' ? (
                    <Link
                      to={`/matters/${matterId}/review/${row.documentId}`}
                      className={`font-mono text-accent-strong hover:underline ${row.relation === 'Attachment' && !sort.field ? 'pl-4' : ''}`}
                    >
                      {row.relation === 'Attachment' && !sort.field ? '↳ ' : ''}
                      {row.controlNumber}
                    </Link>
                  ) : field === 'description' ? (
                    <DescriptionCell matterId={matterId} row={row} />
                  ) : (
                    <span className="break-words">{String(row[field]) || '—'}</span>
                  )}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function DescriptionCell({ matterId, row }: { matterId: number; row: PrivilegeLogRow }) {
  const canEdit = useMatterPermission('privilege_log.edit');
  const patch = usePatchPrivilegeLogRow(matterId);
  const [editing, setEditing] = useState(false);
  const [value, setValue] = useState(row.description);
  if (!editing)
    return (
      <span className="flex items-start gap-1">
        <span className={row.description ? '' : 'text-danger'} data-testid="log-description">
          {row.description || 'No description yet'}
        </span>
        {canEdit ? (
          <button
            type="button"
            className="text-accent-strong underline"
            onClick={() => {
              setValue(row.description);
              setEditing(true);
            }}
            data-testid="edit-description"
          >
            Edit
          </button>
        ) : null}
      </span>
    );
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        patch.mutate(
          { docId: row.documentId, description: value.trim() },
          { onSuccess: () => setEditing(false) },
        );
      }}
      className="min-w-56 space-y-1"
    >
      <textarea
        className="w-full rounded border border-line-strong p-1"
        rows={3}
        value={value}
        onChange={(e) => setValue(e.target.value)}
        maxLength={2000}
        autoFocus
        aria-label={`Description of ${row.controlNumber}`}
        data-testid="description-input"
        onKeyDown={(e) => {
          if (e.key === 'Escape') setEditing(false);
        }}
      />
      <span className="flex gap-2">
        <button
          type="submit"
          className="font-semibold text-accent-strong"
          data-testid="save-description"
        >
          Save
        </button>
        <button type="button" onClick={() => setEditing(false)}>
          Cancel
        </button>
      </span>
      {patch.isError ? <Notice tone="danger">{describeError(patch.error)}</Notice> : null}
    </form>
  );
}
