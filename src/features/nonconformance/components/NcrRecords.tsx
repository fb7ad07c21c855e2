import { Link } from 'react-router-dom';
import { NCR_DECISION_LABELS, REMEDY_LABELS, type NcrView } from '@shared/schemas/nonconformance';
import { lotName } from '@shared/schemas/stock';
import { Panel } from '@/components/Details';
import { formatDate, formatDateTime, plural } from '@shared/format';

const serialList = (serials: string[]) => (serials.length <= 6 ? serials.join(', ') : `${serials.slice(0, 6).join(', ')} and ${serials.length - 6} more`);

/** The signed acts, the shipments back and the replacements received, in order. */
export function NcrRecords({ ncr }: { ncr: NcrView }) {
  return (
    <div className="grid gap-3 lg:grid-cols-2">
      <Panel title="Signed dispositions">
        {ncr.dispositions.length === 0 && <p className="text-sm text-ink-faint">None yet.</p>}
        <ol className="space-y-2 text-sm">
          {ncr.dispositions.map((d) => (
            <li key={d.id} className="border-l-2 border-frame-soft pl-2">
              <p>
                <span className="font-medium">{NCR_DECISION_LABELS[d.decision]}</span> · {plural(d.serials.length, 'piece')} · signed by {d.signer},{' '}
                {formatDateTime(d.signedAt)}
              </p>
              <p className="font-mono text-xs text-ink-muted">{serialList(d.serials)}</p>
              {d.deviation && (
                <p className="text-xs">
                  Deviation {d.deviation.number}: {d.justification}
                </p>
              )}
              {d.note && <p className="text-xs text-ink-muted">{d.note}</p>}
              <p className="text-2xs text-ink-faint italic">{d.meaning}</p>
            </li>
          ))}
        </ol>
      </Panel>
      <Panel title="Returns and replacements">
        {ncr.returns.length === 0 && ncr.replacements.length === 0 && <p className="text-sm text-ink-faint">Nothing shipped back yet.</p>}
        <ul className="space-y-2 text-sm">
          {ncr.returns.map((r) => (
            <li key={r.id}>
              <p>
                <span className="font-mono">RMA {r.rmaNumber}</span> · {plural(r.serials.length, 'piece')} shipped {r.shipDate} by {r.carrier}
                {r.tracking && <span className="font-mono text-xs"> ({r.tracking})</span>} · for {REMEDY_LABELS[r.remedy].toLowerCase()}
                {r.creditAmount !== null && ` of ${r.creditAmount.toFixed(2)} ${r.currency ?? ''}`}
              </p>
              <p className="font-mono text-xs text-ink-muted">{serialList(r.serials)}</p>
            </li>
          ))}
          {ncr.replacements.map((s) => (
            <li key={s.shipmentId}>
              Replacement received {formatDate(s.receivedAt)} on PO {s.poNumber}, packing slip <span className="font-mono">{s.packingSlip}</span>:{' '}
              {s.lots.map((l, i) => (
                <span key={l.id}>
                  {i > 0 && ', '}
                  <Link to={`/lots/${l.id}`} className="font-mono">
                    {lotName(l.id)}
                  </Link>{' '}
                  ({l.quantity})
                </span>
              ))}
            </li>
          ))}
        </ul>
      </Panel>
    </div>
  );
}
