import { z } from 'zod';
import {
  AQL_VALUES,
  CODE_LETTERS,
  INSPECTION_LEVELS,
  LOT_SIZE_ROWS,
  PLAN_TABLES,
  SAMPLE_SIZES,
  SEVERITIES,
  parseCell,
  type Aql,
  type CodeLetter,
  type InspectionLevel,
  type Severity,
} from './tables';

export const aqlSchema = z.number({ error: 'AQL must be a number' }).refine((value) => (AQL_VALUES as readonly number[]).includes(value), {
  error: `AQL must be one of ${AQL_VALUES.join(', ')} (percent nonconforming)`,
});

export const samplingInputSchema = z.object({
  lotSize: z.number({ error: 'lot size must be a number' }).int('lot size must be a whole number of pieces').min(1, 'lot size must be at least 1'),
  level: z.enum(INSPECTION_LEVELS, {
    error: `inspection level must be one of ${INSPECTION_LEVELS.join(', ')}`,
  }),
  aql: aqlSchema,
  severity: z.enum(SEVERITIES, { error: `severity must be one of ${SEVERITIES.join(', ')}` }),
});

/**
 * What planFor takes. Fields are plain strings and numbers because they usually come from a
 * PO line or a request; samplingInputSchema checks them at run time.
 */
export interface SamplingInput {
  lotSize: number;
  level: string;
  aql: number;
  severity: string;
}

export class SamplingInputError extends Error {
  constructor(readonly issues: readonly string[]) {
    super(`invalid sampling input: ${issues.join('; ')}`);
    this.name = 'SamplingInputError';
  }
}

export interface SamplingPlan {
  lotSize: number;
  level: InspectionLevel;
  aql: Aql;
  severity: Severity;
  /** Table 1's code letter of the lot size at the inspection level. */
  codeLetter: CodeLetter;
  /** The code letter whose plan is used: the row the table's arrow leads to, else codeLetter. */
  planLetter: CodeLetter;
  /** The table's n for the plan letter; when hundredPercent, every piece of the lot is inspected instead. */
  sampleSize: number;
  accept: number;
  reject: number;
  /** The plan's sample size reached or passed the lot size, so every piece is inspected. */
  hundredPercent: boolean;
}

export function codeLetterFor(lotSize: number, level: InspectionLevel): CodeLetter {
  // A lot of one piece has no row of its own; the first row serves and the plan becomes 100 %.
  // The last row is open-ended, so a row is always found.
  const row = LOT_SIZE_ROWS.find((candidate) => lotSize <= candidate.max)!;
  return row.letters[INSPECTION_LEVELS.indexOf(level)];
}

interface ResolvedCell {
  letterIndex: number;
  accept: number;
  reject: number;
}

function findPlanInColumn(severity: Severity, aqlIndex: number, fromLetter: number, step: 1 | -1) {
  const grid = PLAN_TABLES[severity];
  for (let letterIndex = fromLetter + step; letterIndex >= 0 && letterIndex < CODE_LETTERS.length; letterIndex += step) {
    const plan = parseCell(grid[CODE_LETTERS[letterIndex]][aqlIndex]);
    if (plan) return { letterIndex, ...plan };
  }
  return null;
}

/**
 * Follows the arrows of the table from a cell to the plan they lead to. The one arrow with no
 * plan in its direction (code letter A at AQL 10, normal and reduced) is taken the other way, to
 * the first plan below, as the published tables resolve it.
 */
export function resolveCell(severity: Severity, letter: CodeLetter, aql: Aql): ResolvedCell {
  const letterIndex = CODE_LETTERS.indexOf(letter);
  const aqlIndex = AQL_VALUES.indexOf(aql);
  const cell = PLAN_TABLES[severity][letter][aqlIndex];
  const plan = parseCell(cell);
  if (plan) return { letterIndex, ...plan };
  const step = cell === '↓' ? 1 : -1;
  const resolved = findPlanInColumn(severity, aqlIndex, letterIndex, step) ?? findPlanInColumn(severity, aqlIndex, letterIndex, step === 1 ? -1 : 1);
  if (!resolved) throw new Error(`no plan in the ${severity} column for AQL ${aql}`);
  return resolved;
}

/** Throws SamplingInputError, listing every problem, when the input is not a plan request. */
export function planFor(input: SamplingInput): SamplingPlan {
  const parsed = samplingInputSchema.safeParse(input);
  if (!parsed.success) throw new SamplingInputError(parsed.error.issues.map((issue) => issue.message));
  const { lotSize, level, severity } = parsed.data;
  const aql = parsed.data.aql as Aql;
  const codeLetter = codeLetterFor(lotSize, level);
  const resolved = resolveCell(severity, codeLetter, aql);
  const tableSampleSize = SAMPLE_SIZES[severity][resolved.letterIndex];
  const hundredPercent = tableSampleSize >= lotSize;
  return {
    lotSize,
    level,
    aql,
    severity,
    codeLetter,
    planLetter: CODE_LETTERS[resolved.letterIndex],
    sampleSize: tableSampleSize,
    accept: resolved.accept,
    reject: resolved.reject,
    hundredPercent,
  };
}

/** What the plan look-up answers (command line and API): the letters, the table's n, Ac and Re. */
export interface PlanLookup {
  codeLetter: CodeLetter;
  planLetter: CodeLetter;
  sampleSize: number;
  accept: number;
  reject: number;
  severity: Severity;
  hundredPercent: boolean;
}

export function lookUpPlan(input: SamplingInput): PlanLookup {
  const { codeLetter, planLetter, sampleSize, accept, reject, severity, hundredPercent } = planFor(input);
  return { codeLetter, planLetter, sampleSize, accept, reject, severity, hundredPercent };
}

/**
 * Acceptance number of the normal plan at the same code letter with the AQL one step tighter,
 * for the switching score. Below the tightest AQL offered, the diagonal structure of Table 2-A
 * gives it: the cell one AQL step to the left equals the cell one code letter up.
 */
export function tighterNormalAcceptance(letter: CodeLetter, aql: Aql): number | null {
  const letterIndex = CODE_LETTERS.indexOf(letter);
  const aqlIndex = AQL_VALUES.indexOf(aql);
  const cell = aqlIndex > 0 ? PLAN_TABLES.normal[letter][aqlIndex - 1] : letterIndex > 0 ? PLAN_TABLES.normal[CODE_LETTERS[letterIndex - 1]][aqlIndex] : '↓';
  return parseCell(cell)?.accept ?? null;
}

/** Where a severity's plans come from, as the plan text names it. */
export const PLAN_TABLE_NAMES: Readonly<Record<Severity, string>> = {
  normal: 'ISO 2859-1 Table 2-A',
  tightened: 'ISO 2859-1 Table 2-B',
  reduced: 'ANSI/ASQ Z1.4 Table II-C',
};

/** The code letter, and the plan's letter when an arrow leads elsewhere: "C (plan of letter E after the arrow)". */
export function codeLetterText(codeLetter: string, planLetter: string): string {
  return codeLetter === planLetter ? codeLetter : `${codeLetter} (plan of letter ${planLetter} after the arrow)`;
}

/** A plan as stored with a lot or answered by the look-up; sampleSize is what is inspected. */
export interface PlanForText {
  severity: Severity;
  level: string;
  aql: number;
  codeLetter: string;
  planLetter: string;
  sampleSize: number;
  accept: number;
  reject: number;
  hundredPercent: boolean;
}

/** The plan in one sentence, for pages, documents and the switching history. */
export function describeSamplingPlan(plan: PlanForText): string {
  const size = plan.hundredPercent ? `every piece inspected (${plan.sampleSize})` : `n = ${plan.sampleSize}`;
  const gap = plan.reject > plan.accept + 1 ? `; a result between Ac and Re accepts the lot and normal inspection resumes` : '';
  return (
    `Single sampling, ${plan.severity} inspection per ${PLAN_TABLE_NAMES[plan.severity]}, level ${plan.level}, AQL ${plan.aql}: ` +
    `code letter ${codeLetterText(plan.codeLetter, plan.planLetter)}, ${size}, Ac ${plan.accept}, Re ${plan.reject}${gap}`
  );
}
