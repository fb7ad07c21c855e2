// The switching sequence replayed. Rules of ISO 2859-1:1999, clause 9 (from memory): 2 of 5 or
// fewer consecutive lots not accepted on normal → tightened (9.3.1); 5 consecutive accepted on
// tightened → normal (9.3.2); 5 lots not accepted while on tightened → acceptance discontinued, and
// inspection resumes on tightened once the supplier has acted (9.4). How a lot sampled on another
// severity than the state in effect at its decision counts is this product's rule (switching.ts).
import { describe, expect, it } from 'vitest';
import { planFor } from './plan';
import { applySwitchingEntry, replaySwitching, type SwitchingEntry } from './sequence';
import { initialSwitchingState } from './switching';
import type { Severity } from './tables';

const settings = { reducedEnabled: false };
// A lot of 400 at level II, AQL 1.0 (Ac 1 / Re 2 on normal and tightened).
const plan = (severity: Severity) => planFor({ lotSize: 400, level: 'II', aql: 1.0, severity });
const accepted = (severity: Severity): SwitchingEntry => ({ kind: 'lot', result: { plan: plan(severity), defectives: 0, accepted: true }, settings });
const rejected = (severity: Severity): SwitchingEntry => ({ kind: 'lot', result: { plan: plan(severity), defectives: 2, accepted: false }, settings });

describe('lots sampled on one severity and decided on another', () => {
  it('decides the third of three lots sampled on normal after the first two switched to tightened', () => {
    const { state, outcomes } = replaySwitching([rejected('normal'), rejected('normal'), accepted('normal')]);
    expect(outcomes.map((o) => o.change)).toEqual([null, { from: 'normal', to: 'tightened' }, null]);
    // The acceptance on the normal plan is recorded but does not start the run of 5 on tightened.
    expect(state).toEqual(initialSwitchingState('tightened'));
    expect(outcomes[2].explanation).toMatch(/accepted on normal inspection while tightened inspection is in effect/);
  });

  it('counts a lot sampled on normal and not accepted while tightened is in effect toward discontinuation', () => {
    const { state } = replaySwitching([rejected('normal'), rejected('normal'), rejected('normal')]);
    expect(state).toMatchObject({ severity: 'tightened', tightenedCount: 1, consecutiveAccepted: 0 });
  });

  it('counts an acceptance on a stricter plan, without growing the switching score', () => {
    // Five accepted on tightened return to normal; a sixth lot, sampled on tightened, is decided after.
    const entries = [rejected('normal'), rejected('normal'), ...Array.from({ length: 6 }, () => accepted('tightened'))];
    const { state, outcomes } = replaySwitching(entries);
    expect(outcomes[6].change).toEqual({ from: 'tightened', to: 'normal' });
    expect(state).toMatchObject({ severity: 'normal', recentResults: [true], consecutiveAccepted: 1, switchingScore: 0 });
  });
});

describe('resumption and overrides', () => {
  const discontinued = replaySwitching([rejected('normal'), rejected('normal'), ...Array.from({ length: 5 }, () => rejected('tightened'))]).state;

  it('lets a lot decided while discontinued change nothing, and resumes on tightened', () => {
    expect(discontinued).toMatchObject({ stopped: true, tightenedCount: 5 });
    expect(applySwitchingEntry(discontinued, accepted('tightened')).state).toEqual(discontinued);
    const resumed = applySwitchingEntry(discontinued, { kind: 'resume' });
    expect(resumed.state).toEqual(initialSwitchingState('tightened'));
    expect(resumed.change).toEqual({ from: 'stopped', to: 'tightened' });
  });

  it('keeps a discontinuation that an override meets', () => {
    const outcome = applySwitchingEntry(discontinued, { kind: 'override', severity: 'normal' });
    expect(outcome.state).toEqual(discontinued);
    expect(outcome.explanation).toMatch(/does not lift a discontinuation/);
  });

  it('puts the state on the overriding severity with fresh counts', () => {
    const { state, outcomes } = replaySwitching([accepted('normal'), accepted('normal'), { kind: 'override', severity: 'tightened' }, accepted('tightened')]);
    expect(outcomes[2].change).toEqual({ from: 'normal', to: 'tightened' });
    expect(state).toMatchObject({ severity: 'tightened', consecutiveAccepted: 1, switchingScore: 0, recentResults: [] });
  });

  it('records a resumption that a recomputed sequence no longer needs, without effect', () => {
    const outcome = applySwitchingEntry(initialSwitchingState('tightened'), { kind: 'resume' });
    expect(outcome).toMatchObject({ state: initialSwitchingState('tightened'), change: null });
  });
});

describe('a superseded result, replayed', () => {
  it('recomputes the state as if the lot had been decided that way', () => {
    const first = [accepted('normal'), rejected('normal'), accepted('normal'), accepted('normal')];
    expect(replaySwitching(first).state.severity).toBe('normal');
    // The first lot's acceptance is superseded by a rejection: 2 of the last 5 not accepted.
    const superseded = [rejected('normal'), ...first.slice(1)];
    const { state, outcomes } = replaySwitching(superseded);
    expect(outcomes[1].change).toEqual({ from: 'normal', to: 'tightened' });
    // The two later acceptances were sampled on normal: they do not count on tightened.
    expect(state).toEqual(initialSwitchingState('tightened'));
  });
});
