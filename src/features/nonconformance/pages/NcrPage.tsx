import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { can } from '@shared/policies';
import { NCR_ORIGIN_LABELS, NCR_STATUS_LABELS, type NcrView } from '@shared/schemas/nonconformance';
import { DISPOSITION_LABELS, type Disposition } from '@shared/inspection/lotVerdict';
import { lotName } from '@shared/schemas/stock';
import { Button } from '@/components/Button';
import { Details, Panel } from '@/components/Details';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { StateBadge } from '@/components/StateBadge';
import { useSession } from '@/lib/session';
import { useNcr } from '../api';
import { CloseForm } from '../components/CloseForm';
import { DispositionForm } from '../components/DispositionForm';
import { NcrEditForm } from '../components/NcrEditForm';
import { NcrPiecesTable } from '../components/NcrPiecesTable';
import { NcrRecords } from '../components/NcrRecords';
import { ReturnForm } from '../components/ReturnForm';
import { ReworkReleaseForm } from '../components/ReworkReleaseForm';
import { formatDate, formatDateTime } from '@shared/format';

type Act = 'disposition' | 'rework' | 'ship';

/** The acts the NCR's pieces still allow, for this user. */
function actsOf(ncr: NcrView, user: Parameters<typeof can>[0]): { act: Act; label: string }[] {
  if (ncr.status === 'closed') return [];
  const acts: { act: Act; label: string }[] = [];
  const awaiting = ncr.pieces.some((p) => !p.disposition || (p.disposition.decision === 'rework' && !p.reworkReleased));
  if (can(user, 'nonconformance.disposition') && awaiting) acts.push({ act: 'disposition', label: 'Sign a disposition' });
  if (can(user, 'nonconformance.disposition') && ncr.pieces.some((p) => p.disposition?.decision === 'rework' && !p.reworkReleased))
    acts.push({ act: 'rework', label: 'Release reworked pieces' });
  if (can(user, 'returns.ship') && ncr.pieces.some((p) => p.disposition?.decision === 'return-to-vendor' && p.returnId === null))
    acts.push({ act: 'ship', label: 'Ship back to the vendor' });
  return acts;
}

export function NcrPage() {
  const id = Number(useParams().ncrId);
  const { data: user } = useSession();
  const query = useNcr(id);
  const [selected, setSelected] = useState<Set<number>>(new Set());
  const [act, setAct] = useState<Act | null>(null);
  const [editing, setEditing] = useState(false);
  const [done, setDone] = useState<string | null>(null);
  if (query.error) return <Notice tone="error">{query.error.message}</Notice>;
  if (!query.data) return <p className="text-ink-muted">Loading…</p>;
  const ncr = query.data;
  const acts = actsOf(ncr, user);
  const finished = (summary: string) => {
    setDone(summary);
    setAct(null);
    setSelected(new Set());
  };
  const mayEdit = can(user, 'nonconformance.open') && ncr.status !== 'closed';
  return (
    <div className="max-w-6xl space-y-3">
      <PageHeader
        title={ncr.number}
        subtitle={
          <>
            {ncr.part.number} · {ncr.part.description} from {ncr.supplier.name}
            {can(user, 'corrective.manage') && (
              <>
                {' · '}
                <Link to={`/corrective-actions/new?ncr=${ncr.id}`}>ask the supplier for a corrective action</Link>
              </>
            )}
          </>
        }
        actions={<StateBadge state={ncr.status} label={NCR_STATUS_LABELS[ncr.status]} />}
      />
      {done && (
        <Notice tone="info" title="Signed and recorded">
          {done}
        </Notice>
      )}
      <div className="grid gap-3 lg:grid-cols-3">
        <div className="lg:col-span-2">
          <Panel
            title="Report"
            actions={
              mayEdit &&
              !editing && (
                <Button look="quiet" onClick={() => setEditing(true)}>
                  Change
                </Button>
              )
            }
          >
            <Details
              items={[
                ['Origin', NCR_ORIGIN_LABELS[ncr.origin]],
                [
                  'Lot',
                  ncr.lot ? (
                    <Link to={`/lots/${ncr.lot.id}`} className="font-mono">{`${lotName(ncr.lot.id)} · ${ncr.lot.supplierLot}`}</Link>
                  ) : (
                    'Several or none'
                  ),
                ],
                [
                  'PO',
                  ncr.lot ? (
                    <Link to={`/purchasing/orders/${ncr.lot.poId}`} className="font-mono">
                      {ncr.lot.poNumber}
                    </Link>
                  ) : null,
                ],
                [
                  'Lot decision',
                  ncr.lotDecision
                    ? `${DISPOSITION_LABELS[ncr.lotDecision.decision as Disposition] ?? ncr.lotDecision.decision}, ${formatDate(ncr.lotDecision.signedAt)}`
                    : null,
                ],
                ['Owner', ncr.owner?.name],
                ['Opened', `${formatDateTime(ncr.openedAt)}${ncr.openedBy ? ` by ${ncr.openedBy}` : ''}`],
              ]}
            />
            <div className="mt-3 border-t border-paper-line pt-3">
              {editing && user ? (
                <NcrEditForm ncr={ncr} meId={user.id} onDone={() => setEditing(false)} />
              ) : (
                <div className="space-y-2 text-sm">
                  <div className="flex flex-wrap gap-1.5" aria-label="Defect codes">
                    {ncr.defects.length === 0 && <span className="text-ink-faint">No defect code named.</span>}
                    {ncr.defects.map((d) => (
                      <StateBadge key={d.id} state="defect" tone="fail" label={d.label} />
                    ))}
                  </div>
                  <p>{ncr.description}</p>
                  {ncr.containment && (
                    <p className="text-ink-muted">
                      <span className="font-medium text-ink">Containment: </span>
                      {ncr.containment}
                    </p>
                  )}
                </div>
              )}
            </div>
          </Panel>
        </div>
        <Panel title={ncr.status === 'closed' ? 'Closed' : 'Still to do'}>
          {ncr.status === 'closed' ? (
            <p className="text-sm">
              {formatDateTime(ncr.closedAt!)}
              {ncr.closedBy && ` by ${ncr.closedBy}`}
              {ncr.closingNote && <span className="block text-ink-muted">{ncr.closingNote}</span>}
            </p>
          ) : ncr.openItems.length ? (
            <ul className="list-disc space-y-1 pl-4 text-sm">
              {ncr.openItems.map((item) => (
                <li key={item}>{item}</li>
              ))}
            </ul>
          ) : (
            <div className="space-y-2">
              <p className="text-sm">Every disposition has been carried out.</p>
              {can(user, 'nonconformance.disposition') && <CloseForm ncrId={ncr.id} />}
            </div>
          )}
        </Panel>
      </div>
      <Panel
        title={`Pieces (${ncr.pieces.length})`}
        actions={
          acts.length > 0 && (
            <div className="flex flex-wrap gap-1.5">
              {acts.map((a) => (
                <Button
                  key={a.act}
                  look={act === a.act ? 'primary' : 'secondary'}
                  onClick={() => {
                    setDone(null);
                    setAct(act === a.act ? null : a.act);
                  }}
                >
                  {a.label}
                </Button>
              ))}
            </div>
          )
        }
      >
        <NcrPiecesTable pieces={ncr.pieces} selected={selected} onSelect={acts.length ? setSelected : undefined} />
      </Panel>
      {act === 'disposition' && <DispositionForm ncr={ncr} selected={[...selected]} onSigned={finished} />}
      {act === 'rework' && <ReworkReleaseForm ncr={ncr} selected={[...selected]} onSigned={finished} />}
      {act === 'ship' && <ReturnForm ncr={ncr} selected={[...selected]} onShipped={finished} />}
      <NcrRecords ncr={ncr} />
    </div>
  );
}
