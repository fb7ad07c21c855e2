// What an NCR opened by a lot decision says: its pieces' failing reasons and its description and
// containment, the same whether the decision opens it or a migration opens it for an earlier one.
import type { NcrOrigin } from '../schemas/nonconformance';

export type ResultReasons = { wavelengthNm: number; verdict: string; reasons: readonly string[] };

/** A piece's failing reasons from its current results; with several failing wavelengths each reason
 * names its wavelength, as the lot's evaluation does. */
export function failingReasons(results: readonly ResultReasons[]): string[] {
  const failing = results.filter((r) => r.verdict === 'fail');
  return [...new Set(failing.flatMap((r) => r.reasons.map((reason) => (failing.length > 1 ? `${reason} at ${r.wavelengthNm} nm` : reason))))];
}

export type LotNcrFacts = {
  origin: Exclude<NcrOrigin, 'found-later'>;
  lotName: string;
  partNumber: string;
  supplierName: string;
  supplierLot: string;
  poNumber: string;
  /** The lot verdict's explanation when the decision was signed. */
  explanation: string;
  pieces: number;
  failing: number;
  /** Where the pieces wait: the location code. */
  heldAt: string;
};

const count = (n: number, what: string) => `${n} ${what}${n === 1 ? '' : 's'}`;

export function describeLotNcr(facts: LotNcrFacts): { description: string; containment: string } {
  const lot = `Lot ${facts.lotName} of ${facts.partNumber} from ${facts.supplierName} (supplier lot ${facts.supplierLot}, PO ${facts.poNumber})`;
  switch (facts.origin) {
    case 'rejection':
      return {
        description: `${lot} was rejected: ${facts.explanation}. ${count(facts.failing, 'piece')} failed inspection; the whole lot (${count(facts.pieces, 'piece')}) is nonconforming material.`,
        containment: `The lot's ${count(facts.pieces, 'piece')} are held in return-to-vendor at ${facts.heldAt}.`,
      };
    case 'sort':
      return {
        description: `${lot} was sorted 100 %: ${count(facts.pieces, 'piece')} measured nonconforming.`,
        containment: `The nonconforming pieces are held in return-to-vendor at ${facts.heldAt}; the conforming ones were released.`,
      };
    case 'accepted-lot':
      return {
        description: `${lot} was accepted under the sampling plan (${facts.explanation}), but ${count(facts.pieces, 'sample piece')} failed inspection.`,
        containment: `The failed pieces are held in material review at ${facts.heldAt}; the rest of the lot was released.`,
      };
  }
}
