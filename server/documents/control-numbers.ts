/** Control numbers: the matter's prefix and a zero-padded load-order sequence, e.g. BRK-000001. */
export const CONTROL_DIGITS = 6;

export function formatControlNumber(prefix: string, seq: number): string {
  return `${prefix}-${String(seq).padStart(CONTROL_DIGITS, '0')}`;
}

/** The sequence number of a control number made by formatControlNumber (null when not one). */
export function controlSequenceOf(controlNumber: string): number | null {
  const match = /-(\d+)$/.exec(controlNumber);
  return match ? Number(match[1]) : null;
}
