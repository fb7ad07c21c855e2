// What became of the pieces of a lot, a PO line or a PO, the same wherever it is shown. The three
// figures overlap on purpose: a failed piece sent back counts as nonconforming and returned, a failed
// piece used as is under a deviation as accepted and nonconforming.
import type { ColumnHelper } from '@tanstack/react-table';
import type { PieceQuantities } from '@shared/schemas/stock';

export const PIECE_OUTCOMES: { key: keyof PieceQuantities; label: string; meaning: string; tone: string }[] = [
  { key: 'accepted', label: 'Accepted', meaning: 'released to stock (in a bin, or issued since)', tone: 'text-state-pass' },
  { key: 'nonconforming', label: 'Nonconforming', meaning: 'current verdict fail, wherever the piece is', tone: 'text-state-fail' },
  { key: 'returned', label: 'Returned', meaning: 'in return-to-vendor', tone: 'text-state-fail' },
];

/** One outcome's figure: coloured when there is something to see, faint at zero. */
export function OutcomeFigure({ outcome, value }: { outcome: (typeof PIECE_OUTCOMES)[number]; value: number }) {
  return (
    <span className={`tabular-nums ${value > 0 ? `font-medium ${outcome.tone}` : 'text-ink-faint'}`} title={`${outcome.label}: ${outcome.meaning}`}>
      {value}
    </span>
  );
}

/** The three figures in a line: "12 accepted · 1 nonconforming · 1 returned". */
export function PieceOutcomes({ quantities }: { quantities: PieceQuantities }) {
  return (
    <span className="inline-flex flex-wrap gap-x-3 gap-y-0.5" aria-label="Piece outcomes">
      {PIECE_OUTCOMES.map((outcome) => (
        <span key={outcome.key} className="whitespace-nowrap">
          <OutcomeFigure outcome={outcome} value={quantities[outcome.key]} /> {outcome.label.toLowerCase()}
        </span>
      ))}
    </span>
  );
}

/** The three figures as sortable list columns (the server sorts by the same keys). */
export function outcomeColumns<T extends PieceQuantities>(column: ColumnHelper<T>) {
  return PIECE_OUTCOMES.map((outcome) =>
    column.accessor((row) => row[outcome.key], {
      id: outcome.key,
      header: outcome.label,
      cell: ({ getValue }) => <OutcomeFigure outcome={outcome} value={getValue()} />,
    }),
  );
}

/** A list's totals in words, for its summary line: "12 accepted · 1 nonconforming · 1 returned". */
export const outcomeSummary = (totals: Record<string, number>) => PIECE_OUTCOMES.map((o) => `${totals[o.key] ?? 0} ${o.label.toLowerCase()}`).join(' · ');
