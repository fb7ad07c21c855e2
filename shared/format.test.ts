import { describe, expect, it } from 'vitest';
import { fixed, formatDate, formatDateTime, formatInstant, formatTime, MISSING, plural, signedFixed, wholeNumber } from './format';

describe('dates and times', () => {
  it('writes calendar dates in the ISO 8601 extended form YYYY-MM-DD', () => {
    // ISO 8601-1:2019, calendar date in the extended format (YYYY-MM-DD); 1985-04-12 is the example date
    // the standard and RFC 3339 §5.8 use.
    expect(formatDate('1985-04-12T23:20:50Z')).toBe('1985-04-12');
    expect(formatDate(new Date(Date.UTC(1985, 3, 12, 23, 20, 50)))).toBe('1985-04-12');
    // A date without a time of day is a calendar day, not an instant: no zone may move it.
    expect(formatDate('1985-04-12')).toBe('1985-04-12');
  });

  it('writes times of day on the 24-hour clock, hh:mm, with the zone named', () => {
    // ISO 8601-1:2019, local time in the extended format hh:mm on the 24-hour clock (23:20, not 11:20 pm).
    expect(formatTime('1985-04-12T23:20:50Z')).toBe('23:20 UTC');
    expect(formatDateTime('1985-04-12T23:20:50.52Z')).toBe('1985-04-12 23:20 UTC');
    // Hours below 10 keep their leading zero (ISO 8601 two-digit hh).
    expect(formatDateTime('2026-12-02T08:05:00Z')).toBe('2026-12-02 08:05 UTC');
  });

  it('turns a time given with an offset into the same instant in UTC', () => {
    // RFC 3339 §5.8: 1996-12-19T16:39:57-08:00 "is equivalent to 1996-12-20T00:39:57Z in UTC".
    expect(formatDateTime('1996-12-19T16:39:57-08:00')).toBe('1996-12-20 00:39 UTC');
    expect(formatDate('1996-12-19T16:39:57-08:00')).toBe('1996-12-20');
  });

  it('writes instants for CSV files in the ISO 8601 complete form, in UTC', () => {
    // RFC 3339 §5.8 example, the ISO 8601 profile for Internet timestamps: 1985-04-12T23:20:50.52Z.
    expect(formatInstant('1985-04-12T23:20:50.52Z')).toBe('1985-04-12T23:20:50.520Z');
    expect(formatInstant('1996-12-19T16:39:57-08:00')).toBe('1996-12-20T00:39:57.000Z');
  });

  it('shows a missing date as a dash and refuses text that is no date', () => {
    expect(formatDateTime(null)).toBe(MISSING);
    expect(formatDate(undefined)).toBe(MISSING);
    expect(() => formatDateTime('next Tuesday')).toThrow(/not a date: next Tuesday/);
  });
});

describe('counts', () => {
  it('writes the singular for one and the plural otherwise, zero included', () => {
    // English grammar (common practice): "1 defective", "2 defectives", "0 defectives".
    expect(plural(1, 'defective')).toBe('1 defective');
    expect(plural(2, 'defective')).toBe('2 defectives');
    expect(plural(0, 'defective')).toBe('0 defectives');
    expect(plural(3, 'try', 'tries')).toBe('3 tries');
    expect(plural(1, 'try', 'tries')).toBe('1 try');
  });

  it('sets thousands apart with a space', () => {
    // SI Brochure (9th edition), on writing numbers: digits grouped in threes, separated by a (thin) space.
    expect(wholeNumber(120000)).toBe('120 000');
    expect(wholeNumber(1234567)).toBe('1 234 567');
    expect(wholeNumber(999)).toBe('999');
    expect(plural(1250, 'reading')).toBe('1 250 readings');
  });
});

describe('measured values', () => {
  it('never writes a negative zero', () => {
    // ECMA-262 Number.prototype.toFixed keeps the sign of a small negative value: (-0.00001).toFixed(4)
    // is "-0.0000"; the value shown is zero at that precision and carries no sign.
    expect((-0.00001).toFixed(4)).toBe('-0.0000');
    expect(fixed(-0.00001, 4)).toBe('0.0000');
    expect(fixed(-0, 2)).toBe('0.00');
    expect(fixed(-0.00006, 4)).toBe('-0.0001');
    expect(fixed(0.12345, 3)).toBe('0.123');
  });

  it('signs deviations, except a zero one', () => {
    expect(signedFixed(0.0012, 4)).toBe('+0.0012');
    expect(signedFixed(-0.0012, 4)).toBe('-0.0012');
    expect(signedFixed(-0.00001, 4)).toBe('0.0000');
    expect(signedFixed(null, 4)).toBe(MISSING);
  });

  it('shows a missing or non-finite value as a dash', () => {
    expect(fixed(null, 2)).toBe(MISSING);
    expect(fixed(Number.NaN, 2)).toBe(MISSING);
  });
});
