// Switching rules of ISO 2859-1:1999, clause 9 (from memory): 2 of 5 lots not accepted → tightened;
// 5 consecutive accepted on tightened → normal; 5 not accepted on tightened → discontinued;
// switching score ≥ 30 with steady production and approval → reduced; a lot not accepted on
// reduced → normal; and, from ANSI/ASQ Z1.4 (from memory), a reduced sample between Ac and Re
// accepts the lot and returns to normal. Plans come from planFor (tables.test.ts checks them).
import { describe, expect, it } from 'vitest';
import { planFor, type SamplingPlan } from './plan';
import {
  initialSwitchingState,
  nextSwitchingState,
  resumeAfterDiscontinuation,
  type SwitchingOutcome,
  type SwitchingSettings,
  type SwitchingState,
} from './switching';
import type { Severity } from './tables';

const enabled: SwitchingSettings = { reducedEnabled: true };
const disabled: SwitchingSettings = { reducedEnabled: false };

// Lot of 400 at level II, AQL 1.0: normal H n = 50, Ac 1; tightened J n = 80, Ac 1; reduced H n = 20, Ac 0 / Re 2.
const acOnePlan = (severity: Severity) => planFor({ lotSize: 400, level: 'II', aql: 1.0, severity });
// Lot of 2000 at level II, AQL 2.5: normal K n = 125, Ac 7; one AQL step tighter (1.5) Ac 5.
const acSevenPlan = planFor({ lotSize: 2000, level: 'II', aql: 2.5, severity: 'normal' });

function lot(plan: SamplingPlan, defectives: number, productionIrregular?: boolean) {
  return { plan, defectives, accepted: defectives < plan.reject, ...(productionIrregular === undefined ? {} : { productionIrregular }) };
}

/** Feeds lots 'a' (accepted, no defectives) and 'r' (not accepted) in order, each on the current severity. */
function run(pattern: string, settings: SwitchingSettings = disabled, start: SwitchingState = initialSwitchingState()) {
  const outcomes: SwitchingOutcome[] = [];
  let state = start;
  for (const mark of pattern) {
    const plan = acOnePlan(state.severity);
    const outcome = nextSwitchingState(state, lot(plan, mark === 'a' ? 0 : plan.reject), settings);
    outcomes.push(outcome);
    state = outcome.state;
  }
  return { state, outcomes, changes: outcomes.flatMap((o, index) => (o.change ? [`${index + 1}:${o.change.from}→${o.change.to}`] : [])) };
}

describe('normal → tightened', () => {
  it('switches when 2 of 5 consecutive lots are not accepted', () => {
    const { state, changes, outcomes } = run('araar');
    expect(changes).toEqual(['5:normal→tightened']);
    expect(state).toEqual(initialSwitchingState('tightened'));
    expect(outcomes[4].explanation).toMatch(/2 of the last 5 lots not accepted/);
  });

  it('switches on 2 rejections in a row', () => {
    expect(run('rr').changes).toEqual(['2:normal→tightened']);
  });

  it('does not switch when the two rejections are 6 lots apart', () => {
    const { state, changes } = run('raaaaar');
    expect(changes).toEqual([]);
    expect(state.severity).toBe('normal');
    expect(state.recentResults).toEqual([true, true, true, true, false]);
  });
});

describe('tightened → normal, and discontinuation', () => {
  const tightened = initialSwitchingState('tightened');

  it('returns to normal after 5 consecutive accepted lots, with the switching score at 0', () => {
    const { state, changes } = run('aaaaa', disabled, tightened);
    expect(changes).toEqual(['5:tightened→normal']);
    expect(state).toEqual(initialSwitchingState('normal'));
  });

  it('needs the 5 accepted lots to be consecutive', () => {
    const { state, changes } = run('aaaaraaaa', disabled, tightened);
    expect(changes).toEqual([]);
    expect(state).toMatchObject({ severity: 'tightened', consecutiveAccepted: 4, tightenedCount: 1 });
  });

  it('discontinues acceptance when 5 lots in all are not accepted on tightened inspection', () => {
    const { state, changes, outcomes } = run('raraarrar', disabled, tightened);
    expect(changes).toEqual(['9:tightened→stopped']);
    expect(state).toMatchObject({ stopped: true, tightenedCount: 5, severity: 'tightened' });
    expect(outcomes.at(-1)?.explanation).toMatch(/acceptance is discontinued/);
  });

  it('goes from normal through tightened to discontinued', () => {
    expect(run('rrrrrrr').changes).toEqual(['2:normal→tightened', '7:tightened→stopped']);
  });

  it('lets lots decided while discontinued change nothing until inspection is resumed, then resumes on tightened', () => {
    const { state } = run('rrrrr', disabled, tightened);
    const meanwhile = nextSwitchingState(state, lot(acOnePlan('tightened'), 0), disabled);
    expect(meanwhile).toMatchObject({ state, change: null });
    expect(meanwhile.explanation).toMatch(/while acceptance is discontinued/);
    const resumed = resumeAfterDiscontinuation(state);
    expect(resumed).toEqual(initialSwitchingState('tightened'));
    expect(run('a', disabled, resumed).state.consecutiveAccepted).toBe(1);
    expect(() => resumeAfterDiscontinuation(resumed)).toThrow(/not discontinued/);
  });
});

describe('switching score and normal → reduced', () => {
  it('adds 2 per accepted lot when Ac is 0 or 1, and switches at 30 when reduced inspection is enabled', () => {
    const { outcomes, changes, state } = run('a'.repeat(15), enabled);
    expect(outcomes.slice(0, 14).map((o) => o.state.switchingScore)).toEqual([2, 4, 6, 8, 10, 12, 14, 16, 18, 20, 22, 24, 26, 28]);
    expect(changes).toEqual(['15:normal→reduced']);
    expect(state).toEqual(initialSwitchingState('reduced'));
  });

  it('stays on normal with the score past 30 while reduced inspection is not enabled, and switches once it is', () => {
    const { state, changes, outcomes } = run('a'.repeat(16), disabled);
    expect(changes).toEqual([]);
    expect(state.switchingScore).toBe(32);
    expect(outcomes.at(-1)?.explanation).toMatch(/not enabled/);
    expect(run('a', enabled, state).changes).toEqual(['1:normal→reduced']);
  });

  it('resets the score to 0 on a lot not accepted when Ac is 0 or 1', () => {
    expect(run('aaaar').state.switchingScore).toBe(0);
  });

  it('adds 3 when Ac ≥ 2 and the lot would have been accepted one AQL step tighter, else resets to 0', () => {
    let state = initialSwitchingState();
    const scores: number[] = [];
    for (const defectives of [0, 5, 2, 6, 3]) {
      state = nextSwitchingState(state, lot(acSevenPlan, defectives), enabled).state;
      scores.push(state.switchingScore);
    }
    // 6 defectives: accepted at Ac 7, but not at the tighter Ac 5.
    expect(scores).toEqual([3, 6, 9, 0, 3]);
    expect(state.recentResults).toEqual([true, true, true, true, true]);
  });

  it('reaches reduced after 10 lots with Ac ≥ 2 that pass one step tighter', () => {
    let outcome: SwitchingOutcome = { state: initialSwitchingState(), change: null, explanation: '' };
    for (let i = 0; i < 10; i++) outcome = nextSwitchingState(outcome.state, lot(acSevenPlan, 1), enabled);
    expect(outcome.change).toEqual({ from: 'normal', to: 'reduced' });
  });

  it('holds off reduced inspection while production is irregular', () => {
    const { state } = run('a'.repeat(14), enabled);
    const irregular = nextSwitchingState(state, lot(acOnePlan('normal'), 0, true), enabled);
    expect(irregular.change).toBeNull();
    expect(irregular.explanation).toMatch(/irregular/);
    expect(nextSwitchingState(irregular.state, lot(acOnePlan('normal'), 0), enabled).change).toEqual({ from: 'normal', to: 'reduced' });
  });
});

describe('reduced → normal', () => {
  const reduced = initialSwitchingState('reduced');

  it('returns to normal when a lot is not accepted', () => {
    const { changes, state } = run('aaar', enabled, reduced);
    expect(changes).toEqual(['4:reduced→normal']);
    expect(state).toEqual(initialSwitchingState('normal'));
  });

  it('returns to normal when production becomes irregular, even on an accepted lot', () => {
    const outcome = nextSwitchingState(reduced, lot(acOnePlan('reduced'), 0, true), enabled);
    expect(outcome.change).toEqual({ from: 'reduced', to: 'normal' });
    expect(outcome.explanation).toMatch(/irregular/);
  });

  it('returns to normal when a lot is accepted with its sample between Ac and Re', () => {
    // Lot of 2000 at level II, AQL 1.0 on reduced inspection: K, n = 50, Ac 1 / Re 4 (Z1.4 Table II-C).
    const gapPlan = planFor({ lotSize: 2000, level: 'II', aql: 1.0, severity: 'reduced' });
    expect(nextSwitchingState(reduced, lot(gapPlan, 1), enabled).change).toBeNull();
    const outcome = nextSwitchingState(reduced, lot(gapPlan, 3), enabled);
    expect(outcome.change).toEqual({ from: 'reduced', to: 'normal' });
    expect(outcome.state).toEqual(initialSwitchingState('normal'));
    expect(outcome.explanation).toBe(
      'lot accepted on reduced inspection; its 3 defectives lie between Ac 1 and Re 4, so normal inspection resumes (ANSI/ASQ Z1.4)',
    );
  });

  it('stays on reduced while lots are accepted', () => {
    expect(run('aaaaaaaaaa', enabled, reduced).state).toMatchObject({ severity: 'reduced', consecutiveAccepted: 10 });
  });
});

describe('checks on what is fed in', () => {
  it('refuses an acceptance of a sample that reaches Re', () => {
    expect(() => nextSwitchingState(initialSwitchingState(), { plan: acOnePlan('normal'), defectives: 2, accepted: true }, enabled)).toThrow(
      'a lot with 2 defectives at Re 2 is not accepted, but the result says accepted',
    );
  });

  it('counts a lot refused with its sample within Ac as not accepted, and resets the score', () => {
    const { state } = run('aaa', enabled);
    const refused = nextSwitchingState(state, { plan: acOnePlan('normal'), defectives: 0, accepted: false }, enabled);
    expect(refused.state).toMatchObject({ switchingScore: 0, recentResults: [true, true, true, false], consecutiveAccepted: 0 });
  });

  it('refuses a malformed stored state', () => {
    const broken = { ...initialSwitchingState(), switchingScore: -1 };
    expect(() => nextSwitchingState(broken, lot(acOnePlan('normal'), 0), enabled)).toThrow(/invalid switching state: switchingScore/);
  });

  it('accepts a plan read back from storage as plain strings and numbers', () => {
    const stored = { planLetter: 'H', sampleSize: 50, accept: 1, reject: 2, severity: 'normal', aql: 1, level: 'II' };
    expect(nextSwitchingState(initialSwitchingState(), { plan: stored, defectives: 1, accepted: true }, enabled).state.switchingScore).toBe(2);
  });
});
