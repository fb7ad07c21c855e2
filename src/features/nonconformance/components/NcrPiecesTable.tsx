import { Link } from 'react-router-dom';
import { NCR_DECISION_LABELS, type NcrPieceView } from '@shared/schemas/nonconformance';
import { PIECE_STATE_LABELS, lotName } from '@shared/schemas/stock';
import { ScrollBox } from '@/components/ScrollBox';
import { StateBadge } from '@/components/StateBadge';

type Props = { pieces: NcrPieceView[]; selected: Set<number>; onSelect?(ids: Set<number>): void };

function dispositionText(piece: NcrPieceView) {
  if (!piece.disposition) return <span className="text-state-fail">awaiting</span>;
  const label = NCR_DECISION_LABELS[piece.disposition.decision];
  if (piece.disposition.decision === 'rework') return `${label}${piece.reworkReleased ? ', released' : ', in progress'}`;
  if (piece.disposition.decision === 'return-to-vendor') return piece.rmaNumber ? `${label}, shipped (RMA ${piece.rmaNumber})` : `${label}, to ship`;
  return label;
}

/** The NCR's pieces: where each is, why it failed and what was decided; tick boxes choose pieces for the next act. */
export function NcrPiecesTable({ pieces, selected, onSelect }: Props) {
  const toggle = (id: number) => {
    const next = new Set(selected);
    if (next.has(id)) next.delete(id);
    else next.add(id);
    onSelect?.(next);
  };
  return (
    <ScrollBox label="Pieces of the NCR" className="max-h-[28rem]">
      <table className="w-full min-w-[56rem] text-sm">
        <thead className="sticky top-0 bg-paper-sunk text-left text-xs text-ink-muted">
          <tr>
            {onSelect && (
              <th className="w-8 px-2 py-1.5">
                <input
                  type="checkbox"
                  aria-label="Choose every piece"
                  checked={pieces.length > 0 && selected.size === pieces.length}
                  onChange={(e) => onSelect(new Set(e.target.checked ? pieces.map((p) => p.pieceId) : []))}
                />
              </th>
            )}
            <th className="px-2 py-1.5">Serial</th>
            <th className="px-2 py-1.5">Lot</th>
            <th className="px-2 py-1.5">Where</th>
            <th className="px-2 py-1.5">Why</th>
            <th className="px-2 py-1.5">Disposition</th>
          </tr>
        </thead>
        <tbody>
          {pieces.map((piece) => (
            <tr key={piece.pieceId} className="border-t border-paper-line align-top">
              {onSelect && (
                <td className="px-2 py-1">
                  <input type="checkbox" aria-label={`Choose ${piece.serial}`} checked={selected.has(piece.pieceId)} onChange={() => toggle(piece.pieceId)} />
                </td>
              )}
              <td className="px-2 py-1 font-mono whitespace-nowrap">
                <Link to={`/pieces/${encodeURIComponent(piece.serial)}`}>{piece.serial}</Link>
              </td>
              <td className="px-2 py-1 font-mono text-xs whitespace-nowrap">{lotName(piece.lotId)}</td>
              <td className="px-2 py-1">
                {piece.location ? (
                  <span className="font-mono text-xs">{piece.location.code}</span>
                ) : (
                  <StateBadge state={piece.state} label={PIECE_STATE_LABELS[piece.state]} />
                )}
              </td>
              <td className="px-2 py-1 text-xs text-ink-muted">{piece.reasons.length ? piece.reasons.join('; ') : 'set aside with its lot'}</td>
              <td className="px-2 py-1 text-xs">{dispositionText(piece)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </ScrollBox>
  );
}
