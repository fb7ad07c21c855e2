import { Link, useParams, useSearchParams } from 'react-router-dom';
import { FileText } from 'lucide-react';
import { can } from '@shared/policies';
import { codeLetterText } from '@shared/sampling/plan';
import { LOT_LABEL_KIND_LABELS, type LotLabelKind } from '@shared/schemas/labels';
import { ATTACHMENT_KIND_LABELS } from '@shared/schemas/receiving';
import { LOT_STATE_LABELS, PIECE_STATE_LABELS, RELEASABLE_LOT_STATES, lotName, type PieceState } from '@shared/schemas/stock';
import { Details, Panel } from '@/components/Details';
import { HistoryList } from '@/components/HistoryList';
import { LabelPrint } from '@/components/LabelPrint';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { PieceOutcomes } from '@/components/PieceOutcomes';
import { SpecSummary } from '@/components/SpecSummary';
import { StateBadge } from '@/components/StateBadge';
import { useSession } from '@/lib/session';
import { useLot } from '../api';
import { LotPieces } from '../components/LotPieces';
import { formatDateTime } from '@shared/format';

const kilobytes = (bytes: number) => (bytes < 1024 * 1024 ? `${Math.max(1, Math.round(bytes / 1024))} kB` : `${(bytes / 1024 / 1024).toFixed(1)} MB`);

export function LotPage() {
  const lotId = Number(useParams().lotId);
  const [params] = useSearchParams();
  const lot = useLot(lotId);
  const { data: user } = useSession();
  if (lot.error) return <Notice tone="error">{lot.error.message}</Notice>;
  if (!lot.data) return <p className="text-ink-muted">Loading…</p>;
  const l = lot.data;
  const waiting = (l.pieceStates.quarantine ?? 0) + (l.pieceStates.held ?? 0);
  const maySeeSwitching = can(user, 'switching.read');
  const switchingPath = `/switching/${l.purchaseOrder.supplier.id}/${l.part.id}`;
  const mayPutAway = can(user, 'stock.move') && RELEASABLE_LOT_STATES.includes(l.state) && waiting > 0;
  // Status labels only while pieces stand so (held pieces may be in material review).
  const labelKinds = (['lot', 'serials'] as LotLabelKind[])
    .concat((l.pieceStates.quarantine ?? 0) > 0 ? ['quarantine'] : [])
    .concat((l.pieceStates['in-stock'] ?? 0) > 0 ? ['accepted'] : [])
    .concat((l.pieceStates.held ?? 0) > 0 ? ['material-review'] : [])
    .map((value) => ({ value, label: LOT_LABEL_KIND_LABELS[value] }));
  return (
    <div className="max-w-6xl space-y-3">
      <PageHeader
        title={`Lot ${lotName(l.id)}`}
        subtitle={
          <>
            {l.part.number} · {l.part.description} · supplier lot <span className="font-mono">{l.supplierLot}</span>
          </>
        }
        actions={
          <div className="flex items-center gap-2">
            <StateBadge state={l.state} label={LOT_STATE_LABELS[l.state]} />
            <Link
              to={`/inspection/lots/${l.id}`}
              className="rounded border border-paper-line bg-paper-card px-3 py-1.5 text-sm text-ink no-underline hover:bg-paper-sunk"
            >
              Inspection record
            </Link>
            {maySeeSwitching && (
              <Link to={switchingPath} className="rounded border border-paper-line bg-paper-card px-3 py-1.5 text-sm text-ink no-underline hover:bg-paper-sunk">
                Switching
              </Link>
            )}
            {mayPutAway && (
              <Link to={`/stock/put-away?lot=${l.id}`} className="rounded bg-frame px-3 py-1.5 text-sm font-medium text-white no-underline hover:bg-frame-deep">
                Put away in stock
              </Link>
            )}
          </div>
        }
      />
      {l.acceptanceDiscontinued && (
        <Notice tone="caution" title="Acceptance discontinued">
          Acceptance inspection of this part from {l.purchaseOrder.supplier.name} is discontinued. The lot is recorded and waits in quarantine without a
          sampling plan until a quality manager resumes inspection
          {maySeeSwitching ? (
            <>
              {' '}
              on the <Link to={switchingPath}>switching page</Link>
            </>
          ) : (
            ''
          )}
          ; it will then be sampled on tightened inspection.
        </Notice>
      )}
      {params.get('received') && (
        <Notice tone="info" title="Received">
          {l.quantity} pieces are in quarantine. They wait there until inspection decides the lot.
        </Notice>
      )}
      <div className="grid gap-3 lg:grid-cols-3">
        <div className="space-y-3 lg:col-span-2">
          <Panel title="Order and receipt">
            <Details
              items={[
                ['Supplier', l.purchaseOrder.supplier.name],
                [
                  'PO / line',
                  <span key="po" className="font-mono">
                    {l.purchaseOrder.number} / {l.line.lineNumber}
                  </span>,
                ],
                ['Line quantity', l.line.quantity],
                ['Sampling', `Level ${l.line.inspectionLevel}, AQL ${l.line.aql}${l.line.hundredPercent ? ', 100 % inspection' : ''}`],
                [
                  'Plan',
                  l.plan
                    ? `${l.plan.severity}, code letter ${codeLetterText(l.plan.codeLetter, l.plan.planLetter)}: n = ${l.plan.sampleSize}${l.plan.hundredPercent ? ' (every piece)' : ''}, Ac ${l.plan.accept}, Re ${l.plan.reject}`
                    : '—',
                ],
                [
                  'Packing slip',
                  <span key="ps" className="font-mono">
                    {l.shipment.packingSlip}
                  </span>,
                ],
                ['Carrier', l.shipment.carrier || '—'],
                ['Received', formatDateTime(l.shipment.receivedAt)],
                ['Received by', l.shipment.receivedBy],
                ['Pieces', l.quantity],
                ['Outcome', <PieceOutcomes key="o" quantities={l} />],
              ]}
            />
            {l.overReceiptReason && (
              <div className="mt-3">
                <Notice tone="caution" title="More than the line expected">
                  {l.overReceiptReason}
                </Notice>
              </div>
            )}
          </Panel>
          <Panel title="Specification as ordered">
            <SpecSummary spec={l.line.spec} />
          </Panel>
          <Panel
            title="Pieces"
            actions={
              <span className="flex gap-1.5">
                {(Object.entries(l.pieceStates) as [PieceState, number][]).map(([state, count]) => (
                  <StateBadge key={state} state={state} label={`${count} ${PIECE_STATE_LABELS[state]}`} />
                ))}
              </span>
            }
          >
            <LotPieces pieces={l.pieces} />
          </Panel>
        </div>
        <div className="space-y-3">
          {can(user, 'labels.print') && (
            <Panel title="Labels">
              <LabelPrint name={`Labels of ${lotName(l.id)}`} path={`/labels/lots/${l.id}`} kinds={labelKinds} />
            </Panel>
          )}
          <Panel title="Attachments">
            {l.attachments.length === 0 ? (
              <p className="text-sm text-ink-faint">No documents came with this shipment.</p>
            ) : (
              <ul className="space-y-2">
                {l.attachments.map((a) => (
                  <li key={a.id} className="flex gap-2 text-sm">
                    <FileText className="mt-0.5 h-4 w-4 shrink-0 text-ink-muted" aria-hidden />
                    <div className="min-w-0">
                      <a href={`/api/attachments/${a.id}`} target="_blank" rel="noreferrer" className="break-all">
                        {a.name}
                      </a>
                      <p className="text-2xs text-ink-faint">
                        {ATTACHMENT_KIND_LABELS[a.kind]} · {a.mediaType.replace(/^.*\//, '').toUpperCase()} · {kilobytes(a.sizeBytes)}
                      </p>
                      <p className="font-mono text-2xs break-all text-ink-faint" title="SHA-256 of the stored file">
                        SHA-256 {a.sha256}
                      </p>
                    </div>
                  </li>
                ))}
              </ul>
            )}
          </Panel>
          <Panel title="History">
            <HistoryList entries={l.history} />
          </Panel>
        </div>
      </div>
    </div>
  );
}
