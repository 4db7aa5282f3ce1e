import { stringify } from 'csv-stringify/sync';
import type { Response } from 'express';

/**
 * A cell a spreadsheet would read as a formula (=, +, -, @, tab, carriage return first)
 * gets a leading apostrophe: OWASP "CSV Injection" guidance.
 */
export function neutraliseFormula(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

/**
 * RFC 4180 CSV: CRLF record ends, fields holding a comma, quote or line break quoted,
 * quotes doubled; UTF-8 with a byte-order mark so spreadsheet programs read it as UTF-8.
 */
export function toCsv(header: readonly string[], rows: (string | number)[][]): string {
  return stringify(
    [
      header as string[],
      ...rows.map((r) => r.map((v) => (typeof v === 'string' ? neutraliseFormula(v) : v))),
    ],
    {
      bom: true,
      record_delimiter: 'windows',
      quoted_string: false,
    },
  );
}

export function sendCsv(res: Response, filename: string, body: string): void {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${filename}"`);
  res.status(200).send(body);
}
