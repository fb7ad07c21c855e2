import { Link, useParams } from 'react-router-dom';
import { can } from '@shared/policies';
import { DISPOSITION_LABELS } from '@shared/inspection/lotVerdict';
import { codeLetterText } from '@shared/sampling/plan';
import { DECIDED_LOT_STATES, LOT_STATE_LABELS, lotName } from '@shared/schemas/stock';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { StateBadge } from '@/components/StateBadge';
import { useSession } from '@/lib/session';
import { ApiError } from '@/lib/api';
import { useLotInspection } from '../api';
import { DispositionPanel } from '../components/DispositionPanel';
import { DocumentLink } from '../components/DocumentLink';
import { MeasurementUpload } from '../components/MeasurementUpload';
import { OcChart } from '../components/OcChart';
import { ResultCharts } from '../components/ResultCharts';
import { ResultsTable } from '../components/ResultsTable';
import { VerdictBadge } from '../components/VerdictBadge';
import { formatDateTime, plural } from '@shared/format';

function Facts({ rows }: { rows: [string, React.ReactNode][] }) {
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm">
      {rows.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="text-xs leading-5 text-ink-muted">{k}</dt>
          <dd>{v}</dd>
        </div>
      ))}
    </dl>
  );
}

export function LotInspectionPage() {
  const lotId = Number(useParams().lotId);
  const { data: user } = useSession();
  const query = useLotInspection(lotId);
  if (query.error) {
    const held =
      query.error instanceof ApiError && query.error.code === 'acceptance_discontinued'
        ? (query.error.details as { supplierId: number; partId: number })
        : null;
    if (!held) return <Notice tone="error">{query.error.message}</Notice>;
    // Received while acceptance is discontinued: there is no plan to inspect against yet.
    return (
      <Notice tone="caution" title="Acceptance discontinued">
        {query.error.message}. <Link to={`/lots/${lotId}`}>The lot</Link>
        {can(user, 'switching.read') && (
          <>
            {' '}
            · <Link to={`/switching/${held.supplierId}/${held.partId}`}>switching page</Link>
          </>
        )}
      </Notice>
    );
  }
  if (!query.data) return <p className="text-ink-muted">Loading…</p>;
  const view = query.data;
  const { lot, spec, plan, verdict } = view;
  const decided = DECIDED_LOT_STATES.includes(lot.state);

  return (
    <div className="space-y-4">
      <PageHeader
        title={`Lot ${lotName(lot.id)} · ${lot.part.number}`}
        subtitle={`${lot.part.description} — ${lot.supplier.name}, supplier lot ${lot.supplierLot}, ${lot.quantity} pieces, PO ${lot.poNumber} line ${lot.lineNumber}`}
        actions={<StateBadge state={lot.state} label={LOT_STATE_LABELS[lot.state]} />}
      />
      <div className="grid gap-3 lg:grid-cols-3">
        <section className="rounded border border-paper-line bg-paper-card p-3">
          <h2 className="mb-2 text-sm">Ordered specification</h2>
          <Facts
            rows={[
              ['Nominal', `${spec.nominalWaves} λ at ${spec.designWavelengthNm} nm`],
              ['Retardance', `±${spec.retardanceTolWaves} λ`],
              ['Fast-axis mark', `±${spec.axisTolDeg}°`],
              [
                'Construction',
                `${spec.construction}${spec.multiOrder ? ` (order ${spec.multiOrder})` : ''}${spec.bandNm ? `, ${spec.bandNm[0]}–${spec.bandNm[1]} nm` : ''}, ${spec.material}`,
              ],
              ['Decision rule', spec.decisionRule === 'guarded' ? 'guarded acceptance (|error| + U ≤ tol)' : 'simple acceptance'],
            ]}
          />
        </section>
        <section className="rounded border border-paper-line bg-paper-card p-3">
          <h2 className="mb-2 text-sm">Sampling plan</h2>
          <Facts
            rows={[
              ['Severity', `${plan.severity}${plan.hundredPercent ? ' · 100 % inspection' : ''}`],
              ['Level / AQL', `${plan.level} / ${plan.aql}`],
              ['Code letter', codeLetterText(plan.codeLetter, plan.planLetter)],
              ['Sample', `n = ${plan.sampleSize}, Ac ${plan.accept}, Re ${plan.reject}`],
              ['Seed', <span className="font-mono text-xs">{plan.seed}</span>],
            ]}
          />
        </section>
        <section className="rounded border border-paper-line bg-paper-card p-3">
          <h2 className="mb-2 text-sm">Lot verdict</h2>
          <p className="mb-1">
            <VerdictBadge value={verdict.proposal} />
          </p>
          <p className="text-sm">{verdict.explanation}.</p>
          <p className="mt-1 text-xs text-ink-muted">
            {verdict.measured} of {plan.sampleSize} sample pieces measured · {plural(verdict.defectives, 'defective')}
          </p>
          {view.disposition && (
            <p className="mt-2 text-sm">
              Signed decision: <strong>{DISPOSITION_LABELS[view.disposition.decision]}</strong>
            </p>
          )}
        </section>
      </div>
      <OcChart points={plan.oc} aql={plan.aql} />

      {can(user, 'inspection.perform') && !decided && (
        <section className="space-y-2">
          <h2>Upload bench measurements</h2>
          <Notice tone="caution">
            Laser source on the bench: wear the eyewear its class requires and keep beams below eye level. Handle plates by the rim with gloves; cemented plates
            have damage thresholds.
          </Notice>
          <MeasurementUpload lotId={lot.id} />
        </section>
      )}

      <section className="space-y-2">
        <h2>Results</h2>
        <ResultCharts view={view} />
        <ResultsTable view={view} />
      </section>

      <DispositionPanel view={view} maySign={can(user, 'disposition.sign')} />

      <section className="grid gap-3 lg:grid-cols-3">
        <div className="rounded border border-paper-line bg-paper-card p-3">
          <h2 className="mb-2 text-sm">Measurement files</h2>
          <ul className="space-y-1 text-xs">
            {view.files.map((f) => (
              <li key={f.id}>
                <span className="font-medium">{f.name}</span> · {f.method} · {f.instrument} · {f.rows} rows · {f.uploadedBy}, {formatDateTime(f.uploadedAt)}
                <br />
                <span className="font-mono break-all text-ink-faint">{f.sha256}</span>
              </li>
            ))}
            {view.files.length === 0 && <li className="text-ink-faint">None yet.</li>}
          </ul>
        </div>
        <div className="rounded border border-paper-line bg-paper-card p-3">
          <h2 className="mb-2 text-sm">Dispositions</h2>
          <ul className="space-y-1 text-xs">
            {view.dispositions.map((d) => (
              <li key={d.id} className={d.supersededAt ? 'text-ink-faint line-through' : ''}>
                <strong>{DISPOSITION_LABELS[d.decision]}</strong> by {d.signer}, {formatDateTime(d.signedAt)}
                {d.deviationNumber && ` · ${d.deviationNumber}`}
                <span className="block no-underline">“{d.meaning}”</span>
              </li>
            ))}
            {view.dispositions.length === 0 && <li className="text-ink-faint">Not decided.</li>}
          </ul>
        </div>
        <div className="rounded border border-paper-line bg-paper-card p-3">
          <h2 className="mb-2 text-sm">Documents</h2>
          <ul className="space-y-1 text-xs">
            {view.documents.map((d) => (
              <li key={d.id}>
                <DocumentLink document={d} />
              </li>
            ))}
            {view.documents.length === 0 && <li className="text-ink-faint">None issued.</li>}
          </ul>
        </div>
      </section>
    </div>
  );
}
