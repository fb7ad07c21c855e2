import { describe, expect, it } from 'vitest';
import { dispositionInputSchema, pieceVerdict, proposeLotVerdict } from './lotVerdict';

// ISO 2859-1:1999 single sampling: accept with d <= Ac, reject with d >= Re (Re = Ac + 1).
const plan = { accept: 1, reject: 2 };
const sample = (verdicts: ('pass' | 'fail' | 'incomplete')[][]) => verdicts.map((v, i) => ({ serial: `S-${i}`, verdicts: v }));

describe('proposeLotVerdict', () => {
  it('accepts with defectives up to Ac and rejects at Re', () => {
    expect(proposeLotVerdict(sample([['pass'], ['fail'], ['pass']]), plan)).toMatchObject({ proposal: 'accept', defectives: 1 });
    expect(proposeLotVerdict(sample([['fail'], ['fail'], ['pass']]), plan)).toMatchObject({ proposal: 'reject', defectives: 2 });
  });

  it('leaves the lot undecided while a sample piece is incomplete or unmeasured', () => {
    const result = proposeLotVerdict(sample([['pass'], ['incomplete'], []]), plan);
    expect(result).toMatchObject({ proposal: 'undecided', incomplete: ['S-1'], unmeasured: ['S-2'], measured: 2 });
    expect(result.explanation).toBe('The sample is not complete: 1 incomplete, 1 not yet measured');
  });

  it('rejects as soon as Re is reached, even with pieces still open', () => {
    expect(proposeLotVerdict(sample([['fail'], ['fail'], []]), plan).proposal).toBe('reject');
  });

  it('counts a piece failing at any one of its wavelengths as one defective', () => {
    expect(pieceVerdict(['pass', 'fail', 'pass'])).toBe('fail');
    expect(
      proposeLotVerdict(
        sample([
          ['pass', 'fail', 'fail'],
          ['pass', 'pass'],
        ]),
        plan,
      ),
    ).toMatchObject({ proposal: 'accept', defectives: 1 });
  });

  it('accepts a result between Ac and Re of a reduced plan, saying that normal inspection resumes', () => {
    // ANSI/ASQ Z1.4 reduced inspection (common practice): Ac exceeded but Re not reached accepts the
    // lot and reinstates normal inspection. Plan K at AQL 1.0, Ac 1 / Re 4 (Z1.4 Table II-C).
    const gap = { accept: 1, reject: 4 };
    const twoFailed = proposeLotVerdict(sample([['fail'], ['fail'], ['pass']]), gap);
    expect(twoFailed).toMatchObject({ proposal: 'accept', defectives: 2 });
    expect(twoFailed.explanation).toBe('2 defectives in the sample, above Ac 1 but below Re 4: the lot is accepted and normal inspection resumes');
    expect(proposeLotVerdict(sample([['fail'], ['fail'], ['fail'], ['fail']]), gap).proposal).toBe('reject');
    expect(proposeLotVerdict(sample([['fail'], ['pass']]), gap).explanation).toBe('1 defective in the sample, within Ac 1');
  });

  it('keeps a result inside the gap undecided while the sample is open, as Re may still be reached', () => {
    expect(proposeLotVerdict(sample([['fail'], ['fail'], []]), { accept: 1, reject: 4 }).proposal).toBe('undecided');
  });

  it('with Ac 0 a single defective rejects', () => {
    expect(proposeLotVerdict(sample([['pass'], ['fail']]), { accept: 0, reject: 1 }).proposal).toBe('reject');
  });
});

describe('dispositionInputSchema', () => {
  const base = { password: 'x', meaningAcknowledged: true as const, expectedDispositionId: null };
  it('requires a deviation of the register and a justification to use a lot as is', () => {
    const result = dispositionInputSchema.safeParse({ ...base, decision: 'use-as-is' });
    expect(result.success).toBe(false);
    expect(result.error?.issues.map((i) => i.path.join('.')).sort()).toEqual(['deviationId', 'justification']);
    expect(
      dispositionInputSchema.safeParse({ ...base, decision: 'use-as-is', deviationId: 42, justification: 'Axis error only affects a test fixture' }).success,
    ).toBe(true);
  });

  it('requires the meaning of the signature to be acknowledged', () => {
    expect(dispositionInputSchema.safeParse({ ...base, decision: 'accept', meaningAcknowledged: false }).success).toBe(false);
  });
});
