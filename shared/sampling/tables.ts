// Single sampling tables by attributes, encoded as data: Table 1 (code letters) and Tables 2-A
// (normal) and 2-B (tightened), which ISO 2859-1 and ANSI/ASQ Z1.4 share, and for reduced
// inspection ANSI/ASQ Z1.4 Table II-C, whose plans keep a gap between Ac and Re. tables.test.ts
// checks every cell offered here, arrows followed, against a published encoding of the tables.

export const INSPECTION_LEVELS = ['S-1', 'S-2', 'S-3', 'S-4', 'I', 'II', 'III'] as const;
export type InspectionLevel = (typeof INSPECTION_LEVELS)[number];

// The standard skips I and O so that they cannot be mistaken for 1 and 0.
export const CODE_LETTERS = ['A', 'B', 'C', 'D', 'E', 'F', 'G', 'H', 'J', 'K', 'L', 'M', 'N', 'P', 'Q', 'R'] as const;
export type CodeLetter = (typeof CODE_LETTERS)[number];

// Percent nonconforming. The standard goes on to 0.010 and to 1000 nonconformities per
// 100 items; Phaselot judges pieces as conforming or not, so this range is what it offers.
export const AQL_VALUES = [0.065, 0.1, 0.15, 0.25, 0.4, 0.65, 1.0, 1.5, 2.5, 4.0, 6.5, 10] as const;
export type Aql = (typeof AQL_VALUES)[number];

export const SEVERITIES = ['normal', 'tightened', 'reduced'] as const;
export type Severity = (typeof SEVERITIES)[number];

type LevelLetters = readonly [CodeLetter, CodeLetter, CodeLetter, CodeLetter, CodeLetter, CodeLetter, CodeLetter];

export interface LotSizeRow {
  readonly min: number;
  readonly max: number;
  /** Code letters in the order of INSPECTION_LEVELS. */
  readonly letters: LevelLetters;
}

/** Table 1 — sample size code letters. */
export const LOT_SIZE_ROWS: readonly LotSizeRow[] = [
  //                                 S-1  S-2  S-3  S-4   I    II   III
  { min: 2, max: 8, letters: /*   */ ['A', 'A', 'A', 'A', 'A', 'A', 'B'] },
  { min: 9, max: 15, letters: /*  */ ['A', 'A', 'A', 'A', 'A', 'B', 'C'] },
  { min: 16, max: 25, letters: /* */ ['A', 'A', 'B', 'B', 'B', 'C', 'D'] },
  { min: 26, max: 50, letters: /* */ ['A', 'B', 'B', 'C', 'C', 'D', 'E'] },
  { min: 51, max: 90, letters: /* */ ['B', 'B', 'C', 'C', 'C', 'E', 'F'] },
  { min: 91, max: 150, letters: ['B', 'B', 'C', 'D', 'D', 'F', 'G'] },
  { min: 151, max: 280, letters: ['B', 'C', 'D', 'E', 'E', 'G', 'H'] },
  { min: 281, max: 500, letters: ['B', 'C', 'D', 'E', 'F', 'H', 'J'] },
  { min: 501, max: 1200, letters: ['C', 'C', 'E', 'F', 'G', 'J', 'K'] },
  { min: 1201, max: 3200, letters: ['C', 'D', 'E', 'G', 'H', 'K', 'L'] },
  { min: 3201, max: 10000, letters: ['C', 'D', 'F', 'G', 'J', 'L', 'M'] },
  { min: 10001, max: 35000, letters: ['C', 'D', 'F', 'H', 'K', 'M', 'N'] },
  { min: 35001, max: 150000, letters: ['D', 'E', 'G', 'J', 'L', 'N', 'P'] },
  { min: 150001, max: 500000, letters: ['D', 'E', 'G', 'J', 'M', 'P', 'Q'] },
  { min: 500001, max: Number.POSITIVE_INFINITY, letters: ['D', 'E', 'H', 'K', 'N', 'Q', 'R'] },
];

/** Sample size per code letter, A to R, for each severity. */
export const SAMPLE_SIZES: Readonly<Record<Severity, readonly number[]>> = {
  normal: [2, 3, 5, 8, 13, 20, 32, 50, 80, 125, 200, 315, 500, 800, 1250, 2000],
  // Table 2-B also has a row S (n = 3150); it is only reached from AQLs below 0.065.
  tightened: [2, 3, 5, 8, 13, 20, 32, 50, 80, 125, 200, 315, 500, 800, 1250, 2000],
  reduced: [2, 2, 2, 3, 5, 8, 13, 20, 32, 50, 80, 125, 200, 315, 500, 800],
};

/**
 * A cell of Tables 2-A/2-B/2-C: 'Ac/Re', or an arrow. '↓' means "use the first plan below the
 * arrow", '↑' "use the first plan above the arrow"; either way the sample size changes with
 * the code letter of the plan reached.
 */
export type TableCell = '↓' | '↑' | `${number}/${number}`;

type AqlRow = readonly [TableCell, TableCell, TableCell, TableCell, TableCell, TableCell, TableCell, TableCell, TableCell, TableCell, TableCell, TableCell];
type PlanGrid = Readonly<Record<CodeLetter, AqlRow>>;

// Columns in the order of AQL_VALUES:
//        0.065    0.10    0.15    0.25    0.40    0.65     1.0     1.5     2.5     4.0     6.5      10

/** Table 2-A — single sampling plans for normal inspection. */
const NORMAL: PlanGrid = {
  A: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↑'],
  B: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↑', '↓'],
  C: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↑', '↓', '1/2'],
  D: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↑', '↓', '1/2', '2/3'],
  E: ['↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↑', '↓', '1/2', '2/3', '3/4'],
  F: ['↓', '↓', '↓', '↓', '↓', '0/1', '↑', '↓', '1/2', '2/3', '3/4', '5/6'],
  G: ['↓', '↓', '↓', '↓', '0/1', '↑', '↓', '1/2', '2/3', '3/4', '5/6', '7/8'],
  H: ['↓', '↓', '↓', '0/1', '↑', '↓', '1/2', '2/3', '3/4', '5/6', '7/8', '10/11'],
  J: ['↓', '↓', '0/1', '↑', '↓', '1/2', '2/3', '3/4', '5/6', '7/8', '10/11', '14/15'],
  K: ['↓', '0/1', '↑', '↓', '1/2', '2/3', '3/4', '5/6', '7/8', '10/11', '14/15', '21/22'],
  L: ['0/1', '↑', '↓', '1/2', '2/3', '3/4', '5/6', '7/8', '10/11', '14/15', '21/22', '↑'],
  M: ['↑', '↓', '1/2', '2/3', '3/4', '5/6', '7/8', '10/11', '14/15', '21/22', '↑', '↑'],
  N: ['↓', '1/2', '2/3', '3/4', '5/6', '7/8', '10/11', '14/15', '21/22', '↑', '↑', '↑'],
  P: ['1/2', '2/3', '3/4', '5/6', '7/8', '10/11', '14/15', '21/22', '↑', '↑', '↑', '↑'],
  Q: ['2/3', '3/4', '5/6', '7/8', '10/11', '14/15', '21/22', '↑', '↑', '↑', '↑', '↑'],
  R: ['3/4', '5/6', '7/8', '10/11', '14/15', '21/22', '↑', '↑', '↑', '↑', '↑', '↑'],
};

/**
 * Table 2-B — single sampling plans for tightened inspection. Each 0/1 plan sits one code letter
 * below its place on normal inspection, with two down arrows between it and the next 1/2.
 */
const TIGHTENED: PlanGrid = {
  A: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓'],
  B: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↓'],
  C: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↓', '↓'],
  D: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↓', '↓', '1/2'],
  E: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↓', '↓', '1/2', '2/3'],
  F: ['↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↓', '↓', '1/2', '2/3', '3/4'],
  G: ['↓', '↓', '↓', '↓', '↓', '0/1', '↓', '↓', '1/2', '2/3', '3/4', '5/6'],
  H: ['↓', '↓', '↓', '↓', '0/1', '↓', '↓', '1/2', '2/3', '3/4', '5/6', '8/9'],
  J: ['↓', '↓', '↓', '0/1', '↓', '↓', '1/2', '2/3', '3/4', '5/6', '8/9', '12/13'],
  K: ['↓', '↓', '0/1', '↓', '↓', '1/2', '2/3', '3/4', '5/6', '8/9', '12/13', '18/19'],
  L: ['↓', '0/1', '↓', '↓', '1/2', '2/3', '3/4', '5/6', '8/9', '12/13', '18/19', '↑'],
  M: ['0/1', '↓', '↓', '1/2', '2/3', '3/4', '5/6', '8/9', '12/13', '18/19', '↑', '↑'],
  N: ['↓', '↓', '1/2', '2/3', '3/4', '5/6', '8/9', '12/13', '18/19', '↑', '↑', '↑'],
  P: ['↓', '1/2', '2/3', '3/4', '5/6', '8/9', '12/13', '18/19', '↑', '↑', '↑', '↑'],
  Q: ['1/2', '2/3', '3/4', '5/6', '8/9', '12/13', '18/19', '↑', '↑', '↑', '↑', '↑'],
  R: ['2/3', '3/4', '5/6', '8/9', '12/13', '18/19', '↑', '↑', '↑', '↑', '↑', '↑'],
};

/**
 * ANSI/ASQ Z1.4 Table II-C — single sampling plans for reduced inspection. Its arrows are those of
 * Table 2-A; from 1/2 on, the plans keep a gap between Ac and Re (a result inside the gap accepts
 * the lot and ends reduced inspection). ISO 2859-1:1999 closed the gap instead; Phaselot follows
 * Z1.4, whose table is published cell by cell.
 */
const REDUCED: PlanGrid = {
  A: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↑'],
  B: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↑', '↓'],
  C: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↑', '↓', '0/2'],
  D: ['↓', '↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↑', '↓', '0/2', '1/3'],
  E: ['↓', '↓', '↓', '↓', '↓', '↓', '0/1', '↑', '↓', '0/2', '1/3', '1/4'],
  F: ['↓', '↓', '↓', '↓', '↓', '0/1', '↑', '↓', '0/2', '1/3', '1/4', '2/5'],
  G: ['↓', '↓', '↓', '↓', '0/1', '↑', '↓', '0/2', '1/3', '1/4', '2/5', '3/6'],
  H: ['↓', '↓', '↓', '0/1', '↑', '↓', '0/2', '1/3', '1/4', '2/5', '3/6', '5/8'],
  J: ['↓', '↓', '0/1', '↑', '↓', '0/2', '1/3', '1/4', '2/5', '3/6', '5/8', '7/10'],
  K: ['↓', '0/1', '↑', '↓', '0/2', '1/3', '1/4', '2/5', '3/6', '5/8', '7/10', '10/13'],
  L: ['0/1', '↑', '↓', '0/2', '1/3', '1/4', '2/5', '3/6', '5/8', '7/10', '10/13', '↑'],
  M: ['↑', '↓', '0/2', '1/3', '1/4', '2/5', '3/6', '5/8', '7/10', '10/13', '↑', '↑'],
  N: ['↓', '0/2', '1/3', '1/4', '2/5', '3/6', '5/8', '7/10', '10/13', '↑', '↑', '↑'],
  P: ['0/2', '1/3', '1/4', '2/5', '3/6', '5/8', '7/10', '10/13', '↑', '↑', '↑', '↑'],
  Q: ['1/3', '1/4', '2/5', '3/6', '5/8', '7/10', '10/13', '↑', '↑', '↑', '↑', '↑'],
  R: ['1/4', '2/5', '3/6', '5/8', '7/10', '10/13', '↑', '↑', '↑', '↑', '↑', '↑'],
};

export const PLAN_TABLES: Readonly<Record<Severity, PlanGrid>> = {
  normal: NORMAL,
  tightened: TIGHTENED,
  reduced: REDUCED,
};

export function tableCell(severity: Severity, letter: CodeLetter, aql: Aql): TableCell {
  return PLAN_TABLES[severity][letter][AQL_VALUES.indexOf(aql)];
}

/** Ac and Re of a cell, or null for an arrow. */
export function parseCell(cell: TableCell): { accept: number; reject: number } | null {
  if (cell === '↓' || cell === '↑') return null;
  const [accept, reject] = cell.split('/').map(Number);
  return { accept, reject };
}
