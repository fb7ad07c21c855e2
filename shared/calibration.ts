// Calibration records read by dates: which record covers a reading day, how each record stands
// today, and a due date in words. Pure; the server's gate and the pages read the same rules.
import { plural } from './format';

/** Today's date in UTC (YYYY-MM-DD): a calibration covers readings up to and including its due date. */
export const todayUtc = () => new Date().toISOString().slice(0, 10);

const DAY_MS = 86_400_000;
/** Whole days from `from` to `to` (ISO dates), negative when `to` is earlier. */
export const daysBetween = (from: string, to: string) => Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / DAY_MS);

export type CalibrationDates = { id: number; calibratedOn: string; dueOn: string };

/** Newest first: the later calibration date, then the later entry. The instrument's dates are the first one's. */
export const newestFirst = <T extends CalibrationDates>(records: readonly T[]) =>
  [...records].sort((a, b) => (a.calibratedOn === b.calibratedOn ? b.id - a.id : a.calibratedOn < b.calibratedOn ? 1 : -1));

/**
 * Whether a reading taken on `day` is covered: some record has calibratedOn ≤ day ≤ dueOn. When none
 * does, `nearest` is the record to name in the refusal: the newest that began on or before the day
 * (it lapsed), else the oldest (the day came before the first calibration).
 */
export function coverageOn<T extends CalibrationDates>(records: readonly T[], day: string): { covering: T } | { covering: null; nearest: T | null } {
  const ordered = newestFirst(records);
  const covering = ordered.find((r) => r.calibratedOn <= day && day <= r.dueOn);
  if (covering) return { covering };
  return { covering: null, nearest: ordered.find((r) => r.calibratedOn <= day) ?? ordered.at(-1) ?? null };
}

/** in force: the newest record, covering today; lapsed: the newest, past its due date; superseded: an older record. */
export type CalibrationStanding = 'in-force' | 'lapsed' | 'superseded';

export function standingOf(record: CalibrationDates, newest: CalibrationDates | undefined, today: string = todayUtc()): CalibrationStanding {
  if (record.id !== newest?.id) return 'superseded';
  return record.dueOn < today ? 'lapsed' : 'in-force';
}

export type CalibrationDueState = 'lapsed' | 'due-soon' | 'current';
/** Within this many days of its due date a calibration is shown as due soon. */
export const DUE_SOON_DAYS = 30;

/** The standing of a calibration due on `dueOn`, in words with its ISO date. */
export function calibrationDueStatus(dueOn: string, today: string = todayUtc()): { state: CalibrationDueState; words: string } {
  const days = daysBetween(today, dueOn);
  if (days < 0) return { state: 'lapsed', words: `Lapsed ${plural(-days, 'day')} ago (due ${dueOn})` };
  if (days === 0) return { state: 'due-soon', words: `Due today (${dueOn})` };
  return { state: days <= DUE_SOON_DAYS ? 'due-soon' : 'current', words: `Due in ${plural(days, 'day')} (${dueOn})` };
}
