// Switching rules of ISO 2859-1:1999, clause 9, as a pure state machine kept per supplier and
// part. Only lots on original inspection count; resubmitted lots are not fed in.
//
// Lots are fed in the order they are decided, each at the state in effect then, whatever severity it
// was sampled under (a lot keeps its plan; the state may have moved since): a lot not accepted always
// counts, an accepted lot counts only when its plan was at least as strict as the state's severity.
//
// Discontinuation follows the standard: acceptance stops when the cumulative number of lots not
// accepted while on tightened inspection reaches 5. (The product brief words it as "after 5
// consecutive lots on tightened"; the standard counts lots not accepted, whether consecutive or
// not, within one spell of tightened inspection.)
import { z } from 'zod';
import { aqlSchema, tighterNormalAcceptance } from './plan';
import { CODE_LETTERS, INSPECTION_LEVELS, SEVERITIES, type Aql, type Severity } from './tables';
import { plural } from '../format';

const RECENT_LOTS_ON_NORMAL = 5;
const REJECTIONS_FOR_TIGHTENED = 2;
const ACCEPTANCES_TO_LEAVE_TIGHTENED = 5;
const REJECTIONS_TO_STOP = 5;
const SCORE_FOR_REDUCED = 30;
const STRICTNESS: Record<Severity, number> = { reduced: 0, normal: 1, tightened: 2 };

export const switchingStateSchema = z.object({
  severity: z.enum(SEVERITIES),
  /** Lots accepted in a row at the current severity. */
  consecutiveAccepted: z.number().int().min(0),
  /** Accepted flags of the latest lots on normal inspection, oldest first, at most 5. */
  recentResults: z.array(z.boolean()).max(RECENT_LOTS_ON_NORMAL),
  /** Lots not accepted since this spell of tightened inspection began. */
  tightenedCount: z.number().int().min(0),
  switchingScore: z.number().int().min(0),
  /** Acceptance discontinued: no lot may be inspected until the supplier has acted. */
  stopped: z.boolean(),
});
export type SwitchingState = z.infer<typeof switchingStateSchema>;

const lotResultSchema = z.object({
  accepted: z.boolean(),
  defectives: z.number().int().min(0),
  plan: z.object({
    /** The letter whose plan was used (after the table's arrow): the switching score reads its row. */
    planLetter: z.enum(CODE_LETTERS),
    sampleSize: z.number().int().min(1),
    accept: z.number().int().min(0),
    reject: z.number().int().min(1),
    severity: z.enum(SEVERITIES),
    aql: aqlSchema,
    level: z.enum(INSPECTION_LEVELS).optional(),
  }),
  /** Production irregular or delayed: ends reduced inspection and holds off the switch to it. */
  productionIrregular: z.boolean().optional(),
});

/** A lot decided on original inspection. Plain strings, as plans are read back from storage. */
export interface LotResult {
  accepted: boolean;
  defectives: number;
  plan: { planLetter: string; sampleSize: number; accept: number; reject: number; severity: string; aql: number; level?: string };
  productionIrregular?: boolean;
}

export interface SwitchingSettings {
  /** The responsible authority's approval of reduced inspection (a site setting). */
  reducedEnabled: boolean;
}

export type SwitchingPhase = Severity | 'stopped';

export interface SwitchingOutcome {
  state: SwitchingState;
  change: { from: SwitchingPhase; to: SwitchingPhase } | null;
  /** What the lot did to the state, in words, for the switching history. */
  explanation: string;
}

export function initialSwitchingState(severity: Severity = 'normal'): SwitchingState {
  return { severity, consecutiveAccepted: 0, recentResults: [], tightenedCount: 0, switchingScore: 0, stopped: false };
}

function issuesOf(error: z.ZodError) {
  return error.issues.map((issue) => `${issue.path.join('.') || 'value'}: ${issue.message}`).join('; ');
}

/** Clause 9.3.3.2: the score that leads from normal to reduced inspection. */
function nextSwitchingScore(score: number, lot: z.infer<typeof lotResultSchema>): number {
  const { plan } = lot;
  if (!lot.accepted) return 0;
  // The score counts lots on normal inspection; an acceptance on a stricter plan leaves it as it is.
  if (plan.severity !== 'normal') return score;
  if (plan.accept >= 2) {
    const tighterAccept = tighterNormalAcceptance(plan.planLetter, plan.aql as Aql);
    return tighterAccept !== null && lot.defectives <= tighterAccept ? score + 3 : 0;
  }
  return score + 2;
}

function switched(state: SwitchingState, from: SwitchingPhase, to: SwitchingPhase, explanation: string): SwitchingOutcome {
  return { state, change: { from, to }, explanation };
}

export function nextSwitchingState(state: SwitchingState, lotResult: LotResult, settings: SwitchingSettings): SwitchingOutcome {
  const current = switchingStateSchema.safeParse(state);
  if (!current.success) throw new Error(`invalid switching state: ${issuesOf(current.error)}`);
  const parsedLot = lotResultSchema.safeParse(lotResult);
  if (!parsedLot.success) throw new Error(`invalid lot result: ${issuesOf(parsedLot.error)}`);
  const before = current.data;
  const lot = parsedLot.data;
  // A lot may be refused with a sample within Ac (the decision is the quality manager's), but a sample
  // that reaches Re never accepts it.
  if (lot.accepted && lot.defectives >= lot.plan.reject) {
    throw new Error(`a lot with ${lot.defectives} defectives at Re ${lot.plan.reject} is not accepted, but the result says accepted`);
  }
  const verdict = lot.accepted ? 'accepted' : 'not accepted';
  const lotText =
    lot.plan.severity === before.severity
      ? `lot ${verdict} on ${before.severity} inspection`
      : `lot ${verdict} (sampled on ${lot.plan.severity} inspection) while ${before.severity} inspection is in effect`;
  if (before.stopped) {
    return { state: before, change: null, explanation: `lot ${verdict} while acceptance is discontinued; it changes nothing until inspection resumes` };
  }
  if (lot.accepted && STRICTNESS[lot.plan.severity as Severity] < STRICTNESS[before.severity]) {
    return {
      state: before,
      change: null,
      explanation: `lot accepted on ${lot.plan.severity} inspection while ${before.severity} inspection is in effect; an acceptance on a less strict plan does not count toward easing inspection`,
    };
  }
  const consecutiveAccepted = lot.accepted ? before.consecutiveAccepted + 1 : 0;

  if (before.severity === 'tightened') {
    const tightenedCount = before.tightenedCount + (lot.accepted ? 0 : 1);
    if (tightenedCount >= REJECTIONS_TO_STOP) {
      return switched(
        { ...before, consecutiveAccepted, tightenedCount, stopped: true },
        'tightened',
        'stopped',
        `${lotText}; ${tightenedCount} lots not accepted on tightened inspection, so acceptance is discontinued (ISO 2859-1, 9.4)`,
      );
    }
    if (consecutiveAccepted >= ACCEPTANCES_TO_LEAVE_TIGHTENED) {
      return switched(
        initialSwitchingState('normal'),
        'tightened',
        'normal',
        `${lotText}; ${consecutiveAccepted} consecutive lots accepted, so normal inspection resumes (ISO 2859-1, 9.3.2)`,
      );
    }
    return {
      state: { ...before, consecutiveAccepted, tightenedCount },
      change: null,
      explanation: `${lotText}; ${consecutiveAccepted} consecutive accepted, ${tightenedCount} not accepted on tightened so far`,
    };
  }

  if (before.severity === 'reduced') {
    // A reduced plan's sample between Ac and Re accepts the lot but ends reduced inspection (ANSI/ASQ Z1.4).
    const inGap = lot.accepted && lot.defectives > lot.plan.accept;
    if (!lot.accepted || inGap || lot.productionIrregular) {
      const reason = !lot.accepted
        ? 'a lot was not accepted, so normal inspection resumes (ISO 2859-1, 9.3.4)'
        : inGap
          ? `its ${plural(lot.defectives, 'defective')} lie between Ac ${lot.plan.accept} and Re ${lot.plan.reject}, so normal inspection resumes (ANSI/ASQ Z1.4)`
          : 'production is irregular or delayed, so normal inspection resumes (ISO 2859-1, 9.3.4)';
      return switched(initialSwitchingState('normal'), 'reduced', 'normal', `${lotText}; ${reason}`);
    }
    return {
      state: { ...before, consecutiveAccepted },
      change: null,
      explanation: `${lotText}; ${consecutiveAccepted} consecutive accepted`,
    };
  }

  const recentResults = [...before.recentResults, lot.accepted].slice(-RECENT_LOTS_ON_NORMAL);
  const rejections = recentResults.filter((accepted) => !accepted).length;
  if (rejections >= REJECTIONS_FOR_TIGHTENED) {
    return switched(
      initialSwitchingState('tightened'),
      'normal',
      'tightened',
      `${lotText}; ${rejections} of the last ${recentResults.length} lots not accepted, so tightened inspection begins (ISO 2859-1, 9.3.1)`,
    );
  }
  const switchingScore = nextSwitchingScore(before.switchingScore, lot);
  const afterLot: SwitchingState = { ...before, consecutiveAccepted, recentResults, switchingScore };
  const scoreText = `${lotText}; switching score ${switchingScore}`;
  if (switchingScore < SCORE_FOR_REDUCED) return { state: afterLot, change: null, explanation: scoreText };
  if (!settings.reducedEnabled) {
    return { state: afterLot, change: null, explanation: `${scoreText}, but reduced inspection is not enabled for this site` };
  }
  if (lot.productionIrregular) {
    return { state: afterLot, change: null, explanation: `${scoreText}, but production is irregular, so normal inspection continues` };
  }
  return switched(
    initialSwitchingState('reduced'),
    'normal',
    'reduced',
    `${scoreText} (at least ${SCORE_FOR_REDUCED}), production steady and reduced inspection enabled, so reduced inspection begins (ISO 2859-1, 9.3.3)`,
  );
}

/** Clause 9.4: once the supplier has improved quality, inspection resumes on tightened. */
export function resumeAfterDiscontinuation(state: SwitchingState): SwitchingState {
  if (!state.stopped) throw new Error('acceptance inspection is not discontinued');
  return initialSwitchingState('tightened');
}
