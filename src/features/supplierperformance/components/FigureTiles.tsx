// The scorecard's headline figures, each with what it counts.
import type { ScorecardFigures } from '@shared/schemas/supplierPerformance';
import { days, percent, whole } from './format';

type Tile = { label: string; value: string; detail: string; warn?: boolean };

function tilesOf(f: ScorecardFigures): Tile[] {
  return [
    { label: 'Lots received', value: whole(f.lotsReceived), detail: `${f.lotsDecided} decided` },
    {
      label: 'Lot acceptance',
      value: percent(f.acceptanceRate),
      detail: `${f.lotsAccepted} of ${f.lotsDecided} decided lots accepted`,
      warn: f.acceptanceRate !== null && f.acceptanceRate < 0.9,
    },
    {
      label: 'Nonconforming',
      value: f.ppm === null ? '—' : `${whole(f.ppm)} ppm`,
      detail: `${f.piecesNonconforming} of ${whole(f.piecesInspected)} pieces inspected`,
      warn: (f.ppm ?? 0) > 0,
    },
    {
      label: 'On time',
      value: percent(f.onTimeRate),
      detail: `${f.lotsOnTime} of ${f.lotsWithDueDate} lots with a due date`,
      warn: f.onTimeRate !== null && f.onTimeRate < 0.9,
    },
    {
      label: 'Open NCRs',
      value: whole(f.ncrs.open),
      detail: f.ncrs.open ? `oldest ${days(f.ncrs.oldestOpenDays)}, mean ${days(f.ncrs.meanOpenDays)}` : `${f.ncrs.openedInPeriod} opened in the period`,
      warn: f.ncrs.open > 0,
    },
    {
      label: 'Open corrective actions',
      value: whole(f.correctiveActions.open),
      detail: f.correctiveActions.open
        ? `${f.correctiveActions.overdue} overdue, oldest ${days(f.correctiveActions.oldestOpenDays)}`
        : `${f.correctiveActions.requestedInPeriod} requested in the period`,
      warn: f.correctiveActions.overdue > 0,
    },
  ];
}

export function FigureTiles({ figures }: { figures: ScorecardFigures }) {
  return (
    <dl className="grid grid-cols-[repeat(auto-fit,minmax(9.5rem,1fr))] gap-2" aria-label="Scorecard">
      {tilesOf(figures).map((tile) => (
        <div key={tile.label} className={`rounded border bg-paper-card px-3 py-2 ${tile.warn ? 'border-state-quarantine/50' : 'border-paper-line'}`}>
          <dt className="text-2xs font-medium tracking-wide text-ink-faint uppercase">{tile.label}</dt>
          <dd className="text-xl font-semibold tabular-nums">{tile.value}</dd>
          <dd className="text-2xs text-ink-muted">{tile.detail}</dd>
        </div>
      ))}
    </dl>
  );
}
