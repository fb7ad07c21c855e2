import { describe, expect, it } from 'vitest';
import { calibrationDueStatus, coverageOn, daysBetween, newestFirst, standingOf } from './calibration';

const a = { id: 1, calibratedOn: '2025-01-01', dueOn: '2025-12-31' };
const b = { id: 2, calibratedOn: '2026-03-01', dueOn: '2026-06-30' };
// The same day recorded twice: the later entry is the newer.
const b2 = { id: 3, calibratedOn: '2026-03-01', dueOn: '2027-02-28' };

describe('calibration records by date', () => {
  // Common practice: a calibration covers its interval, both the calibration day and the due date included.
  it('covers a day when some record does, the older one included', () => {
    expect(coverageOn([b, a], '2025-06-15')).toEqual({ covering: a });
    expect(coverageOn([a, b], '2025-12-31')).toEqual({ covering: a });
    expect(coverageOn([a, b], '2026-03-01')).toEqual({ covering: b });
  });

  it('names the record that lapsed for a gap or a day after the last, the first one before any', () => {
    expect(coverageOn([a, b], '2026-01-15')).toEqual({ covering: null, nearest: a });
    expect(coverageOn([a, b], '2026-07-01')).toEqual({ covering: null, nearest: b });
    expect(coverageOn([a, b], '2024-12-31')).toEqual({ covering: null, nearest: a });
    expect(coverageOn([], '2026-01-01')).toEqual({ covering: null, nearest: null });
  });

  it('orders newest first by calibration date, then by entry', () => {
    expect(newestFirst([a, b2, b]).map((r) => r.id)).toEqual([3, 2, 1]);
    expect(standingOf(b2, b2, '2026-12-02')).toBe('in-force');
    expect(standingOf(b, b2, '2026-12-02')).toBe('superseded');
    expect(standingOf(b, b, '2026-12-02')).toBe('lapsed');
  });

  // Calendar arithmetic checked by hand (common practice: 2028 is a leap year, 366 days).
  it('counts whole days across months, leap days and the year end', () => {
    expect(daysBetween('2028-01-01', '2029-01-01')).toBe(366);
    expect(daysBetween('2026-12-31', '2027-01-01')).toBe(1);
    expect(daysBetween('2026-03-01', '2026-02-28')).toBe(-1);
  });

  it('says the due status in words with the ISO date', () => {
    expect(calibrationDueStatus('2026-12-02', '2026-12-02')).toEqual({ state: 'due-soon', words: 'Due today (2026-12-02)' });
    expect(calibrationDueStatus('2026-12-03', '2026-12-02')).toEqual({ state: 'due-soon', words: 'Due in 1 day (2026-12-03)' });
    expect(calibrationDueStatus('2027-01-01', '2026-12-02')).toEqual({ state: 'due-soon', words: 'Due in 30 days (2027-01-01)' });
    expect(calibrationDueStatus('2027-01-02', '2026-12-02')).toEqual({ state: 'current', words: 'Due in 31 days (2027-01-02)' });
    expect(calibrationDueStatus('2025-09-01', '2026-12-02')).toEqual({ state: 'lapsed', words: 'Lapsed 457 days ago (due 2025-09-01)' });
  });
});
