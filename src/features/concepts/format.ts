// Number formats for the concept-space screens: enough digits to compare two builds,
// never so many that the figure stops being readable.

const integer = new Intl.NumberFormat();

export function formatCount(value: number | null | undefined): string {
  return value == null ? '—' : integer.format(value);
}

/** 0.8734 -> "87.3%". */
export function formatShare(value: number | null | undefined, digits = 1): string {
  if (value == null || !Number.isFinite(value)) return '—';
  return `${(value * 100).toFixed(digits)}%`;
}

/** Four significant digits, switching to exponent notation for very large or small values. */
export function formatFigure(value: number | null | undefined): string {
  if (value == null || !Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e6 || magnitude < 1e-3) return value.toExponential(2);
  return Number(value.toPrecision(4)).toString();
}

export function formatDuration(ms: number | null | undefined): string {
  if (ms == null || !Number.isFinite(ms)) return '—';
  if (ms < 1_000) return `${Math.round(ms)} ms`;
  if (ms < 60_000) return `${(ms / 1_000).toFixed(1)} s`;
  const minutes = Math.floor(ms / 60_000);
  return `${minutes} min ${Math.round((ms % 60_000) / 1_000)} s`;
}

/** sigma_1 / sigma_k from a spectrum, or null when it cannot be formed. */
export function conditionNumberOf(singularValues: readonly number[]): number | null {
  if (singularValues.length === 0) return null;
  const last = singularValues[singularValues.length - 1];
  return last > 0 ? singularValues[0] / last : null;
}
