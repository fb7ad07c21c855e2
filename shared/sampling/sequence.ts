// The switching state of a supplier and part is what its sequence makes of the initial state: the
// lots in the order they were first decided (a superseding decision replaces the lot's result in
// its place), and the quality manager's resumptions and severity overrides where they were signed.
// Recomputing from the sequence, rather than patching the stored state, is what lets a superseded
// decision change the state as if it had been taken that way in the first place.
import {
  initialSwitchingState,
  nextSwitchingState,
  resumeAfterDiscontinuation,
  type LotResult,
  type SwitchingOutcome,
  type SwitchingPhase,
  type SwitchingSettings,
  type SwitchingState,
} from './switching';
import type { Severity } from './tables';

export type SwitchingEntry =
  /** A lot decided on original inspection, with the site's settings as they were at its decision. */
  | { kind: 'lot'; result: LotResult; settings: SwitchingSettings }
  /** Inspection resumed after discontinuation, once the supplier has acted (ISO 2859-1, 9.4). */
  | { kind: 'resume' }
  /** The quality manager puts the supplier and part on a severity, for a stated reason. */
  | { kind: 'override'; severity: Severity };

/** Where inspection stands: the severity in effect, or stopped while acceptance is discontinued. */
export const switchingPhaseOf = (state: SwitchingState): SwitchingPhase => (state.stopped ? 'stopped' : state.severity);

export function applySwitchingEntry(state: SwitchingState, entry: SwitchingEntry): SwitchingOutcome {
  if (entry.kind === 'lot') return nextSwitchingState(state, entry.result, entry.settings);
  if (entry.kind === 'resume') {
    if (!state.stopped) {
      return {
        state,
        change: null,
        explanation: `inspection resumed, but acceptance was not discontinued at this point; ${state.severity} inspection continues`,
      };
    }
    return {
      state: resumeAfterDiscontinuation(state),
      change: { from: 'stopped', to: 'tightened' },
      explanation: 'acceptance resumed after the supplier’s corrective action, on tightened inspection (ISO 2859-1, 9.4)',
    };
  }
  if (state.stopped) {
    return {
      state,
      change: null,
      explanation: `severity set to ${entry.severity}, which does not lift a discontinuation: acceptance stays discontinued until inspection is resumed`,
    };
  }
  return {
    state: initialSwitchingState(entry.severity),
    change: entry.severity === state.severity ? null : { from: switchingPhaseOf(state), to: entry.severity },
    explanation: `severity set to ${entry.severity} by the quality manager; counts and switching score start again`,
  };
}

/** The state after every entry of the sequence, in order, with what each entry did. */
export function replaySwitching(entries: readonly SwitchingEntry[], start: SwitchingState = initialSwitchingState()) {
  const outcomes: SwitchingOutcome[] = [];
  let state = start;
  for (const entry of entries) {
    const outcome = applySwitchingEntry(state, entry);
    outcomes.push(outcome);
    state = outcome.state;
  }
  return { state, outcomes };
}
