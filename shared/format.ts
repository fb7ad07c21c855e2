// How Phaselot writes dates, counts and measured values, alike on pages, PDFs, CSV files and mails.
// Times are written in UTC with the zone named, so a page, a printed certificate and a mail read on
// another site all show the same instant the same way.

/** What a missing value shows as. */
export const MISSING = '—';

type Instant = string | Date | null | undefined;

const DATE_ONLY = /^\d{4}-\d{2}-\d{2}$/;

function toDate(value: string | Date): Date {
  const date = value instanceof Date ? value : new Date(value);
  if (Number.isNaN(date.getTime())) throw new RangeError(`not a date: ${String(value)}`);
  return date;
}

/** A calendar date, ISO 8601 extended form: "2026-12-02". A date without a time is kept as it is. */
export function formatDate(value: Instant): string {
  if (value === null || value === undefined || value === '') return MISSING;
  if (typeof value === 'string' && DATE_ONLY.test(value)) return value;
  return toDate(value).toISOString().slice(0, 10);
}

/** A time of day on the 24-hour clock with its zone: "08:05 UTC". */
export function formatTime(value: Instant): string {
  if (value === null || value === undefined || value === '') return MISSING;
  return `${toDate(value).toISOString().slice(11, 16)} UTC`;
}

/** A date and a time of day: "2026-12-02 08:05 UTC". */
export function formatDateTime(value: Instant): string {
  if (value === null || value === undefined || value === '') return MISSING;
  const iso = toDate(value).toISOString();
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
}

/** An instant for files other programs read (CSV): ISO 8601 complete, to the millisecond, in UTC ("2026-12-02T08:05:00.000Z"). */
export function formatInstant(value: string | Date): string {
  return toDate(value).toISOString();
}

/** A whole number with its thousands set apart by a space, as SI writes them: "120 000". */
export function wholeNumber(count: number): string {
  return String(count).replace(/\B(?=(\d{3})+(?!\d))/g, ' ');
}

/** A count with its noun: "1 defective", "2 defectives", "0 pieces"; irregular plurals are given. */
export function plural(count: number, one: string, many = `${one}s`): string {
  return `${wholeNumber(count)} ${count === 1 ? one : many}`;
}

/** A decimal with a fixed number of digits; a value that rounds to zero is "0.0000", never "-0.0000". */
export function fixed(value: number | null | undefined, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return MISSING;
  const text = value.toFixed(digits);
  return Number(text) === 0 ? (0).toFixed(digits) : text;
}

/** A deviation from a nominal with its sign: "+0.0012", "-0.0012", and "0.0000" for none. */
export function signedFixed(value: number | null | undefined, digits: number): string {
  const text = fixed(value, digits);
  return text === MISSING || text.startsWith('-') || Number(text) === 0 ? text : `+${text}`;
}

/** Words out of a code, for a state or field that has no label of its own: "drift-alarm" → "Drift alarm", "supplierLot" → "Supplier lot". */
export function wordsOf(code: string): string {
  const words = code
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/[-_.]+/g, ' ')
    .trim()
    .toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}
