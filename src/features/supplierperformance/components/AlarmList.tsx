// The drift alarms raised in the period: which part and characteristic, which lot took the EWMA
// past its limit, and whether any piece of that lot was failing yet.
import { CHARACTERISTIC_LABELS, type DriftAlarmView } from '@shared/schemas/supplierPerformance';
import { signedError } from './format';
import { formatDate, plural } from '@shared/format';

export function AlarmList({ alarms, showPart = true }: { alarms: DriftAlarmView[]; showPart?: boolean }) {
  if (alarms.length === 0) return <p className="text-sm text-ink-muted">No drift alarm in the period.</p>;
  return (
    <ul className="divide-y divide-paper-line/70" aria-label="Drift alarms">
      {alarms.map((a) => {
        const { name } = CHARACTERISTIC_LABELS[a.characteristic];
        return (
          <li key={a.id} className="flex flex-wrap items-baseline gap-x-3 gap-y-0.5 py-1.5 text-sm">
            <span className="text-xs text-ink-muted tabular-nums">{formatDate(a.raisedAt)}</span>
            {showPart && <span className="font-mono">{a.part.number}</span>}
            <span>
              {name} drifting {a.direction === 'high' ? 'up' : 'down'}: EWMA {signedError(a.characteristic, a.ewma, { finer: 1 })} past{' '}
              {signedError(a.characteristic, a.limit, { finer: 1 })} with lot <span className="font-medium">{a.lot.name}</span>{' '}
              <span className="text-ink-muted">(supplier lot {a.lot.supplierLot})</span>
            </span>
            <span className={`text-xs ${a.failingPieces ? 'text-state-fail' : 'text-state-pass'}`}>
              {a.failingPieces ? `${plural(a.failingPieces, 'piece')} already failing` : 'before any piece failed'}
            </span>
          </li>
        );
      })}
    </ul>
  );
}
