import { type FormEvent, useId, useState } from 'react';
import { Link } from 'react-router-dom';
import { type ConceptDimension, DIMENSION_LABEL_MAX_LENGTH } from '@shared/schemas/concepts';
import { Badge, Button, Notice, describeError, inputClass } from '@/components/ui';
import { fieldErrorOf } from '@/lib/api-client';
import { Can } from '@/lib/authorization';
import { formatDate } from '@/lib/format';
import { useClearDimensionLabel } from '../api/clear-dimension-label';
import { useSetDimensionLabel } from '../api/set-dimension-label';
import { formatFigure, formatShare } from '../format';
import { ValueBar } from './loading-bar';

/**
 * One concept dimension: the terms loading most strongly at its positive and its
 * negative end (a column of U_k), the documents most typical of it (a column of V_k),
 * and the label the lead gave it.
 */
export function DimensionCard({
  matterId,
  dimension,
}: {
  matterId: number;
  dimension: ConceptDimension;
}) {
  const headingId = useId();
  const termMax = Math.max(
    ...dimension.positiveTerms.map((t) => Math.abs(t.loading)),
    ...dimension.negativeTerms.map((t) => Math.abs(t.loading)),
    0,
  );
  const docMax = Math.max(...dimension.documents.map((d) => Math.abs(d.loading)), 0);
  return (
    <article
      aria-labelledby={headingId}
      className="rounded-md border border-line bg-panel"
      data-testid={`dimension-${dimension.dim}`}
    >
      <header className="flex flex-wrap items-baseline gap-x-3 gap-y-1 border-b border-line px-4 py-2.5">
        <h3 id={headingId} className="text-[15px] font-semibold">
          Dimension {dimension.dim}
          {dimension.label ? (
            <span className="font-normal text-ink" data-testid="dimension-label">
              {' '}
              · {dimension.label.label}
            </span>
          ) : null}
        </h3>
        <span className="text-[13px] text-ink-muted tabular-nums">
          σ = {formatFigure(dimension.sigma)}
          {dimension.energyShare != null
            ? ` · ${formatShare(dimension.energyShare)} of the energy`
            : ''}
        </span>
        {dimension.label ? (
          <span className="ml-auto text-xs text-ink-muted">
            Named by {dimension.label.labelledBy?.name ?? 'a former member'} on{' '}
            {formatDate(dimension.label.labelledAt)}
          </span>
        ) : null}
      </header>
      <div className="grid gap-4 px-4 py-3 lg:grid-cols-3">
        <TermColumn title="Positive end" sign="+" terms={dimension.positiveTerms} max={termMax} />
        <TermColumn title="Negative end" sign="−" terms={dimension.negativeTerms} max={termMax} />
        <section aria-label={`Typical documents of dimension ${dimension.dim}`}>
          <h4 className="mb-1.5 text-xs font-semibold tracking-wide text-ink-muted uppercase">
            Typical documents
          </h4>
          {dimension.documents.length === 0 ? (
            <p className="text-[13px] text-ink-muted">No document loads on this dimension.</p>
          ) : (
            <ol className="space-y-1">
              {dimension.documents.map((doc) => (
                <li key={doc.documentId} className="flex items-baseline gap-2 text-[13px]">
                  <span
                    className="w-5 shrink-0 text-center font-mono text-xs"
                    title={doc.loading >= 0 ? 'Positive end' : 'Negative end'}
                  >
                    {doc.loading >= 0 ? '+' : '−'}
                  </span>
                  <Link
                    to={`/matters/${matterId}/documents/${doc.documentId}`}
                    className="min-w-0 flex-1 truncate text-accent-strong underline-offset-2 hover:underline"
                    title={doc.title}
                    data-testid="dimension-document"
                  >
                    <span className="font-mono text-xs">{doc.controlNumber}</span> {doc.title}
                  </Link>
                  {doc.foldedIn ? <Badge>folded in</Badge> : null}
                  <span
                    className="shrink-0 font-mono text-xs text-ink-muted tabular-nums"
                    title={`Loading ${doc.loading.toFixed(4)} (largest on this list ${docMax.toFixed(4)})`}
                  >
                    {doc.loading.toFixed(3)}
                  </span>
                </li>
              ))}
            </ol>
          )}
        </section>
      </div>
      <Can permission="concepts.label">
        <LabelForm matterId={matterId} dimension={dimension} />
      </Can>
    </article>
  );
}

function TermColumn({
  title,
  sign,
  terms,
  max,
}: {
  title: string;
  sign: string;
  terms: ConceptDimension['positiveTerms'];
  max: number;
}) {
  return (
    <section aria-label={title}>
      <h4 className="mb-1.5 text-xs font-semibold tracking-wide text-ink-muted uppercase">
        <span aria-hidden="true" className="mr-1 font-mono">
          {sign}
        </span>
        {title}
      </h4>
      {terms.length === 0 ? (
        <p className="text-[13px] text-ink-muted">No term loads at this end.</p>
      ) : (
        <ul className="space-y-0.5">
          {terms.map((term) => (
            <li key={term.term} title={term.label === term.term ? undefined : `stem: ${term.term}`}>
              <ValueBar
                label={term.label}
                value={term.loading}
                max={max}
                tone={sign === '+' ? 'accent' : 'muted'}
              />
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

function LabelForm({ matterId, dimension }: { matterId: number; dimension: ConceptDimension }) {
  const inputId = useId();
  const save = useSetDimensionLabel(matterId);
  const clear = useClearDimensionLabel(matterId);
  const [value, setValue] = useState(dimension.label?.label ?? '');
  const trimmed = value.trim();
  const unchanged = trimmed === (dimension.label?.label ?? '');

  function submit(event: FormEvent) {
    event.preventDefault();
    if (!trimmed || unchanged) return;
    save.mutate({ dim: dimension.dim, label: trimmed });
  }

  const error = save.error ?? clear.error;
  const fieldError = fieldErrorOf(save.error, 'label');
  return (
    <form
      onSubmit={submit}
      className="flex flex-wrap items-center gap-2 border-t border-line bg-paper/60 px-4 py-2"
    >
      <label htmlFor={inputId} className="text-[13px] font-medium">
        Name this dimension
      </label>
      <input
        id={inputId}
        value={value}
        maxLength={DIMENSION_LABEL_MAX_LENGTH}
        onChange={(event) => setValue(event.target.value)}
        placeholder="e.g. Shipping and logistics"
        aria-invalid={fieldError ? true : undefined}
        className={`${inputClass} h-8 max-w-xs flex-1`}
        data-testid="dimension-label-input"
      />
      <Button
        type="submit"
        size="sm"
        variant="primary"
        busy={save.isPending}
        disabled={!trimmed || unchanged}
        data-testid="dimension-label-save"
      >
        Save name
      </Button>
      {dimension.label ? (
        <Button
          size="sm"
          variant="quiet"
          busy={clear.isPending}
          onClick={() => clear.mutate(dimension.dim, { onSuccess: () => setValue('') })}
        >
          Remove name
        </Button>
      ) : null}
      <span className="text-xs text-ink-muted">
        Kept with this index version; a new build starts unnamed.
      </span>
      {error ? (
        <Notice tone="danger" className="basis-full">
          {fieldError ?? describeError(error)}
        </Notice>
      ) : null}
    </form>
  );
}
