import type { CsvColumn } from '../../http/csv';
import type { ScorecardFigures, SupplierScorecardView } from '../../../shared/schemas/supplierPerformance';

type ScorecardCsvRow = { part: string; figures: ScorecardFigures; phase: string };

/** The scorecard as CSV rows: one per part, then the supplier's total. */
export function scorecardCsvRows(view: SupplierScorecardView): ScorecardCsvRow[] {
  return [
    ...view.parts.map((p) => ({ part: p.part.number, figures: p.figures, phase: p.switching?.phase ?? '' })),
    ...(view.part ? [] : [{ part: 'all parts', figures: view.figures, phase: '' }]),
  ];
}

export const scorecardCsvColumns = (view: SupplierScorecardView): CsvColumn<ScorecardCsvRow>[] => [
  { header: 'supplier', value: () => view.supplier.name },
  { header: 'part', value: (r) => r.part },
  { header: 'period_from', value: () => view.period.from },
  { header: 'period_to', value: () => view.period.to },
  { header: 'lots_received', value: (r) => r.figures.lotsReceived },
  { header: 'lots_decided', value: (r) => r.figures.lotsDecided },
  { header: 'lots_accepted', value: (r) => r.figures.lotsAccepted },
  { header: 'lot_acceptance_rate', value: (r) => r.figures.acceptanceRate },
  { header: 'pieces_inspected', value: (r) => r.figures.piecesInspected },
  { header: 'pieces_nonconforming', value: (r) => r.figures.piecesNonconforming },
  { header: 'nonconforming_ppm', value: (r) => r.figures.ppm },
  { header: 'lots_with_due_date', value: (r) => r.figures.lotsWithDueDate },
  { header: 'lots_on_time', value: (r) => r.figures.lotsOnTime },
  { header: 'on_time_rate', value: (r) => r.figures.onTimeRate },
  { header: 'open_ncrs', value: (r) => r.figures.ncrs.open },
  { header: 'oldest_open_ncr_days', value: (r) => r.figures.ncrs.oldestOpenDays },
  { header: 'ncrs_opened_in_period', value: (r) => r.figures.ncrs.openedInPeriod },
  { header: 'open_corrective_actions', value: (r) => r.figures.correctiveActions.open },
  { header: 'oldest_open_corrective_action_days', value: (r) => r.figures.correctiveActions.oldestOpenDays },
  { header: 'overdue_corrective_actions', value: (r) => r.figures.correctiveActions.overdue },
  { header: 'switching', value: (r) => r.phase },
];
