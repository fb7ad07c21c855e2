// Worked entries of the single sampling tables: ISO 2859-1 / ANSI/ASQ Z1.4 Table 1 and Tables 2-A
// and 2-B, and Z1.4 Table II-C for reduced inspection, as published in the AQLSchemes R package
// (R/AAZ14Single.R, copied whole into tables.test.ts, which checks every cell). Exact integers.
import { describe, expect, it } from 'vitest';
import { SamplingInputError, codeLetterFor, describeSamplingPlan, planFor, tighterNormalAcceptance } from './plan';
import { AQL_VALUES, CODE_LETTERS, PLAN_TABLES, parseCell, type InspectionLevel } from './tables';

describe('code letters', () => {
  it.each([
    // [lot size, level, letter] — Table 1 (AQLSchemes R/AAZ14Single.R, `letters`)
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
const essentials = ({ codeLetter, planLetter, sampleSize, accept, reject, hundredPercent }: ReturnType<typeof planFor>) => ({
  codeLetter,
  planLetter,
  sampleSize,
  accept,
  reject,
  hundredPercent,
});

describe('normal inspection', () => {
  it.each([
    // [lot, level, AQL, letter, n, Ac, Re] — Table 2-A (AQLSchemes R/AAZ14Single.R, normal)
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
    expect(essentials(plan(lotSize, level, aql))).toEqual({ codeLetter, planLetter: codeLetter, sampleSize, accept, reject, hundredPercent: false });
  });
});

describe('arrows', () => {
  it.each([
    // [lot, level, AQL, Table 1 letter, letter reached, n, Ac, Re] — Table 2-A (AQLSchemes R/AAZ14Single.R, normal)
    [400, 'II', 0.65, 'H', 'J', 80, 1, 2], // ↓ to the first plan below: larger n, Ac 1
    [400, 'II', 0.4, 'H', 'G', 32, 0, 1], // ↑ to the first plan above: smaller n, Ac 0
    [400, 'II', 0.1, 'H', 'K', 125, 0, 1], // ↓ over three letters
    [400, 'II', 0.065, 'H', 'L', 200, 0, 1],
    [20, 'II', 1.0, 'C', 'E', 13, 0, 1], // a lot of 20 is code letter C; its arrow leads to the plan of E
    [2000, 'II', 0.15, 'K', 'J', 80, 0, 1], // ↑ right under the 0/1 plan
    [1_000_000, 'III', 10, 'R', 'K', 125, 21, 22], // ↑ from below the largest plan of the column
    [1_000_000, 'III', 1.0, 'R', 'Q', 1250, 21, 22],
  ] as const)('lot %i, level %s, AQL %s: %s leads to %s, n = %i, Ac %i / Re %i', (lotSize, level, aql, codeLetter, planLetter, sampleSize, accept, reject) => {
    expect(essentials(plan(lotSize, level, aql))).toEqual({ codeLetter, planLetter, sampleSize, accept, reject, hundredPercent: false });
  });

  it('takes the first plan below where the up arrow of code letter A at AQL 10 has none above it', () => {
    // AQLSchemes R/AAZ14Single.R resolves A at AQL 10 to n = 5, Ac 1 / Re 2 (C) on normal and to
    // n = 2, Ac 0 / Re 2 (C) on reduced inspection.
    expect(essentials(plan(60, 'S-2', 10))).toEqual({ codeLetter: 'B', planLetter: 'C', sampleSize: 5, accept: 1, reject: 2, hundredPercent: false });
    expect(plan(400, 'S-1', 10).planLetter).toBe('C');
    expect(essentials(plan(8, 'S-1', 10))).toMatchObject({ codeLetter: 'A', planLetter: 'C', sampleSize: 5, accept: 1 });
    expect(essentials(plan(8, 'S-1', 10, 'reduced'))).toMatchObject({ codeLetter: 'A', planLetter: 'C', sampleSize: 2, accept: 0, reject: 2 });
  });
});

describe('tightened and reduced inspection', () => {
  it.each([
    // [severity, lot, level, AQL, Table 1 letter, plan letter, n, Ac, Re]
    // Table 2-B (AQLSchemes R/AAZ14Single.R, tightened)
    ['tightened', 2000, 'II', 1.0, 'K', 'K', 125, 2, 3],
    ['tightened', 2000, 'II', 2.5, 'K', 'K', 125, 5, 6],
    ['tightened', 2000, 'II', 6.5, 'K', 'K', 125, 12, 13],
    ['tightened', 2000, 'II', 10, 'K', 'K', 125, 18, 19],
    ['tightened', 400, 'II', 2.5, 'H', 'H', 50, 2, 3],
    ['tightened', 400, 'II', 4.0, 'H', 'H', 50, 3, 4],
    ['tightened', 400, 'II', 0.25, 'H', 'J', 80, 0, 1], // the 0/1 plan one letter below normal's (H)
    ['tightened', 400, 'II', 1.0, 'H', 'J', 80, 1, 2],
    ['tightened', 400, 'II', 0.65, 'H', 'K', 125, 1, 2], // two down arrows between 0/1 (G) and 1/2 (K)
    // Z1.4 Table II-C (AQLSchemes R/AAZ14Single.R, reduced): n two letters up, Re with a gap
    ['reduced', 2000, 'II', 1.0, 'K', 'K', 50, 1, 4],
    ['reduced', 2000, 'II', 2.5, 'K', 'K', 50, 3, 6],
    ['reduced', 2000, 'II', 10, 'K', 'K', 50, 10, 13],
    ['reduced', 2000, 'II', 0.4, 'K', 'K', 50, 0, 2],
    ['reduced', 2000, 'II', 0.25, 'K', 'L', 80, 0, 2],
    ['reduced', 400, 'II', 0.065, 'H', 'L', 80, 0, 1], // normal inspection draws n = 200 here
    ['reduced', 400, 'II', 0.65, 'H', 'J', 32, 0, 2],
    ['reduced', 400, 'II', 1.0, 'H', 'H', 20, 0, 2],
    ['reduced', 10000, 'II', 4.0, 'L', 'L', 80, 7, 10],
  ] as const)(
    '%s: lot %i, level %s, AQL %s → code letter %s, plan %s, n = %i, Ac %i / Re %i',
    (severity, lotSize, level, aql, codeLetter, planLetter, sampleSize, accept, reject) => {
      expect(essentials(plan(lotSize, level, aql, severity))).toEqual({ codeLetter, planLetter, sampleSize, accept, reject, hundredPercent: false });
    },
  );
});

describe('100 % inspection when n ≥ N', () => {
  it('inspects the whole lot when the plan reached by an arrow is larger than the lot', () => {
    // Lot of 10 at level II is B; AQL 1.0 is ↓ to E, n = 13 > 10 (Tables 1, 2-A; AQLSchemes R/AAZ14Single.R,
    // whose note says to inspect every piece when the sample size exceeds the lot size).
    expect(essentials(plan(10, 'II', 1.0))).toEqual({ codeLetter: 'B', planLetter: 'E', sampleSize: 13, accept: 0, reject: 1, hundredPercent: true });
  });

  it('inspects the whole lot when n equals N', () => {
    // Lot of 2 at level II is A, AQL 6.5 gives n = 2, Ac 0 (Tables 1, 2-A; AQLSchemes R/AAZ14Single.R).
    expect(essentials(plan(2, 'II', 6.5))).toEqual({ codeLetter: 'A', planLetter: 'A', sampleSize: 2, accept: 0, reject: 1, hundredPercent: true });
  });

  it('inspects a lot of one piece', () => {
    expect(plan(1, 'II', 1.0)).toMatchObject({ planLetter: 'E', sampleSize: 13, hundredPercent: true });
  });

  it('does not call a plan 100 % when n is below N', () => {
    // Lot of 14 at level II is B; AQL 4.0 gives n = 3, Ac 0 (Table 2-A; AQLSchemes R/AAZ14Single.R).
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
    // K at AQL 2.5 is 7/8; at 1.5 it is 5/6 (Table 2-A; AQLSchemes R/AAZ14Single.R).
    expect(tighterNormalAcceptance('K', 2.5)).toBe(5);
    expect(tighterNormalAcceptance('H', 1.5)).toBe(1);
  });

  it('below the tightest AQL offered, uses the diagonal, which agrees with the direct reading wherever both exist', () => {
    // Q at AQL 0.065 is 2/3; one step tighter (0.040) is 1/2 (Table 2-A; AQLSchemes R/AAZ14Single.R, c4).
    expect(tighterNormalAcceptance('Q', 0.065)).toBe(1);
    for (let row = 1; row < CODE_LETTERS.length; row++) {
      for (let column = 1; column < AQL_VALUES.length; column++) {
        const fromDiagonal = parseCell(PLAN_TABLES.normal[CODE_LETTERS[row - 1]][column])?.accept ?? null;
        expect(tighterNormalAcceptance(CODE_LETTERS[row], AQL_VALUES[column])).toBe(fromDiagonal);
      }
    }
  });
});

describe('the plan in words', () => {
  it('names both letters when an arrow leads away from the code letter', () => {
    expect(describeSamplingPlan(plan(20, 'II', 1.0))).toBe(
      'Single sampling, normal inspection per ISO 2859-1 Table 2-A, level II, AQL 1: code letter C (plan of letter E after the arrow), n = 13, Ac 0, Re 1',
    );
    expect(describeSamplingPlan(plan(400, 'II', 1.0))).toContain('code letter H, n = 50, Ac 1, Re 2');
  });

  it('names the Z1.4 table on reduced inspection and says what a result inside the gap does', () => {
    // Z1.4 reduced inspection: above Ac but below Re, the lot is accepted and normal inspection is reinstated (common practice).
    const text = describeSamplingPlan(plan(2000, 'II', 1.0, 'reduced'));
    expect(text).toMatch(/^Single sampling, reduced inspection per ANSI\/ASQ Z1\.4 Table II-C, level II, AQL 1: code letter K, n = 50, Ac 1, Re 4; /);
    expect(text).toContain('a result between Ac and Re accepts the lot and normal inspection resumes');
    expect(describeSamplingPlan(plan(400, 'II', 0.065, 'reduced'))).not.toContain('between Ac and Re');
  });

  it('says when every piece is inspected', () => {
    expect(describeSamplingPlan({ ...plan(10, 'II', 1.0), sampleSize: 10 })).toContain(
      'code letter B (plan of letter E after the arrow), every piece inspected (10), Ac 0, Re 1',
    );
  });
});
