import { useState, type FormEvent } from 'react';
import { can } from '@shared/policies';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { LOCATION_KIND_LABELS, LOT_STATE_LABELS, MOVE_REASON_LABELS, PIECE_STATE_LABELS, lotName } from '@shared/schemas/stock';
import { Button } from '@/components/Button';
import { Details, Panel } from '@/components/Details';
import { inputClass } from '@/components/Field';
import { HistoryList } from '@/components/HistoryList';
import { LabelPrint } from '@/components/LabelPrint';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { StateBadge } from '@/components/StateBadge';
import { useSession } from '@/lib/session';
import { usePieceHistory } from '../api';
import { StockTabs } from '../components/StockTabs';
import { fixed, formatDateTime, signedFixed, wordsOf } from '@shared/format';

/** The whole story of one serial: where it came from and every place it has been. */
export function PiecePage() {
  const serial = useParams().serial ?? '';
  const navigate = useNavigate();
  const [text, setText] = useState(serial);
  const history = usePieceHistory(serial);
  const { data: user } = useSession();
  const find = (event: FormEvent) => {
    event.preventDefault();
    if (text.trim()) navigate(`/pieces/${encodeURIComponent(text.trim())}`);
  };
  return (
    <div className="max-w-5xl space-y-3">
      <PageHeader
        title={serial ? `Serial ${serial}` : 'Find a serial'}
        subtitle="From the supplier through the lot and its decision to where the piece is now."
      />
      <StockTabs />
      <form onSubmit={find} role="search" className="flex gap-2">
        <input
          aria-label="Serial number"
          value={text}
          onChange={(e) => setText(e.target.value)}
          placeholder="Serial number, e.g. QW-0007"
          className={`${inputClass} w-72 font-mono`}
        />
        <Button type="submit" look="secondary">
          Find
        </Button>
      </form>
      {history.error && <Notice tone="error">{history.error.message}</Notice>}
      {history.data?.data.map((piece) => (
        <div key={piece.id} className="space-y-3">
          {history.data.total > 1 && <h2 className="pt-2">{piece.part.number}</h2>}
          {piece.releasedAsIs && (
            <Notice tone="caution" title={`Failed inspection: in use as is under deviation ${piece.releasedAsIs.deviationNumber}`}>
              Released by the lot's signed use-as-is decision ({piece.releasedAsIs.signedBy ?? 'signer unknown'}, {formatDateTime(piece.releasedAsIs.signedAt)})
              {piece.releasedAsIs.justification && <>: “{piece.releasedAsIs.justification}”</>}
            </Notice>
          )}
          <Panel title="Piece" actions={<StateBadge state={piece.state} label={PIECE_STATE_LABELS[piece.state]} />}>
            <Details
              columns={4}
              items={[
                [
                  'Part',
                  <Link key="p" to={`/purchasing/parts/${piece.part.id}`}>
                    {piece.part.number}
                  </Link>,
                ],
                ['Supplier', piece.supplier.name],
                [
                  'PO / line',
                  <span key="po" className="font-mono">
                    {piece.purchaseOrder.number} / {piece.purchaseOrder.lineNumber}
                  </span>,
                ],
                [
                  'Lot',
                  <Link key="l" to={`/lots/${piece.lot.id}`} className="font-mono">
                    {lotName(piece.lot.id)}
                  </Link>,
                ],
                [
                  'Supplier lot',
                  <span key="sl" className="font-mono">
                    {piece.lot.supplierLot}
                  </span>,
                ],
                [
                  'Lot state',
                  <Link key="ls" to={`/inspection/lots/${piece.lot.id}`} title="Readings, verdicts and the lot's decision">
                    {LOT_STATE_LABELS[piece.lot.state]}
                  </Link>,
                ],
                ['Now at', piece.location ? `${piece.location.code} (${LOCATION_KIND_LABELS[piece.location.kind].toLowerCase()})` : 'issued out of stores'],
              ]}
            />
            {can(user, 'labels.print') && (
              <div className="mt-3 border-t border-paper-line pt-3">
                <LabelPrint name={`Label of ${piece.serial}`} path={`/labels/pieces/${piece.id}`} />
              </div>
            )}
          </Panel>
          <div className="grid gap-3 lg:grid-cols-3">
            <div className="lg:col-span-2">
              <Panel title="Moves">
                <ol className="space-y-1.5 text-sm">
                  {piece.moves.map((m) => (
                    <li key={m.id} className="grid grid-cols-[11rem_1fr] gap-2">
                      <span className="text-xs whitespace-nowrap text-ink-muted">{formatDateTime(m.at)}</span>
                      <span>
                        <span className="font-medium">{MOVE_REASON_LABELS[m.reason]}</span>{' '}
                        <span className="font-mono text-xs">
                          {m.from ?? (m.reason === 'receipt' ? 'supplier' : 'work order')} → {m.to ?? `work order ${m.workOrder}`}
                        </span>
                        {m.who && <span className="text-xs text-ink-muted"> · {m.who}</span>}
                        {m.note && <span className="block text-xs text-ink-muted">{m.note}</span>}
                      </span>
                    </li>
                  ))}
                </ol>
              </Panel>
            </div>
            <Panel title="Lot decisions">
              <HistoryList entries={piece.history} />
            </Panel>
          </div>
          <Panel title="Readings and documents">
            {piece.readings.length === 0 && <p className="text-sm text-ink-muted">Not measured (not in the sample, or not yet inspected).</p>}
            <ul className="space-y-1 text-sm" aria-label="Readings">
              {piece.readings.map((r, i) => (
                <li key={i} className={r.current ? '' : 'text-ink-faint line-through'}>
                  <span className="font-mono">{r.wavelengthNm} nm</span> · retardance {fixed(r.retardanceWaves, 4)} λ, error{' '}
                  {signedFixed(r.retardanceErrorWaves, 4)} λ, axis {signedFixed(r.axisErrorDeg, 2)}° · <span className="font-medium">{wordsOf(r.verdict)}</span>
                  {r.reasons.length > 0 && ` (${r.reasons.join('; ')})`}
                  <span className="block text-xs text-ink-muted">
                    {r.file} on {r.instrument}, {formatDateTime(r.measuredAt)}
                    {r.current ? '' : ' — superseded'}
                  </span>
                </li>
              ))}
            </ul>
            {piece.documents.length > 0 && (
              <p className="mt-2 text-sm">
                {piece.documents.map((d) => (
                  <a key={d.number} href={`/api/documents/${encodeURIComponent(d.number)}.pdf`} target="_blank" rel="noreferrer" className="mr-3 font-mono">
                    {d.number}
                    {d.revokedAt ? ' (revoked)' : ''}
                  </a>
                ))}
              </p>
            )}
          </Panel>
        </div>
      ))}
    </div>
  );
}
