// From per-piece results to the proposed lot verdict: the defectives in the sample against the
// plan's Ac/Re (ISO 2859-1 / ANSI/ASQ Z1.4 single sampling). A piece measured at several
// wavelengths (an achromatic part) is defective when any of its wavelengths fails; a sample piece
// without a usable result keeps the lot undecided.
import { z } from 'zod';
import { plural } from '../format';

export type PieceVerdict = 'pass' | 'fail' | 'incomplete';

export type SamplePieceOutcome = {
  serial: string;
  /** Verdicts of the piece's current results, one per measured wavelength; empty when unmeasured. */
  verdicts: PieceVerdict[];
};

export type LotVerdict = {
  measured: number;
  defectives: number;
  incomplete: string[];
  unmeasured: string[];
  proposal: 'accept' | 'reject' | 'undecided';
  explanation: string;
};

export function pieceVerdict(verdicts: PieceVerdict[]): PieceVerdict | 'unmeasured' {
  if (verdicts.length === 0) return 'unmeasured';
  if (verdicts.includes('fail')) return 'fail';
  if (verdicts.includes('incomplete')) return 'incomplete';
  return 'pass';
}

export function proposeLotVerdict(sample: SamplePieceOutcome[], plan: { accept: number; reject: number }): LotVerdict {
  const byPiece = sample.map((p) => ({ serial: p.serial, verdict: pieceVerdict(p.verdicts) }));
  const defectives = byPiece.filter((p) => p.verdict === 'fail').length;
  const incomplete = byPiece.filter((p) => p.verdict === 'incomplete').map((p) => p.serial);
  const unmeasured = byPiece.filter((p) => p.verdict === 'unmeasured').map((p) => p.serial);
  const measured = byPiece.length - unmeasured.length;
  const base = { measured, defectives, incomplete, unmeasured };
  // Reaching Re rejects the lot even before the rest of the sample is measured.
  if (defectives >= plan.reject) {
    return { ...base, proposal: 'reject', explanation: `${plural(defectives, 'defective')} in the sample reach Re ${plan.reject}` };
  }
  if (incomplete.length || unmeasured.length) {
    const open = [incomplete.length && `${incomplete.length} incomplete`, unmeasured.length && `${unmeasured.length} not yet measured`]
      .filter(Boolean)
      .join(', ');
    return { ...base, proposal: 'undecided', explanation: `The sample is not complete: ${open}` };
  }
  if (defectives <= plan.accept) {
    return { ...base, proposal: 'accept', explanation: `${plural(defectives, 'defective')} in the sample, within Ac ${plan.accept}` };
  }
  // Only reduced plans (ANSI/ASQ Z1.4) leave a gap between Ac and Re: a result inside it accepts the
  // lot, and the switching rules then return to normal inspection.
  return {
    ...base,
    proposal: 'accept',
    explanation: `${plural(defectives, 'defective')} in the sample, above Ac ${plan.accept} but below Re ${plan.reject}: the lot is accepted and normal inspection resumes`,
  };
}

// A sort takes the place of a plain reject: the lot reopens for a 100 % measurement and each piece
// then goes by its own verdict (conforming to stock, nonconforming back to the vendor).
export const DISPOSITIONS = ['accept', 'reject', 'sort', 'use-as-is'] as const;
export type Disposition = (typeof DISPOSITIONS)[number];

/** What a signature means, shown before signing and stored with it. */
export const SIGNATURE_MEANINGS: Record<Disposition, string> = {
  accept: 'I approve this lot for use: the sample met the ordered specification under the applied sampling plan.',
  reject: 'I reject this lot as nonconforming; it is to be returned to the supplier.',
  sort: 'I reject this lot as sampled and order a 100 % sort: every remaining piece is to be measured; the conforming pieces are released for use, the nonconforming ones returned to the supplier.',
  'use-as-is': 'I release this nonconforming lot for use as is under the deviation stated, for the reason given.',
};

export const DISPOSITION_LABELS: Record<Disposition, string> = {
  accept: 'Accept',
  reject: 'Reject to vendor',
  sort: 'Sort 100 %',
  'use-as-is': 'Use as is (deviation)',
};

export const dispositionInputSchema = z
  .object({
    decision: z.enum(DISPOSITIONS),
    password: z.string().min(1, 'Re-enter your password to sign'),
    meaningAcknowledged: z.literal(true, { error: 'Confirm the meaning of your signature' }),
    // The register entry (a current deviation of the lot's supplier and part) a use as is goes under.
    deviationId: z.number().int().positive().max(2_147_483_647).optional(),
    justification: z.string().trim().max(2000).optional(),
    // The lot's version the signer looked at: a decision taken meanwhile by someone else wins.
    expectedDispositionId: z.number().int().nullable(),
  })
  .superRefine((value, ctx) => {
    if (value.decision !== 'use-as-is') return;
    if (!value.deviationId) ctx.addIssue({ code: 'custom', path: ['deviationId'], message: 'Choose the deviation the lot is used under' });
    if (!value.justification || value.justification.length < 10)
      ctx.addIssue({ code: 'custom', path: ['justification'], message: 'State the justification (10 characters or more)' });
  });
export type DispositionInput = z.infer<typeof dispositionInputSchema>;
