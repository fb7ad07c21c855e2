// The buyer's page of one supplier: its scorecard over a period, per part, and for the part chosen
// the capability and drift of retardance and fast-axis error, with the drift alarms raised.
import { Link, useParams, useSearchParams } from 'react-router-dom';
import { Download } from 'lucide-react';
import { DRIFT_CHARACTERISTICS } from '@shared/schemas/supplierPerformance';
import { Panel } from '@/components/Details';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { apiUrl } from '@/lib/api';
import { useCapability, useScorecard } from '../api';
import { AlarmList } from '../components/AlarmList';
import { DriftCharts } from '../components/DriftCharts';
import { FigureTiles } from '../components/FigureTiles';
import { PartsTable } from '../components/PartsTable';
import { PeriodPicker } from '../components/PeriodPicker';

export function SupplierPerformancePage() {
  const supplierId = Number(useParams().supplierId);
  const [params, setParams] = useSearchParams();
  const chosen = { from: params.get('from') ?? undefined, to: params.get('to') ?? undefined };
  const scorecard = useScorecard(supplierId, chosen);
  const card = scorecard.data;
  // The part whose charts are shown: the one asked for, else the first with pieces measured.
  const asked = params.get('partId');
  const partId = asked ? Number(asked) : (card?.parts.find((p) => p.figures.piecesInspected > 0) ?? card?.parts[0])?.part.id;
  const capability = useCapability(supplierId, partId, chosen);
  const update = (patch: Record<string, string | number | undefined>) =>
    setParams((previous) => {
      const next = new URLSearchParams(previous);
      for (const [key, value] of Object.entries(patch)) {
        if (value === undefined || value === '') next.delete(key);
        else next.set(key, String(value));
      }
      return next;
    });

  if (scorecard.error) return <Notice tone="error">{scorecard.error.message}</Notice>;
  if (!card) return <p className="text-ink-muted">Loading…</p>;
  const chart = capability.data;
  const part = card.parts.find((p) => p.part.id === partId)?.part;
  return (
    <div className="max-w-7xl space-y-3">
      <PageHeader
        title={card.supplier.name}
        subtitle={
          <>
            Supplier performance, lots received {card.period.from} to {card.period.to}
            {card.supplier.owner && <> · buyer {card.supplier.owner.name}</>} · <Link to="/supplier-performance">all suppliers</Link>
          </>
        }
        actions={
          <a
            href={apiUrl(`/suppliers/${supplierId}/scorecard`, { ...chosen, format: 'csv' })}
            className="inline-flex items-center gap-1 rounded border border-paper-line bg-paper-card px-2 py-1 text-xs text-ink no-underline hover:bg-paper-sunk"
            download
          >
            <Download className="h-3.5 w-3.5" aria-hidden /> Scorecard CSV
          </a>
        }
      />
      <PeriodPicker period={card.period} chosen={chosen} onChange={update} />
      <FigureTiles figures={card.figures} />
      <Panel title="Parts">
        <PartsTable parts={card.parts} chosen={partId} onChoose={(id) => update({ partId: id })} />
      </Panel>
      {part && (
        <Panel title={`Capability and drift: ${part.number}`}>
          <p className="-mt-1 mb-2 text-xs text-ink-muted">{part.description}</p>
          {capability.error && <Notice tone="error">{capability.error.message}</Notice>}
          {!chart && !capability.error && <p className="text-ink-muted">Loading…</p>}
          {chart && (
            <div className="space-y-5">
              {chart.markOnSlowAxis > 0 && (
                <Notice tone="caution">
                  {chart.markOnSlowAxis} piece{chart.markOnSlowAxis === 1 ? ' had its' : 's had their'} fast-axis mark on the slow axis: a marking error of its
                  own, left out of the statistics.
                </Notice>
              )}
              {DRIFT_CHARACTERISTICS.map((c) => (
                <DriftCharts key={c} view={chart.characteristics.find((v) => v.characteristic === c)!} alarms={chart.alarms} />
              ))}
              <p className="text-2xs text-ink-muted">
                Cp and Cpk use the spread of every piece measured at the design wavelength against the ordered tolerance; 95 % intervals, since lots are small.
                Green from 1.33, amber from 1.0.
              </p>
            </div>
          )}
        </Panel>
      )}
      <Panel title="Drift alarms">
        <AlarmList alarms={card.alarms} />
      </Panel>
    </div>
  );
}
