import {
  Bar,
  CartesianGrid,
  ComposedChart,
  Line,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from 'recharts';
import type { ReactNode } from 'react';
import type { SpectrumVersion } from '@shared/schemas/concepts';
import { formatFigure } from '../format';

// Colours from the theme (src/styles.css); every series also differs by its mark
// (bars, solid line with dots, dashed and dotted lines) so the chart reads in grey.
const ACCENT = '#2c5d63';
const ENERGY = '#8a5a00';
const PREVIOUS = '#646a71';
const FOCUS = '#a4282c';

interface SpectrumPoint {
  i: number;
  sigma?: number;
  energy?: number;
  previousSigma?: number;
  previousEnergy?: number;
}

function pointsOf(current: SpectrumVersion, previous: SpectrumVersion | null): SpectrumPoint[] {
  const length = Math.max(current.singularValues.length, previous?.singularValues.length ?? 0);
  return Array.from({ length }, (_, index) => {
    const point: SpectrumPoint = { i: index + 1 };
    if (index < current.singularValues.length) {
      point.sigma = current.singularValues[index];
      const energy = current.cumulativeEnergy?.[index];
      if (energy != null) point.energy = energy * 100;
    }
    if (previous && index < previous.singularValues.length) {
      point.previousSigma = previous.singularValues[index];
      const energy = previous.cumulativeEnergy?.[index];
      if (energy != null) point.previousEnergy = energy * 100;
    }
    return point;
  });
}

const SERIES_NAMES: Record<string, string> = {
  sigma: 'σᵢ, this version',
  energy: 'Energy kept up to i, this version (%)',
  previousSigma: 'σᵢ, previous version',
  previousEnergy: 'Energy kept up to i, previous version (%)',
};

/**
 * The singular values sigma_1 >= ... >= sigma_k of the serving version as bars, the
 * cumulative share of ||A||_F^2 they keep on a second axis (Eckart-Young: the best rank-i
 * approximation keeps exactly that share), the chosen k marked, and the previous
 * version's spectrum as dashed lines for comparison.
 */
export function SpectrumChart({
  current,
  previous,
  proposedK,
}: {
  current: SpectrumVersion;
  previous: SpectrumVersion | null;
  /** The k typed into the rebuild form, drawn as a second marker. */
  proposedK?: number | null;
}) {
  const data = pointsOf(current, previous);
  const showPrevious = previous != null && previous.singularValues.length > 0;
  const maxI = data.length;
  return (
    <figure className="m-0" data-testid="spectrum-chart" data-k={current.k}>
      <div
        className="h-80 w-full"
        role="img"
        aria-label={`Bar chart of the ${current.k} singular values of version ${current.version}, largest ${formatFigure(current.singularValues[0])}, with the cumulative energy kept reaching ${current.energyKept == null ? 'an unknown share' : `${(current.energyKept * 100).toFixed(1)}%`} at k = ${current.k}.`}
      >
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={data} margin={{ top: 22, right: 12, bottom: 18, left: 4 }}>
            <CartesianGrid stroke="#dcd7cc" strokeDasharray="2 4" vertical={false} />
            <XAxis
              dataKey="i"
              type="number"
              domain={[0.5, maxI + 0.5]}
              allowDecimals={false}
              tick={{ fontSize: 12, fill: '#545b63' }}
              label={{
                value: 'Concept dimension i',
                position: 'insideBottom',
                offset: -10,
                fontSize: 12,
                fill: '#545b63',
              }}
            />
            <YAxis
              yAxisId="sigma"
              tick={{ fontSize: 12, fill: '#545b63' }}
              tickFormatter={(value: number) => formatFigure(value)}
              width={56}
              label={{
                value: 'σᵢ',
                angle: 0,
                position: 'insideTopLeft',
                offset: -14,
                fontSize: 13,
                fill: '#1f2328',
              }}
            />
            <YAxis
              yAxisId="energy"
              orientation="right"
              domain={[0, 100]}
              ticks={[0, 25, 50, 75, 100]}
              tickFormatter={(value: number) => `${value}%`}
              tick={{ fontSize: 12, fill: '#545b63' }}
              width={44}
            />
            <Tooltip
              formatter={(value, name) => {
                const key = String(name);
                const label = SERIES_NAMES[key] ?? key;
                const number = typeof value === 'number' ? value : Number(value);
                return [
                  key.toLowerCase().includes('energy')
                    ? `${number.toFixed(1)}%`
                    : formatFigure(number),
                  label,
                ];
              }}
              labelFormatter={(label) => `Dimension ${String(label)}`}
              contentStyle={{ fontSize: 12, borderColor: '#dcd7cc' }}
            />
            <Bar
              yAxisId="sigma"
              dataKey="sigma"
              fill={ACCENT}
              fillOpacity={0.85}
              maxBarSize={18}
              isAnimationActive={false}
            />
            <Line
              yAxisId="energy"
              dataKey="energy"
              stroke={ENERGY}
              strokeWidth={2}
              dot={data.length <= 60 ? { r: 2.5, fill: ENERGY } : false}
              isAnimationActive={false}
              connectNulls
            />
            {showPrevious ? (
              <Line
                yAxisId="sigma"
                dataKey="previousSigma"
                stroke={PREVIOUS}
                strokeWidth={1.5}
                strokeDasharray="6 4"
                dot={false}
                isAnimationActive={false}
                connectNulls
              />
            ) : null}
            {showPrevious ? (
              <Line
                yAxisId="energy"
                dataKey="previousEnergy"
                stroke={PREVIOUS}
                strokeWidth={1.5}
                strokeDasharray="1 3"
                dot={false}
                isAnimationActive={false}
                connectNulls
              />
            ) : null}
            <ReferenceLine
              yAxisId="sigma"
              x={current.k}
              stroke={ACCENT}
              strokeWidth={1.5}
              label={{ value: `k = ${current.k}`, position: 'top', fontSize: 12, fill: ACCENT }}
            />
            {showPrevious && previous.k !== current.k ? (
              <ReferenceLine
                yAxisId="sigma"
                x={previous.k}
                stroke={PREVIOUS}
                strokeDasharray="6 4"
                label={{
                  value: `previous k = ${previous.k}`,
                  position: 'insideTopRight',
                  fontSize: 11,
                  fill: PREVIOUS,
                }}
              />
            ) : null}
            {proposedK != null && proposedK !== current.k && proposedK <= maxI ? (
              <ReferenceLine
                yAxisId="sigma"
                x={proposedK}
                stroke={FOCUS}
                strokeDasharray="3 3"
                label={{
                  value: `try k = ${proposedK}`,
                  position: 'insideTopLeft',
                  fontSize: 11,
                  fill: FOCUS,
                }}
              />
            ) : null}
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <SpectrumLegend showPrevious={showPrevious} />
      <figcaption className="mt-2 text-[13px] text-ink-muted">
        Bars: the singular values σ₁ ≥ σ₂ ≥ … ≥ σ<sub>k</sub> of version {current.version} (left
        axis). Solid line: the share of the matrix&apos;s energy (squared Frobenius norm) the first
        i dimensions keep, which is what the best rank-i approximation keeps (Eckart and Young 1936;
        right axis). The vertical line marks the chosen k.
        {showPrevious
          ? ` Dashed and dotted lines: the same for the previous version ${previous.version}.`
          : ''}
      </figcaption>
    </figure>
  );
}

/** The key to the series, drawn with the same marks as the chart (not colour alone). */
function SpectrumLegend({ showPrevious }: { showPrevious: boolean }) {
  const items: { key: string; mark: ReactNode }[] = [
    {
      key: 'sigma',
      mark: <rect x="3" y="1" width="10" height="10" fill={ACCENT} fillOpacity={0.85} />,
    },
    {
      key: 'energy',
      mark: (
        <>
          <line x1="0" y1="6" x2="16" y2="6" stroke={ENERGY} strokeWidth="2" />
          <circle cx="8" cy="6" r="2.5" fill={ENERGY} />
        </>
      ),
    },
  ];
  if (showPrevious) {
    items.push(
      {
        key: 'previousSigma',
        mark: (
          <line
            x1="0"
            y1="6"
            x2="16"
            y2="6"
            stroke={PREVIOUS}
            strokeWidth="1.5"
            strokeDasharray="6 4"
          />
        ),
      },
      {
        key: 'previousEnergy',
        mark: (
          <line
            x1="0"
            y1="6"
            x2="16"
            y2="6"
            stroke={PREVIOUS}
            strokeWidth="1.5"
            strokeDasharray="1 3"
          />
        ),
      },
    );
  }
  return (
    <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink" aria-label="Key">
      {items.map((item) => (
        <li key={item.key} className="flex items-center gap-1.5">
          <svg width="16" height="12" aria-hidden="true">
            {item.mark}
          </svg>
          {SERIES_NAMES[item.key]}
        </li>
      ))}
    </ul>
  );
}
