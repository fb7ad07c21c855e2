// Where an NCR stands, from its pieces: what is still to be done before it can be closed.
import type { NcrDecision } from '../schemas/nonconformance';

export type PieceProgress = { serial: string; decision: NcrDecision | null; reworkReleased: boolean; shipped: boolean };

const serialsOf = (pieces: PieceProgress[], most = 8) =>
  pieces.length <= most
    ? pieces.map((p) => p.serial).join(', ')
    : `${pieces
        .slice(0, most)
        .map((p) => p.serial)
        .join(', ')} and ${pieces.length - most} more`;
const count = (n: number) => `${n} piece${n === 1 ? '' : 's'}`;

/** A piece is settled once what its disposition orders is done: scrapped or used as is at once,
 * shipped back once on a return, reworked once released. */
export const pieceSettled = (p: PieceProgress) =>
  p.decision === 'scrap' || p.decision === 'use-as-is' || (p.decision === 'return-to-vendor' && p.shipped) || (p.decision === 'rework' && p.reworkReleased);

/** A piece may (still) be dispositioned: it has none, or it waits in rework and is dispositioned otherwise. */
export const pieceAwaitsDisposition = (p: PieceProgress, decision?: NcrDecision) =>
  p.decision === null || (p.decision === 'rework' && !p.reworkReleased && decision !== undefined && decision !== 'rework');

/** What stands between the NCR and its closing, in words; empty when it may be closed. */
export function ncrOpenItems(pieces: PieceProgress[]): string[] {
  const undecided = pieces.filter((p) => p.decision === null);
  const toShip = pieces.filter((p) => p.decision === 'return-to-vendor' && !p.shipped);
  const inRework = pieces.filter((p) => p.decision === 'rework' && !p.reworkReleased);
  return [
    undecided.length ? `${count(undecided.length)} ${undecided.length === 1 ? 'awaits' : 'await'} a disposition: ${serialsOf(undecided)}` : '',
    toShip.length ? `${count(toShip.length)} to ship back to the vendor: ${serialsOf(toShip)}` : '',
    inRework.length ? `${count(inRework.length)} in rework, to be released or dispositioned again: ${serialsOf(inRework)}` : '',
  ].filter(Boolean);
}

/** The status the pieces give an NCR that is not closed. */
export const ncrStatusOf = (pieces: PieceProgress[]): 'open' | 'dispositioned' => (pieces.every((p) => p.decision !== null) ? 'dispositioned' : 'open');
