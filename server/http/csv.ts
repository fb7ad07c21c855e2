// CSV downloads. Cells that a spreadsheet would run as a formula (= + - @, tab, carriage return)
// are prefixed with a quote, the usual guard against CSV injection.
import type { Response } from 'express';
import { stringify } from 'csv-stringify';
import { formatInstant } from '../../shared/format';

export type CsvColumn<T> = { header: string; value: (row: T) => unknown };

export function escapeCsvCell(value: unknown): string {
  if (value === null || value === undefined) return '';
  const text = value instanceof Date ? formatInstant(value) : typeof value === 'object' ? JSON.stringify(value) : String(value);
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}

/** Streams rows as a CSV attachment; `rows` may be an async iterable for large extracts. */
export async function sendCsv<T>(res: Response, filename: string, columns: CsvColumn<T>[], rows: Iterable<T> | AsyncIterable<T>) {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${filename}"`);
  const csv = stringify({ header: true, columns: columns.map((c) => c.header), bom: true });
  csv.pipe(res);
  for await (const row of rows) {
    if (!csv.write(columns.map((c) => escapeCsvCell(c.value(row))))) await new Promise((done) => csv.once('drain', done));
  }
  csv.end();
  await new Promise((done) => res.on('finish', done));
}
