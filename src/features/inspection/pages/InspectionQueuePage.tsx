import { Link } from 'react-router';
import { can } from '@shared/policies';
import { LOT_STATE_LABELS, lotName } from '@shared/schemas/stock';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { StateBadge } from '@/components/StateBadge';
import { useSession } from '@/lib/session';
import { useInspectionQueue } from '../api';
import { VerdictBadge } from '../components/VerdictBadge';

export function InspectionQueuePage() {
  const queue = useInspectionQueue();
  const { data: user } = useSession();
  const maySeeSwitching = can(user, 'switching.read');
  const rows = queue.data?.data ?? [];
  return (
    <div>
      <PageHeader title="Inspection queue" subtitle="Lots in quarantine or under inspection, oldest first, with the sample each one needs." />
      {queue.error && <Notice tone="error">{queue.error.message}</Notice>}
      <div className="overflow-x-auto rounded border border-paper-line bg-paper-card">
        <table className="w-full text-sm">
          <thead className="bg-paper-sunk text-left text-xs text-ink-muted">
            <tr>
              {['Lot', 'Part', 'Supplier / lot', 'Qty', 'Days waiting', 'Plan', 'Sample', 'Measured', 'Proposal'].map((h) => (
                <th key={h} className="px-2.5 py-1.5 font-medium whitespace-nowrap">{h}</th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.lotId} className="border-t border-paper-line/70 align-top hover:bg-paper">
                <td className="px-2.5 py-1 whitespace-nowrap"><Link to={`/inspection/lots/${r.lotId}`} className="font-mono">{lotName(r.lotId)}</Link><span className="block"><StateBadge state={r.state} label={LOT_STATE_LABELS[r.state]} /></span></td>
                <td className="px-2.5 py-1"><span className="font-mono">{r.part.number}</span><span className="block text-xs text-ink-muted">{r.part.description}</span></td>
                <td className="px-2.5 py-1">{r.supplier}<span className="block font-mono text-xs text-ink-muted">{r.supplierLot}</span></td>
                <td className="px-2.5 py-1 text-right">{r.quantity}</td>
                <td className={`px-2.5 py-1 text-right ${r.daysInQuarantine > 10 ? 'font-medium text-state-fail' : ''}`}>{r.daysInQuarantine}</td>
                {r.plan ? (
                  <>
                    <td className="px-2.5 py-1 text-xs whitespace-nowrap">{r.plan.severity}, {r.plan.codeLetter}{r.plan.planLetter !== r.plan.codeLetter && `→${r.plan.planLetter}`}: n {r.plan.sampleSize}, Ac {r.plan.accept}/Re {r.plan.reject}</td>
                    <td className="max-w-xs px-2.5 py-1 font-mono text-2xs text-ink-muted">{r.sampleSerials.slice(0, 8).join(' ')}{r.sampleSerials.length > 8 ? ` … +${r.sampleSerials.length - 8}` : ''}</td>
                    <td className="px-2.5 py-1 text-right whitespace-nowrap">{r.sortRemaining === null ? `${r.measured}/${r.plan.sampleSize}` : `${r.quantity - r.sortRemaining}/${r.quantity}`}</td>
                    <td className="px-2.5 py-1">{r.proposal && <VerdictBadge value={r.proposal} />}</td>
                  </>
                ) : (
                  // Received while acceptance is discontinued: no plan until a quality manager resumes inspection.
                  <td colSpan={4} className="px-2.5 py-1 text-xs">
                    <StateBadge state="acceptance-discontinued" tone="fail" label="Acceptance discontinued" />
                    <span className="ml-2 text-ink-muted">waits without a plan until inspection resumes</span>
                    {maySeeSwitching && <Link to={`/switching/${r.supplierId}/${r.part.id}`} className="ml-2">switching</Link>}
                  </td>
                )}
              </tr>
            ))}
            {rows.length === 0 && (
              <tr><td colSpan={9} className="px-2.5 py-6 text-center text-ink-faint">{queue.isPending ? 'Loading…' : 'No lot is waiting for inspection.'}</td></tr>
            )}
          </tbody>
        </table>
      </div>
    </div>
  );
}
