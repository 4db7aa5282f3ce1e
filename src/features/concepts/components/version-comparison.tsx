import type { ReactNode } from 'react';
import type { SpectrumVersion } from '@shared/schemas/concepts';
import { TBody, THead, Table, Td, Th, Tr } from '@/components/ui';
import { formatDateTime } from '@/lib/format';
import {
  conditionNumberOf,
  formatCount,
  formatDuration,
  formatFigure,
  formatShare,
} from '../format';

interface Row {
  label: string;
  /** What a lawyer reads it as. */
  hint: string;
  testId: string;
  value: (version: SpectrumVersion) => number | string | null;
  show: (value: number | string | null) => ReactNode;
  /** How to word a numeric change, or null for no change column. */
  change?: (before: number, after: number) => string;
}

const signed = (delta: number, text: string) => `${delta > 0 ? '+' : delta < 0 ? '−' : '±'}${text}`;

/**
 * The figures of the serving version beside the previous ready one, so that a lead who
 * rebuilt with another k or weighting sees what changed.
 */
export function VersionComparison({
  current,
  previous,
  buildMsOf,
}: {
  current: SpectrumVersion;
  previous: SpectrumVersion | null;
  /** Build time of a version (milliseconds), when known. */
  buildMsOf: (indexId: number) => number | null;
}) {
  const rows: Row[] = [
    {
      label: 'Concepts (k)',
      hint: 'Dimensions kept',
      testId: 'k',
      value: (v) => v.k,
      show: (v) => String(v ?? '—'),
      change: (a, b) => signed(b - a, String(Math.abs(b - a))),
    },
    {
      label: 'Weighting',
      hint: 'Term weights of the matrix',
      testId: 'weighting',
      value: (v) => v.weighting,
      show: (v) => String(v ?? '—'),
    },
    {
      label: 'Energy kept',
      hint: 'Share of the squared Frobenius norm kept',
      testId: 'energy',
      value: (v) => v.energyKept,
      show: (v) => formatShare(typeof v === 'number' ? v : null),
      change: (a, b) => signed(b - a, `${(Math.abs(b - a) * 100).toFixed(1)} points`),
    },
    {
      label: 'σ₁ = ‖A‖₂',
      hint: 'Largest singular value',
      testId: 'sigma1',
      value: (v) => v.singularValues[0] ?? null,
      show: (v) => formatFigure(typeof v === 'number' ? v : null),
    },
    {
      label: 'Condition number',
      hint: 'σ₁ / σₖ',
      testId: 'condition',
      value: (v) => conditionNumberOf(v.singularValues),
      show: (v) => formatFigure(typeof v === 'number' ? v : null),
    },
    {
      label: 'Documents · terms',
      hint: 'Size of the matrix',
      testId: 'size',
      value: (v) => `${formatCount(v.nDocs)} · ${formatCount(v.nTerms)}`,
      show: (v) => String(v ?? '—'),
    },
    {
      label: 'Build time',
      hint: 'Wall-clock time of the build',
      testId: 'build-time',
      value: (v) => buildMsOf(v.indexId),
      show: (v) => formatDuration(typeof v === 'number' ? v : null),
    },
    {
      label: 'Built',
      hint: '',
      testId: 'built-at',
      value: (v) => v.completedAt,
      show: (v) => formatDateTime(typeof v === 'string' ? v : null),
    },
  ];

  return (
    <Table
      caption="Figures of the serving version and the previous one"
      data-testid="version-comparison"
    >
      <THead>
        <tr>
          <Th>Figure</Th>
          {previous ? <Th className="text-right">Previous · v{previous.version}</Th> : null}
          <Th className="text-right">Serving · v{current.version}</Th>
          {previous ? <Th className="text-right">Change</Th> : null}
        </tr>
      </THead>
      <TBody>
        {rows.map((row) => {
          const after = row.value(current);
          const before = previous ? row.value(previous) : null;
          const change =
            previous && row.change && typeof before === 'number' && typeof after === 'number'
              ? row.change(before, after)
              : '';
          return (
            <Tr key={row.testId}>
              <Td>
                <span className="font-medium">{row.label}</span>
                {row.hint ? <span className="block text-xs text-ink-muted">{row.hint}</span> : null}
              </Td>
              {previous ? (
                <Td
                  className="text-right tabular-nums text-ink-muted"
                  data-testid={`previous-${row.testId}`}
                >
                  {row.show(before)}
                </Td>
              ) : null}
              <Td
                className="text-right font-medium tabular-nums"
                data-testid={`current-${row.testId}`}
              >
                {row.show(after)}
              </Td>
              {previous ? (
                <Td className="text-right text-[13px] tabular-nums text-ink-muted">{change}</Td>
              ) : null}
            </Tr>
          );
        })}
      </TBody>
    </Table>
  );
}
