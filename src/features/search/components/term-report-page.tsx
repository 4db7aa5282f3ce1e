// The search term report screen: paste terms (one per line), see hits per term, sort,
// open a term as a search, download the CSV.
import { useId, useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import {
  TERM_REPORT_MAX_TERMS,
  type TermReportResponse,
  type TermReportRow,
} from '@shared/schemas/search-term-report';
import { ReviewCaution } from '@/components/review-caution';
import { Button, ErrorPanel, Notice, PageHeader, describeError } from '@/components/ui';
import { Can } from '@/lib/authorization';
import { downloadTermReport } from '../api/download-term-report';
import { useTermReport } from '../api/run-term-report';
import { parseSearchState, searchStateToParams } from '../search-state';

type SortKey = 'order' | 'term' | 'documents' | 'uniqueDocuments' | 'withFamilies';
const COLUMNS: { key: SortKey; label: string; numeric: boolean }[] = [
  { key: 'term', label: 'Term', numeric: false },
  { key: 'documents', label: 'Documents', numeric: true },
  { key: 'uniqueDocuments', label: 'Unique', numeric: true },
  { key: 'withFamilies', label: 'With families', numeric: true },
];

const termsOf = (text: string) =>
  text
    .split(/\r?\n/)
    .map((line) => line.trim())
    .filter((line) => line !== '');

export function TermReportPage({ matterId }: { matterId: number }) {
  const boxId = useId();
  const [text, setText] = useState('');
  const [inputError, setInputError] = useState<string | null>(null);
  const [downloadError, setDownloadError] = useState<string | null>(null);
  const [sort, setSort] = useState<{ key: SortKey; desc: boolean }>({ key: 'order', desc: false });
  const report = useTermReport(matterId);
  const [ran, setRan] = useState<string[]>([]);

  function run() {
    const terms = termsOf(text);
    if (terms.length === 0) return setInputError('Paste or type at least one term, one per line.');
    if (terms.length > TERM_REPORT_MAX_TERMS)
      return setInputError(
        `${terms.length} terms: a report takes at most ${TERM_REPORT_MAX_TERMS}.`,
      );
    setInputError(null);
    setRan(terms);
    report.mutate({ terms });
  }

  async function download() {
    setDownloadError(null);
    try {
      await downloadTermReport(matterId, { terms: ran });
    } catch (error) {
      setDownloadError(describeError(error));
    }
  }

  return (
    <div data-testid="term-report-page">
      <PageHeader
        title="Search term report"
        description="Hits per search term: documents, those no other term finds, with their families, and per custodian."
        actions={
          <Link
            to=".."
            relative="path"
            className="inline-flex h-9 items-center rounded-md border border-line-strong bg-panel px-3.5 text-sm font-medium text-ink hover:bg-sunk"
          >
            Back to search
          </Link>
        }
      />
      <ReviewCaution className="mb-4" compact />
      <section className="space-y-2 rounded-md border border-line bg-panel p-3">
        <label htmlFor={boxId} className="block text-[13px] font-medium text-ink">
          Terms, one per line (each in the search query syntax, e.g. "price increase"~5)
        </label>
        <textarea
          id={boxId}
          value={text}
          onChange={(event) => setText(event.target.value)}
          rows={6}
          aria-invalid={inputError ? true : undefined}
          className="block w-full resize-y rounded-md border border-line-strong bg-panel px-3 py-2 font-mono text-[13px] leading-snug text-ink"
          data-testid="term-report-terms"
        />
        {inputError ? (
          <p className="text-xs font-medium text-danger" role="alert">
            {inputError}
          </p>
        ) : null}
        <div className="flex flex-wrap gap-2">
          <Button
            variant="primary"
            busy={report.isPending}
            onClick={run}
            data-testid="term-report-run"
          >
            Run report
          </Button>
          {report.data ? (
            <Can permission="exports.create">
              <Button onClick={() => void download()} data-testid="term-report-download">
                Download CSV
              </Button>
            </Can>
          ) : null}
        </div>
        {downloadError ? <Notice tone="warn">{downloadError}</Notice> : null}
      </section>
      <div className="mt-3">
        {report.isError ? (
          <ErrorPanel error={report.error} title="The report did not run" onRetry={run} />
        ) : report.data ? (
          <ReportTable
            matterId={matterId}
            data={report.data}
            terms={ran}
            sort={sort}
            onSort={(key) =>
              setSort((s) => ({ key, desc: s.key === key ? !s.desc : key !== 'term' }))
            }
          />
        ) : null}
      </div>
    </div>
  );
}

function ReportTable({
  matterId,
  data,
  terms,
  sort,
  onSort,
}: {
  matterId: number;
  data: TermReportResponse;
  terms: string[];
  sort: { key: SortKey; desc: boolean };
  onSort: (key: SortKey) => void;
}) {
  const rows = useMemo(() => {
    const indexed = data.rows.map((row, order) => ({ row, order }));
    if (sort.key === 'order') return indexed;
    const key = sort.key;
    return [...indexed].sort((a, b) => {
      const d = key === 'term' ? a.row.term.localeCompare(b.row.term) : a.row[key] - b.row[key];
      return (sort.desc ? -d : d) || a.order - b.order;
    });
  }, [data, sort]);
  const searchHref = (row: TermReportRow) => {
    const params = searchStateToParams({
      ...parseSearchState(new URLSearchParams()),
      query: row.term,
      mode: 'keyword',
    });
    return `/matters/${matterId}/search?${params.toString()}`;
  };
  return (
    <div className="overflow-x-auto rounded-md border border-line bg-panel">
      <table className="w-full text-sm" data-testid="term-report-table">
        <thead>
          <tr>
            {COLUMNS.map((c) => (
              <th
                key={c.key}
                scope="col"
                aria-sort={
                  sort.key === c.key ? (sort.desc ? 'descending' : 'ascending') : undefined
                }
                className={`border-b border-line px-3 py-1.5 text-xs font-semibold text-ink-muted uppercase ${c.numeric ? 'text-right' : 'text-left'}`}
              >
                <button type="button" onClick={() => onSort(c.key)} className="uppercase">
                  {c.label}
                  {sort.key === c.key ? (sort.desc ? ' ↓' : ' ↑') : ''}
                </button>
              </th>
            ))}
            <th
              scope="col"
              className="border-b border-line px-3 py-1.5 text-left text-xs font-semibold text-ink-muted uppercase"
            >
              By custodian
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map(({ row, order }) => (
            <tr
              key={order}
              className="border-b border-line last:border-0"
              data-testid="term-report-row"
            >
              <td className="px-3 py-1.5 font-mono text-[13px]">
                {row.error ? (
                  <>
                    <span>{terms[order] ?? row.term}</span>
                    <p className="font-sans text-xs text-danger" data-testid="term-report-error">
                      {row.error}
                    </p>
                  </>
                ) : (
                  <Link to={searchHref(row)} className="text-accent hover:underline">
                    {row.term}
                  </Link>
                )}
              </td>
              <td className="px-3 py-1.5 text-right tabular-nums">
                {row.documents.toLocaleString()}
              </td>
              <td className="px-3 py-1.5 text-right tabular-nums">
                {row.uniqueDocuments.toLocaleString()}
              </td>
              <td className="px-3 py-1.5 text-right tabular-nums">
                {row.withFamilies.toLocaleString()}
              </td>
              <td className="px-3 py-1.5 text-xs text-ink-muted">
                {row.byCustodian
                  .map((c) => `${c.custodian} ${c.documents.toLocaleString()}`)
                  .join(' · ')}
              </td>
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr className="border-t border-line-strong font-semibold" data-testid="term-report-total">
            <td className="px-3 py-1.5">Any term</td>
            <td className="px-3 py-1.5 text-right tabular-nums">
              {data.total.documents.toLocaleString()}
            </td>
            <td />
            <td className="px-3 py-1.5 text-right tabular-nums">
              {data.total.withFamilies.toLocaleString()}
            </td>
            <td />
          </tr>
        </tfoot>
      </table>
    </div>
  );
}
