// Which defect codes of the catalogue a piece's failing reasons name. The reasons are the optics
// engine's own words (shared/optics/judge.ts and evaluate.ts), possibly prefixed with a wavelength
// ("632.8 nm: ...") or followed by one (" at 632.8 nm"), so each is recognised by its key phrase.
import { MARK_ON_SLOW_AXIS } from '../optics/judge';

/** The codes the catalogue is seeded with (db/migrations 1000 and 1002); the site may add others. */
export const SEEDED_DEFECT_CODES = [
  'retardance',
  'axis-mark',
  'mark-on-slow-axis',
  'wrong-order',
  'diattenuation',
  'depolarisation',
  'cosmetic',
  'dimensional',
  'documentation',
] as const;
export type SeededDefectCode = (typeof SEEDED_DEFECT_CODES)[number];

const PHRASES: [RegExp, SeededDefectCode][] = [
  [new RegExp(MARK_ON_SLOW_AXIS.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')), 'mark-on-slow-axis'],
  [/\bretardance error\b/, 'retardance'],
  [/\bfast-axis error\b/, 'axis-mark'],
  [/\bdiattenuation\b/, 'diattenuation'],
  [/\bdepolarisation\b/, 'depolarisation'],
  [/\bestimated from the birefringence dispersion\b.*\bordered:/, 'wrong-order'],
];

/** The defect codes the reasons name, each once, in the catalogue's order. A reason naming none
 * (an unforeseen text) adds nothing: it stays readable on the NCR's piece. */
export function defectCodesFor(reasons: readonly string[]): SeededDefectCode[] {
  const found = new Set<SeededDefectCode>();
  for (const reason of reasons) {
    for (const [phrase, code] of PHRASES) if (phrase.test(reason)) found.add(code);
  }
  return SEEDED_DEFECT_CODES.filter((code) => found.has(code));
}
