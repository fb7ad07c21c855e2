// Entries of ISO 2859-1:1999 Tables 1, 2-A, 2-B and 2-C, recalled from memory. The tables are
// exact integers, so the checks are exact; the uncertainty is in the recall, not in a tolerance.
import { describe, expect, it } from 'vitest';
import { SamplingInputError, codeLetterFor, planFor, tighterNormalAcceptance } from './plan';
import { AQL_VALUES, CODE_LETTERS, PLAN_TABLES, parseCell, type InspectionLevel } from './tables';

describe('code letters', () => {
  it.each([
    // [lot size, level, letter] — ISO 2859-1:1999 Table 1 (from memory)
    [400, 'II', 'H'],
    [281, 'II', 'H'],
    [280, 'II', 'G'],
    [500, 'II', 'H'],
    [501, 'II', 'J'],
    [2000, 'II', 'K'],
    [5, 'II', 'A'],
    [100, 'I', 'D'],
    [100, 'III', 'G'],
    [10000, 'III', 'M'],
    [1_000_000, 'III', 'R'],
    [1_000_000, 'I', 'N'],
    [400, 'S-1', 'B'],
    [400, 'S-2', 'C'],
    [400, 'S-3', 'D'],
    [400, 'S-4', 'E'],
    [20000, 'S-4', 'H'],
    [1_000_000, 'S-1', 'D'],
    [1_000_000, 'S-4', 'K'],
    [40, 'S-2', 'B'],
  ] as const)('lot of %i at level %s is code %s', (lotSize, level, letter) => {
    expect(codeLetterFor(lotSize, level)).toBe(letter);
  });
});

const plan = (lotSize: number, level: InspectionLevel, aql: number, severity = 'normal') => planFor({ lotSize, level, aql, severity });
const essentials = ({ codeLetter, sampleSize, accept, reject, resolvedFromLetter, hundredPercent }: ReturnType<typeof planFor>) => ({
  codeLetter,
  sampleSize,
  accept,
  reject,
  resolvedFromLetter,
  hundredPercent,
});

describe('normal inspection', () => {
  it.each([
    // [lot, level, AQL, letter, n, Ac, Re] — ISO 2859-1:1999 Table 2-A (from memory)
    [400, 'II', 1.0, 'H', 50, 1, 2],
    [400, 'II', 0.25, 'H', 50, 0, 1],
    [400, 'II', 1.5, 'H', 50, 2, 3],
    [400, 'II', 2.5, 'H', 50, 3, 4],
    [400, 'II', 4.0, 'H', 50, 5, 6],
    [400, 'II', 6.5, 'H', 50, 7, 8],
    [400, 'II', 10, 'H', 50, 10, 11],
    [2000, 'II', 1.0, 'K', 125, 3, 4],
    [2000, 'II', 2.5, 'K', 125, 7, 8],
    [2000, 'II', 0.1, 'K', 125, 0, 1],
    [2000, 'II', 6.5, 'K', 125, 14, 15],
    [2000, 'II', 10, 'K', 125, 21, 22],
    [1000, 'II', 0.15, 'J', 80, 0, 1],
    [1000, 'II', 0.65, 'J', 80, 1, 2],
    [200, 'II', 2.5, 'G', 32, 2, 3],
    [100, 'II', 6.5, 'F', 20, 3, 4],
    [1_000_000, 'III', 0.065, 'R', 2000, 3, 4],
  ] as const)('lot %i, level %s, AQL %s → %s, n = %i, Ac %i / Re %i', (lotSize, level, aql, codeLetter, sampleSize, accept, reject) => {
    expect(essentials(plan(lotSize, level, aql))).toEqual({ codeLetter, sampleSize, accept, reject, resolvedFromLetter: undefined, hundredPercent: false });
  });
});

describe('arrows', () => {
  it.each([
    // [lot, level, AQL, Table 1 letter, letter reached, n, Ac, Re] — ISO 2859-1:1999 Table 2-A (from memory)
    [400, 'II', 0.65, 'H', 'J', 80, 1, 2], // ↓ to the first plan below: larger n, Ac 1
    [400, 'II', 0.4, 'H', 'G', 32, 0, 1], // ↑ to the first plan above: smaller n, Ac 0
    [400, 'II', 0.1, 'H', 'K', 125, 0, 1], // ↓ over three letters
    [400, 'II', 0.065, 'H', 'L', 200, 0, 1],
    [2000, 'II', 0.15, 'K', 'J', 80, 0, 1], // ↑ right under the 0/1 plan
    [1_000_000, 'III', 10, 'R', 'K', 125, 21, 22], // ↑ from below the largest plan of the column
    [1_000_000, 'III', 1.0, 'R', 'Q', 1250, 21, 22],
  ] as const)('lot %i, level %s, AQL %s: %s leads to %s, n = %i, Ac %i / Re %i', (lotSize, level, aql, fromLetter, codeLetter, sampleSize, accept, reject) => {
    expect(essentials(plan(lotSize, level, aql))).toEqual({ codeLetter, sampleSize, accept, reject, resolvedFromLetter: fromLetter, hundredPercent: false });
  });

  it('takes the first plan below where the up arrow of code letter A at AQL 10 has none above it', () => {
    // Table 2-A (from memory) leaves this arrow without a plan; this module's documented choice.
    expect(essentials(plan(60, 'S-2', 10))).toEqual({ codeLetter: 'C', sampleSize: 5, accept: 1, reject: 2, resolvedFromLetter: 'B', hundredPercent: false });
    expect(plan(400, 'S-1', 10).codeLetter).toBe('C');
    expect(essentials(plan(8, 'S-1', 10))).toMatchObject({ codeLetter: 'C', resolvedFromLetter: 'A', sampleSize: 5, accept: 1 });
  });
});

describe('tightened and reduced inspection', () => {
  it.each([
    // [severity, lot, level, AQL, letter, n, Ac, Re, Table 1 letter if an arrow moved it]
    // ISO 2859-1:1999 Table 2-B (from memory)
    ['tightened', 2000, 'II', 1.0, 'K', 125, 2, 3, undefined],
    ['tightened', 2000, 'II', 2.5, 'K', 125, 5, 6, undefined],
    ['tightened', 2000, 'II', 6.5, 'K', 125, 12, 13, undefined],
    ['tightened', 2000, 'II', 10, 'K', 125, 18, 19, undefined],
    ['tightened', 400, 'II', 2.5, 'H', 50, 2, 3, undefined],
    ['tightened', 400, 'II', 4.0, 'H', 50, 3, 4, undefined],
    ['tightened', 400, 'II', 0.65, 'H', 50, 0, 1, undefined],
    ['tightened', 400, 'II', 1.0, 'J', 80, 1, 2, 'H'], // ↓: tightened needs n = 80 for Ac 1 where normal had n = 50
    ['tightened', 400, 'II', 0.25, 'K', 125, 0, 1, 'H'],
    // ISO 2859-1:1999 Table 2-C (from memory)
    ['reduced', 2000, 'II', 1.0, 'K', 50, 1, 2, undefined],
    ['reduced', 2000, 'II', 2.5, 'K', 50, 3, 4, undefined],
    ['reduced', 2000, 'II', 10, 'K', 50, 10, 11, undefined],
    ['reduced', 2000, 'II', 0.25, 'K', 50, 0, 1, undefined],
    ['reduced', 2000, 'II', 0.4, 'J', 32, 0, 1, 'K'],
    ['reduced', 400, 'II', 0.65, 'H', 20, 0, 1, undefined],
    ['reduced', 400, 'II', 1.0, 'G', 13, 0, 1, 'H'],
    ['reduced', 10000, 'II', 4.0, 'L', 80, 7, 8, undefined],
  ] as const)(
    '%s: lot %i, level %s, AQL %s → %s, n = %i, Ac %i / Re %i',
    (severity, lotSize, level, aql, codeLetter, sampleSize, accept, reject, resolvedFromLetter) => {
      expect(essentials(plan(lotSize, level, aql, severity))).toEqual({ codeLetter, sampleSize, accept, reject, resolvedFromLetter, hundredPercent: false });
    },
  );
});

describe('100 % inspection when n ≥ N', () => {
  it('inspects the whole lot when the plan reached by an arrow is larger than the lot', () => {
    // Lot of 10 at level II is B; AQL 1.0 is ↓ to E, n = 13 > 10 (ISO 2859-1:1999 Tables 1, 2-A, from memory).
    expect(essentials(plan(10, 'II', 1.0))).toEqual({ codeLetter: 'E', sampleSize: 10, accept: 0, reject: 1, resolvedFromLetter: 'B', hundredPercent: true });
  });

  it('inspects the whole lot when n equals N', () => {
    // Lot of 2 at level II is A, AQL 6.5 gives n = 2, Ac 0 (ISO 2859-1:1999 Tables 1, 2-A, from memory).
    expect(essentials(plan(2, 'II', 6.5))).toEqual({ codeLetter: 'A', sampleSize: 2, accept: 0, reject: 1, resolvedFromLetter: undefined, hundredPercent: true });
  });

  it('inspects a lot of one piece', () => {
    expect(plan(1, 'II', 1.0)).toMatchObject({ sampleSize: 1, hundredPercent: true });
  });

  it('does not call a plan 100 % when n is below N', () => {
    // Lot of 14 at level II is B; AQL 4.0 gives n = 3, Ac 0 (Table 2-A, from memory).
    expect(plan(14, 'II', 4.0)).toMatchObject({ codeLetter: 'B', sampleSize: 3, hundredPercent: false });
  });
});

describe('input validation', () => {
  it.each([
    [{ lotSize: 500, level: 'II', aql: 0.3, severity: 'normal' }, /AQL must be one of 0.065, 0.1/],
    [{ lotSize: 500, level: 'IV', aql: 1.0, severity: 'normal' }, /inspection level must be one of S-1/],
    [{ lotSize: 0, level: 'II', aql: 1.0, severity: 'normal' }, /lot size must be at least 1/],
    [{ lotSize: 12.5, level: 'II', aql: 1.0, severity: 'normal' }, /whole number/],
    [{ lotSize: 500, level: 'II', aql: 1.0, severity: 'strict' }, /severity must be one of normal, tightened, reduced/],
  ])('rejects %o', (input, message) => {
    expect(() => planFor(input)).toThrow(message);
  });

  it('lists every problem at once', () => {
    try {
      planFor({ lotSize: -3, level: 'X', aql: 7, severity: 'normal' });
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(SamplingInputError);
      expect((error as SamplingInputError).issues).toHaveLength(3);
    }
  });
});

describe('one AQL step tighter, for the switching score', () => {
  it('reads the normal plan one column to the left', () => {
    // K at AQL 2.5 is 7/8; at 1.5 it is 5/6 (ISO 2859-1:1999 Table 2-A, from memory).
    expect(tighterNormalAcceptance('K', 2.5)).toBe(5);
    expect(tighterNormalAcceptance('H', 1.5)).toBe(1);
  });

  it('below the tightest AQL offered, uses the diagonal, which agrees with the direct reading wherever both exist', () => {
    // Q at AQL 0.065 is 2/3; one step tighter (0.040) is 1/2 (Table 2-A, from memory).
    expect(tighterNormalAcceptance('Q', 0.065)).toBe(1);
    for (let row = 1; row < CODE_LETTERS.length; row++) {
      for (let column = 1; column < AQL_VALUES.length; column++) {
        const fromDiagonal = parseCell(PLAN_TABLES.normal[CODE_LETTERS[row - 1]][column])?.accept ?? null;
        expect(tighterNormalAcceptance(CODE_LETTERS[row], AQL_VALUES[column])).toBe(fromDiagonal);
      }
    }
  });
});
