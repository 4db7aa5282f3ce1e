import { useEffect, useState } from 'react';
import { REDACTION_REASONS } from '@shared/schemas/productions';
import { Button, Notice, Select, TextField, describeError } from '@/components/ui';
import { useCreateRedaction } from '../api/create-redaction';
import { useDeleteRedaction } from '../api/delete-redaction';
import { useRedactions, type Redaction } from '../api/get-redactions';

const OTHER = '__other';

/** Where the selected passage sits in the body: the one occurrence, or the nearest to the DOM offset. */
export function locateSelection(body: string, selected: string, domOffset: number | null) {
  if (selected.length === 0) return null;
  const hits: number[] = [];
  for (let at = body.indexOf(selected); at >= 0; at = body.indexOf(selected, at + 1)) hits.push(at);
  if (hits.length === 0) return null;
  const start =
    hits.length === 1 || domOffset === null
      ? hits[0]
      : hits.reduce((best, h) => (Math.abs(h - domOffset) < Math.abs(best - domOffset) ? h : best));
  return { start, end: start + selected.length };
}

function useTextSelection(containerTestId: string) {
  const [selection, setSelection] = useState<{ text: string; offset: number | null }>({
    text: '',
    offset: null,
  });
  useEffect(() => {
    const read = () => {
      const sel = window.getSelection();
      const container = document.querySelector(`[data-testid="${containerTestId}"]`);
      if (!sel || sel.rangeCount === 0 || !container || !container.contains(sel.anchorNode)) return;
      const range = sel.getRangeAt(0);
      const before = document.createRange();
      before.selectNodeContents(container);
      before.setEnd(range.startContainer, range.startOffset);
      setSelection({ text: sel.toString(), offset: before.toString().length });
    };
    document.addEventListener('selectionchange', read);
    return () => document.removeEventListener('selectionchange', read);
  }, [containerTestId]);
  return selection;
}

function describe(r: Redaction) {
  if (r.kind === 'span') return `“${r.text ?? ''}”`;
  if (r.kind === 'pattern')
    return `${r.patternKind === 'format' ? 'Format' : 'Term'} ${r.pattern} (${r.hits ?? 0} hit${r.hits === 1 ? '' : 's'})`;
  return `Box on page ${r.page}`;
}

/**
 * The viewer's redaction tools: the selected passage, every hit of a term or format mask,
 * or a box on a PDF page. Redactions change nothing in the original; a production burns
 * them into its pages.
 */
export function RedactionPanel({
  matterId,
  documentId,
  body,
  isPdf,
  canRedact,
  textTestId = 'review-text',
}: {
  matterId: number;
  documentId: number;
  body: string;
  isPdf: boolean;
  canRedact: boolean;
  textTestId?: string;
}) {
  const list = useRedactions(matterId, documentId);
  const create = useCreateRedaction(matterId, documentId);
  const remove = useDeleteRedaction(matterId, documentId);
  const selection = useTextSelection(textTestId);
  const [reasonChoice, setReasonChoice] = useState<string>(REDACTION_REASONS[0]);
  const [ownReason, setOwnReason] = useState('');
  const [pattern, setPattern] = useState('');
  const [patternKind, setPatternKind] = useState<'term' | 'format'>('term');
  const [box, setBox] = useState({ page: '1', x: '10', y: '10', width: '30', height: '5' });
  const reason = reasonChoice === OTHER ? ownReason.trim() : reasonChoice;
  const located = locateSelection(body, selection.text, selection.offset);

  return (
    <section
      className="space-y-3 rounded-md border border-line bg-panel p-3"
      aria-labelledby="redactions-heading"
      data-testid="redaction-panel"
    >
      <h2 id="redactions-heading" className="text-sm font-semibold">
        Redactions
      </h2>
      {list.data && list.data.redactions.length > 0 ? (
        <ul className="space-y-1 text-[13px]" data-testid="redaction-list">
          {list.data.redactions.map((r) => (
            <li key={r.id} className="flex items-start justify-between gap-2">
              <span className="break-words">
                {describe(r)} <span className="text-ink-muted">· {r.reason}</span>
                {r.producedIn ? <span className="text-ink-muted"> · produced</span> : null}
              </span>
              {canRedact && !r.producedIn ? (
                <Button
                  size="sm"
                  variant="quiet"
                  onClick={() => remove.mutate(r.id)}
                  aria-label={`Remove redaction ${describe(r)}`}
                >
                  Remove
                </Button>
              ) : null}
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-[13px] text-ink-muted">No redactions on this document.</p>
      )}
      {canRedact ? (
        <div className="space-y-3 border-t border-line pt-3">
          <Select
            label="Reason"
            options={[
              ...REDACTION_REASONS.map((r) => ({ value: r, label: r })),
              { value: OTHER, label: 'Another reason…' },
            ]}
            value={reasonChoice}
            onChange={(e) => setReasonChoice(e.target.value)}
            data-testid="redaction-reason"
          />
          {reasonChoice === OTHER ? (
            <TextField
              label="Your reason"
              value={ownReason}
              onChange={(e) => setOwnReason(e.target.value)}
            />
          ) : null}
          <Button
            size="sm"
            disabled={!located || !reason}
            onClick={() => located && create.mutate({ kind: 'span', ...located, reason })}
            data-testid="redact-selection"
          >
            {located
              ? `Redact the ${selection.text.length} selected characters`
              : 'Select text to redact it'}
          </Button>
          <form
            className="space-y-2"
            onSubmit={(e) => {
              e.preventDefault();
              create.mutate({ kind: 'pattern', pattern, patternKind, reason });
            }}
          >
            <div className="flex items-end gap-2">
              <TextField
                label={patternKind === 'term' ? 'Every hit of a term' : 'Every hit of a format'}
                hint={
                  patternKind === 'format' ? '# is a digit, @ a letter: ####-####-####' : undefined
                }
                value={pattern}
                onChange={(e) => setPattern(e.target.value)}
                className="flex-1"
                data-testid="redaction-pattern"
              />
              <Select
                aria-label="Kind of pattern"
                options={[
                  { value: 'term', label: 'Term' },
                  { value: 'format', label: 'Format' },
                ]}
                value={patternKind}
                onChange={(e) => setPatternKind(e.target.value as 'term' | 'format')}
              />
            </div>
            <Button size="sm" type="submit" disabled={!pattern.trim() || !reason}>
              Redact every hit
            </Button>
          </form>
          {isPdf ? (
            <form
              className="space-y-2"
              onSubmit={(e) => {
                e.preventDefault();
                const pct = (v: string) => Number(v) / 100;
                create.mutate({
                  kind: 'box',
                  page: Number(box.page),
                  x: pct(box.x),
                  y: pct(box.y),
                  width: pct(box.width),
                  height: pct(box.height),
                  reason,
                });
              }}
            >
              <p className="text-[13px] font-medium">
                A box on a PDF page (percent of the page, from its top left)
              </p>
              <div className="grid grid-cols-5 gap-1">
                {(['page', 'x', 'y', 'width', 'height'] as const).map((k) => (
                  <TextField
                    key={k}
                    label={
                      k === 'x'
                        ? 'Left'
                        : k === 'y'
                          ? 'Top'
                          : k.charAt(0).toUpperCase() + k.slice(1)
                    }
                    inputMode="numeric"
                    value={box[k]}
                    onChange={(e) => setBox({ ...box, [k]: e.target.value })}
                  />
                ))}
              </div>
              <Button size="sm" type="submit" disabled={!reason}>
                Redact the box
              </Button>
            </form>
          ) : null}
          {create.error || remove.error ? (
            <Notice tone="danger" title="The redaction was not saved">
              {describeError(create.error ?? remove.error)}
            </Notice>
          ) : null}
        </div>
      ) : null}
    </section>
  );
}
