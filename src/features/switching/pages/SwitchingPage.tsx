import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { can } from '@shared/policies';
import { SWITCHING_PHASE_LABELS } from '@shared/schemas/switching';
import { LOT_STATE_LABELS, lotName, type LotState } from '@shared/schemas/stock';
import { Button } from '@/components/Button';
import { Panel } from '@/components/Details';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { StateBadge } from '@/components/StateBadge';
import { useSession } from '@/lib/session';
import { useSwitching } from '../api';
import { OverrideForm } from '../components/OverrideForm';
import { PhaseBadge } from '@/components/PhaseBadge';
import { ResumeForm } from '../components/ResumeForm';
import { SwitchingCounts } from '../components/SwitchingCounts';
import { SwitchingHistory } from '../components/SwitchingHistory';
import { formatDateTime } from '@shared/format';

const WHAT_IT_MEANS = {
  normal: 'Lots received now are sampled on normal inspection.',
  tightened: 'Lots received now are sampled on tightened inspection: larger samples or smaller acceptance numbers.',
  reduced: 'Lots received now are sampled on reduced inspection: smaller samples, back to normal at the first lot not accepted.',
  stopped: 'Acceptance inspection is discontinued. Lots received now are recorded and wait in quarantine without a sampling plan until inspection is resumed.',
};

export function SwitchingPage() {
  const supplierId = Number(useParams().supplierId);
  const partId = Number(useParams().partId);
  const { data: user } = useSession();
  const query = useSwitching(supplierId, partId);
  const [overriding, setOverriding] = useState(false);
  // What the signature just did, kept while the page shows the state it led to.
  const [signed, setSigned] = useState<{ title: string; detail: string } | null>(null);
  if (query.error) return <Notice tone="error">{query.error.message}</Notice>;
  if (!query.data) return <p className="text-ink-muted">Loading…</p>;
  const view = query.data;
  const mayManage = can(user, 'switching.manage');
  const lastChange = view.history.find((h) => h.from !== h.to);
  return (
    <div className="max-w-6xl space-y-3">
      <PageHeader
        title={`Switching · ${view.part.number}`}
        subtitle={
          <>
            {view.part.description} from <Link to={`/switching?supplierId=${view.supplier.id}`}>{view.supplier.name}</Link> · ISO 2859-1 switching rules, clause
            9
          </>
        }
        actions={<PhaseBadge phase={view.phase} />}
      />
      {signed && (
        <Notice tone="info" title={signed.title}>
          {signed.detail}
        </Notice>
      )}
      <div className="grid gap-3 lg:grid-cols-3">
        <Panel title="Where inspection stands">
          <p className="text-lg font-semibold" data-testid="switching-phase">
            {SWITCHING_PHASE_LABELS[view.phase]}
          </p>
          <p className="mt-1 text-sm text-ink-muted">{WHAT_IT_MEANS[view.phase]}</p>
          {lastChange && <p className="mt-2 text-xs text-ink-faint">Since {formatDateTime(lastChange.at)}.</p>}
          {mayManage && view.phase !== 'stopped' && !overriding && (
            <div className="mt-3 border-t border-paper-line pt-3">
              <Button
                look="secondary"
                onClick={() => {
                  setSigned(null);
                  setOverriding(true);
                }}
              >
                Override the severity…
              </Button>
            </div>
          )}
        </Panel>
        <Panel title="Counts">
          <SwitchingCounts state={view.state} reducedEnabled={view.reducedEnabled} />
        </Panel>
        <Panel title="Lots not yet decided">
          {view.waitingLots.length === 0 && view.openLots.length === 0 && <p className="text-sm text-ink-faint">None.</p>}
          <ul className="space-y-1.5 text-sm">
            {view.waitingLots.map((lot) => (
              <li key={lot.id} className="flex flex-wrap items-center gap-2">
                <Link to={`/lots/${lot.id}`} className="font-mono">
                  {lotName(lot.id)}
                </Link>
                <span className="font-mono text-xs text-ink-muted">{lot.supplierLot}</span>
                <StateBadge state="stopped" tone="fail" label="waits, no plan" />
              </li>
            ))}
            {view.openLots.map((lot) => (
              <li key={lot.id} className="flex flex-wrap items-center gap-2">
                <Link to={`/inspection/lots/${lot.id}`} className="font-mono">
                  {lotName(lot.id)}
                </Link>
                <span className="font-mono text-xs text-ink-muted">{lot.supplierLot}</span>
                <StateBadge state={lot.state} label={LOT_STATE_LABELS[lot.state as LotState] ?? lot.state} />
                <span className="text-xs text-ink-muted">sampled on {lot.severity}</span>
              </li>
            ))}
          </ul>
        </Panel>
      </div>
      {view.phase === 'stopped' &&
        (mayManage ? (
          <ResumeForm
            key={view.history[0]?.id}
            supplierId={supplierId}
            partId={partId}
            waitingLots={view.waitingLots.length}
            onResumed={(drawn) =>
              setSigned({
                title: 'Inspection resumed on tightened inspection',
                detail: drawn.length > 0 ? `Sampling plans drawn for ${drawn.map(lotName).join(', ')}.` : 'No lot was waiting for a plan.',
              })
            }
          />
        ) : (
          <Notice tone="caution" title="Acceptance discontinued">
            A quality manager resumes inspection once the supplier has acted.
          </Notice>
        ))}
      {overriding && view.phase !== 'stopped' && (
        <OverrideForm
          supplierId={supplierId}
          partId={partId}
          current={view.phase}
          onCancel={() => setOverriding(false)}
          onSigned={(severity) => {
            setOverriding(false);
            setSigned({ title: `Severity set to ${severity}`, detail: 'Lots received from now on are sampled on it; lots already sampled keep their plans.' });
          }}
        />
      )}
      <Panel title="History">
        <SwitchingHistory entries={view.history} />
      </Panel>
    </div>
  );
}
