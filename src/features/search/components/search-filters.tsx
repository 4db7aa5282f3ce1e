import type { ReactNode } from 'react';
import type { SearchFilters } from '@shared/schemas/search';
import { Button } from '@/components/ui';
import { inputClass } from '@/components/ui/text-field';
import { cn } from '@/lib/cn';
import type { Code } from '@/features/codes/api/get-codes';
import { DOC_TYPE_LABELS } from '@/features/documents';

interface Option {
  id: string;
  label: string;
}

const DOC_TYPES: Option[] = Object.entries(DOC_TYPE_LABELS)
  .filter(([type]) => type !== 'zip' && type !== 'unknown')
  .map(([id, label]) => ({ id, label }));

/** Filters applied to every mode: custodian, dates, type, codes, uncoded only, duplicates, concept group. */
export function SearchFiltersBar({
  filters,
  onChange,
  custodians,
  codes,
}: {
  filters: SearchFilters;
  onChange: (next: SearchFilters) => void;
  custodians: { id: number; name: string; documentCount?: number }[];
  codes: Code[];
}) {
  function set<K extends keyof SearchFilters>(key: K, value: SearchFilters[K] | undefined) {
    const next = { ...filters };
    if (value === undefined || (Array.isArray(value) && value.length === 0) || value === false)
      delete next[key];
    else next[key] = value;
    onChange(next);
  }
  const active = Object.keys(filters).length > 0;
  const dateError =
    filters.dateFrom && filters.dateTo && filters.dateFrom > filters.dateTo
      ? 'The start date is after the end date.'
      : null;

  return (
    <div
      role="group"
      aria-label="Filters"
      className="flex flex-wrap items-end gap-x-3 gap-y-2"
      data-testid="search-filters"
    >
      <MultiPick
        label="Custodian"
        testId="filter-custodians"
        options={custodians.map((c) => ({ id: String(c.id), label: c.name }))}
        selected={(filters.custodianIds ?? []).map(String)}
        onChange={(ids) => set('custodianIds', ids.map(Number))}
      />
      <label className="space-y-1 text-[13px] font-medium text-ink">
        <span className="block">From</span>
        <input
          type="date"
          className={cn(inputClass, 'h-8 w-[9.5rem]')}
          value={filters.dateFrom ?? ''}
          aria-invalid={dateError ? true : undefined}
          onChange={(event) => set('dateFrom', event.target.value || undefined)}
          data-testid="filter-date-from"
        />
      </label>
      <label className="space-y-1 text-[13px] font-medium text-ink">
        <span className="block">To</span>
        <input
          type="date"
          className={cn(inputClass, 'h-8 w-[9.5rem]')}
          value={filters.dateTo ?? ''}
          aria-invalid={dateError ? true : undefined}
          onChange={(event) => set('dateTo', event.target.value || undefined)}
          data-testid="filter-date-to"
        />
      </label>
      <MultiPick
        label="Type"
        testId="filter-types"
        options={DOC_TYPES}
        selected={filters.docTypes ?? []}
        onChange={(types) => set('docTypes', types)}
      />
      <MultiPick
        label="Codes"
        testId="filter-codes"
        options={codes.map((code) => ({
          id: String(code.id),
          label: code.archivedAt ? `${code.name} (archived)` : code.name,
        }))}
        selected={(filters.codeIds ?? []).map(String)}
        onChange={(ids) => set('codeIds', ids.map(Number))}
      />
      <div className="flex h-8 items-center gap-4 text-[13px]">
        <label className="flex items-center gap-1.5">
          <input
            type="checkbox"
            className="size-4 accent-accent"
            checked={filters.uncodedOnly === true}
            onChange={(event) => set('uncodedOnly', event.target.checked)}
            data-testid="filter-uncoded"
          />
          Uncoded only
        </label>
        <label
          className="flex items-center gap-1.5"
          title="Exact copies (same SHA-256) are hidden unless you ask for them"
        >
          <input
            type="checkbox"
            className="size-4 accent-accent"
            checked={filters.includeDuplicates === true}
            onChange={(event) => set('includeDuplicates', event.target.checked)}
            data-testid="filter-duplicates"
          />
          Show exact duplicates
        </label>
        {filters.groupId !== undefined ? (
          <span
            className="inline-flex items-center gap-1 rounded border border-line px-2 py-0.5"
            data-testid="filter-group"
          >
            Concept group #{filters.groupId}
            <button
              type="button"
              className="text-ink-muted hover:text-ink"
              aria-label="Remove the concept group filter"
              onClick={() => set('groupId', undefined)}
            >
              ×
            </button>
          </span>
        ) : null}
        {active ? (
          <Button
            size="sm"
            variant="quiet"
            onClick={() => onChange({})}
            data-testid="filters-clear"
          >
            Clear filters
          </Button>
        ) : null}
      </div>
      {dateError ? <p className="w-full text-xs font-medium text-danger">{dateError}</p> : null}
    </div>
  );
}

/** A compact multiple choice: a button showing the count, opening a list of checkboxes. */
function MultiPick({
  label,
  options,
  selected,
  onChange,
  testId,
}: {
  label: string;
  options: Option[];
  selected: string[];
  onChange: (ids: string[]) => void;
  testId: string;
}) {
  const summary: ReactNode =
    selected.length === 0
      ? 'Any'
      : selected.length === 1
        ? (options.find((o) => o.id === selected[0])?.label ?? '1 chosen')
        : `${selected.length} chosen`;
  return (
    <div className="space-y-1 text-[13px]">
      <span className="block font-medium text-ink">{label}</span>
      <details className="group relative" data-testid={testId}>
        <summary
          className={cn(
            inputClass,
            'flex h-8 w-[11rem] cursor-pointer list-none items-center justify-between gap-2 truncate',
            selected.length > 0 && 'border-accent font-medium text-accent-strong',
          )}
        >
          <span className="truncate">{summary}</span>
          <span aria-hidden="true" className="text-ink-faint group-open:rotate-180">
            ▾
          </span>
        </summary>
        <fieldset className="absolute z-20 mt-1 max-h-72 w-64 overflow-y-auto rounded-md border border-line-strong bg-panel p-2 shadow-lg">
          <legend className="sr-only">{label}</legend>
          {options.length === 0 ? (
            <p className="px-1 text-ink-muted">None in this matter.</p>
          ) : null}
          {options.map((option) => (
            <label
              key={option.id}
              className="flex items-center gap-2 rounded px-1 py-1 hover:bg-sunk"
            >
              <input
                type="checkbox"
                className="size-4 accent-accent"
                checked={selected.includes(option.id)}
                onChange={(event) =>
                  onChange(
                    event.target.checked
                      ? [...selected, option.id]
                      : selected.filter((id) => id !== option.id),
                  )
                }
              />
              <span className="truncate">{option.label}</span>
            </label>
          ))}
        </fieldset>
      </details>
    </div>
  );
}
