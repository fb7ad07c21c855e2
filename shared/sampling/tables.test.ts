// Internal consistency of the recalled tables: the structure ISO 2859-1:1999 Tables 1, 2-A, 2-B
// and 2-C are built on (from memory), checked over every cell.
import { describe, expect, it } from 'vitest';
import { probabilityOfAcceptance } from './oc';
import { resolveCell } from './plan';
import {
  AQL_VALUES,
  CODE_LETTERS,
  INSPECTION_LEVELS,
  LOT_SIZE_ROWS,
  PLAN_TABLES,
  SAMPLE_SIZES,
  SEVERITIES,
  parseCell,
  type Severity,
} from './tables';

const letterIndex = (letter: string) => CODE_LETTERS.indexOf(letter as (typeof CODE_LETTERS)[number]);
const cellAt = (severity: Severity, row: number, column: number) => PLAN_TABLES[severity][CODE_LETTERS[row]][column];

describe('Table 1 structure', () => {
  it('covers every lot size from 2 up without gaps', () => {
    expect(LOT_SIZE_ROWS[0].min).toBe(2);
    for (let i = 1; i < LOT_SIZE_ROWS.length; i++) expect(LOT_SIZE_ROWS[i].min).toBe(LOT_SIZE_ROWS[i - 1].max + 1);
    expect(LOT_SIZE_ROWS.at(-1)?.max).toBe(Number.POSITIVE_INFINITY);
  });

  it('never lowers the code letter for a larger lot or a more discriminating level', () => {
    INSPECTION_LEVELS.forEach((_, level) => {
      for (let row = 1; row < LOT_SIZE_ROWS.length; row++) {
        expect(letterIndex(LOT_SIZE_ROWS[row].letters[level])).toBeGreaterThanOrEqual(letterIndex(LOT_SIZE_ROWS[row - 1].letters[level]));
      }
    });
    for (const { letters } of LOT_SIZE_ROWS) {
      // S-1 ≤ S-2 ≤ S-3 ≤ S-4, and I ≤ II ≤ III; the special levels and level I are separate scales.
      for (const [lower, higher] of [[0, 1], [1, 2], [2, 3], [4, 5], [5, 6]]) {
        expect(letterIndex(letters[higher])).toBeGreaterThanOrEqual(letterIndex(letters[lower]));
      }
    }
  });
});

describe('sample sizes', () => {
  it('follow a geometric series of ratio about 1.6 on normal inspection', () => {
    // Rounded preferred numbers of ratio 10^(1/5) ≈ 1.585 (common practice); 2 → 3 is the coarsest step.
    const sizes = SAMPLE_SIZES.normal;
    for (let i = 1; i < sizes.length; i++) {
      expect(sizes[i] / sizes[i - 1]).toBeGreaterThanOrEqual(1.5);
      expect(sizes[i] / sizes[i - 1]).toBeLessThan(1.7);
    }
  });

  it('are the same on tightened as on normal inspection', () => {
    expect(SAMPLE_SIZES.tightened).toEqual(SAMPLE_SIZES.normal);
  });

  it('are, on reduced inspection, those of normal two code letters up (A to C all 2)', () => {
    expect(SAMPLE_SIZES.reduced.slice(0, 3)).toEqual([2, 2, 2]);
    for (let i = 2; i < CODE_LETTERS.length; i++) expect(SAMPLE_SIZES.reduced[i]).toBe(SAMPLE_SIZES.normal[i - 2]);
  });
});

describe.each(SEVERITIES)('Table of %s inspection', (severity) => {
  it('is constant along each diagonal (one code letter down = one AQL step tighter)', () => {
    for (let row = 0; row + 1 < CODE_LETTERS.length; row++) {
      for (let column = 1; column < AQL_VALUES.length; column++) {
        expect(cellAt(severity, row + 1, column - 1), `${CODE_LETTERS[row + 1]} / ${AQL_VALUES[column - 1]}`).toBe(cellAt(severity, row, column));
      }
    }
  });

  it('has Re = Ac + 1 in every plan', () => {
    for (const letter of CODE_LETTERS) {
      for (const cell of PLAN_TABLES[severity][letter]) {
        const plan = parseCell(cell);
        if (plan) expect(plan.reject).toBe(plan.accept + 1);
      }
    }
  });

  it('never lowers Ac for a looser AQL or a larger sample', () => {
    for (let row = 0; row < CODE_LETTERS.length; row++) {
      for (let column = 0; column < AQL_VALUES.length; column++) {
        const here = resolveCell(severity, CODE_LETTERS[row], AQL_VALUES[column]).accept;
        if (column > 0) expect(here).toBeGreaterThanOrEqual(resolveCell(severity, CODE_LETTERS[row], AQL_VALUES[column - 1]).accept);
        if (row > 0) expect(here).toBeGreaterThanOrEqual(resolveCell(severity, CODE_LETTERS[row - 1], AQL_VALUES[column]).accept);
      }
    }
  });

  it('has a plan in the direction of every arrow but one (normal, code letter A, AQL 10)', () => {
    const deadEnds: string[] = [];
    for (let row = 0; row < CODE_LETTERS.length; row++) {
      for (let column = 0; column < AQL_VALUES.length; column++) {
        const cell = cellAt(severity, row, column);
        if (cell !== '↓' && cell !== '↑') continue;
        const step = cell === '↓' ? 1 : -1;
        let found = false;
        for (let other = row + step; other >= 0 && other < CODE_LETTERS.length && !found; other += step) {
          found = parseCell(cellAt(severity, other, column)) !== null;
        }
        if (!found) deadEnds.push(`${CODE_LETTERS[row]} / ${AQL_VALUES[column]}`);
      }
    }
    expect(deadEnds).toEqual(severity === 'normal' ? ['A / 10'] : []);
  });
});

describe('tightened against normal', () => {
  it('accepts a lot at the AQL no more often than normal inspection, for every code letter and AQL', () => {
    for (const letter of CODE_LETTERS) {
      for (const aql of AQL_VALUES) {
        const normal = resolveCell('normal', letter, aql);
        const tightened = resolveCell('tightened', letter, aql);
        const paNormal = probabilityOfAcceptance(SAMPLE_SIZES.normal[normal.letterIndex], normal.accept, aql / 100);
        const paTightened = probabilityOfAcceptance(SAMPLE_SIZES.tightened[tightened.letterIndex], tightened.accept, aql / 100);
        expect(paTightened, `${letter} / ${aql}`).toBeLessThanOrEqual(paNormal + 1e-12);
      }
    }
  });
});
