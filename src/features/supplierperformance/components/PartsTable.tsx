// The scorecard per part the supplier is ordered for; choosing a row shows its charts.
import type { ScorecardPartRow } from '@shared/schemas/supplierPerformance';
import { PhaseBadge } from '@/components/PhaseBadge';
import { PartLabel } from '@/components/PartLabel';
import { days, percent, whole } from './format';

type Props = { parts: ScorecardPartRow[]; chosen?: number; onChoose: (partId: number) => void };

export function PartsTable({ parts, chosen, onChoose }: Props) {
  if (parts.length === 0) return <p className="text-sm text-ink-muted">No part has been ordered from this supplier.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[46rem] text-sm">
        <thead className="text-left text-xs text-ink-muted">
          <tr>
            <th className="px-2 py-1 font-medium">Part</th>
            <th className="px-2 py-1 text-right font-medium">Lots</th>
            <th className="px-2 py-1 text-right font-medium">Accepted</th>
            <th className="px-2 py-1 text-right font-medium">Nonconforming</th>
            <th className="px-2 py-1 text-right font-medium">On time</th>
            <th className="px-2 py-1 text-right font-medium">Open NCRs</th>
            <th className="px-2 py-1 text-right font-medium">Open CARs</th>
            <th className="px-2 py-1 font-medium">Inspection now</th>
          </tr>
        </thead>
        <tbody>
          {parts.map(({ part, figures: f, switching }) => (
            <tr
              key={part.id}
              aria-selected={part.id === chosen}
              className={`cursor-pointer border-t border-paper-line/70 hover:bg-paper-sunk ${part.id === chosen ? 'bg-paper-sunk' : ''}`}
              onClick={() => onChoose(part.id)}
            >
              <td className="px-2 py-1.5">
                {/* The row takes the click; the button gives it to the keyboard too. */}
                <button type="button" className="text-left">
                  {/* Named by what it shows, its visible text included (speech input names it so). */}
                  <span className="sr-only">Charts of </span>
                  <PartLabel number={part.number} description={part.description} />
                </button>
              </td>
              <td className="px-2 py-1.5 text-right tabular-nums">{whole(f.lotsReceived)}</td>
              <td className="px-2 py-1.5 text-right tabular-nums">{percent(f.acceptanceRate)}</td>
              <td className="px-2 py-1.5 text-right tabular-nums">{f.ppm === null ? '—' : `${whole(f.ppm)} ppm`}</td>
              <td className="px-2 py-1.5 text-right tabular-nums">{percent(f.onTimeRate)}</td>
              <td className="px-2 py-1.5 text-right tabular-nums">{f.ncrs.open ? `${f.ncrs.open} (oldest ${days(f.ncrs.oldestOpenDays)})` : '0'}</td>
              <td className="px-2 py-1.5 text-right tabular-nums">
                {f.correctiveActions.open ? `${f.correctiveActions.open}${f.correctiveActions.overdue ? `, ${f.correctiveActions.overdue} overdue` : ''}` : '0'}
              </td>
              <td className="px-2 py-1.5">
                {switching ? <PhaseBadge phase={switching.phase} /> : <span className="text-xs text-ink-faint">No lot decided</span>}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
