import { useMemo } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { can } from '@shared/policies';
import type { QueueRow } from '@shared/schemas/inspection';
import { LOT_STATE_LABELS, lotName } from '@shared/schemas/stock';
import { DataTable, useListState } from '@/components/DataTable';
import { ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { StateBadge } from '@/components/StateBadge';
import { counted } from '@/lib/plural';
import { useSession } from '@/lib/session';
import { useInspectionQueue } from '../api';
import { VerdictBadge } from '../components/VerdictBadge';

const column = createColumnHelper<QueueRow>();

export function InspectionQueuePage() {
  const { state, update } = useListState({ sort: 'receivedAt' });
  const queue = useInspectionQueue(state);
  const { data: user } = useSession();
  const maySeeSwitching = can(user, 'switching.read');
  const columns = useMemo(
    () => [
      column.accessor('lotId', {
        header: 'Lot',
        cell: ({ row }) => (
          <span className="whitespace-nowrap">
            <Link to={`/inspection/lots/${row.original.lotId}`} className="font-mono">
              {lotName(row.original.lotId)}
            </Link>
            <span className="block">
              <StateBadge state={row.original.state} label={LOT_STATE_LABELS[row.original.state]} />
            </span>
          </span>
        ),
      }),
      column.accessor((r) => r.part.number, {
        id: 'partNumber',
        header: 'Part',
        cell: ({ row }) => (
          <span className="block min-w-36">
            <span className="font-mono">{row.original.part.number}</span>
            <span className="block text-xs text-ink-muted">{row.original.part.description}</span>
          </span>
        ),
      }),
      column.accessor('supplier', {
        header: 'Supplier / lot',
        cell: ({ row }) => (
          <span className="block min-w-32">
            {row.original.supplier}
            <span className="block font-mono text-xs text-ink-muted">{row.original.supplierLot}</span>
          </span>
        ),
      }),
      column.accessor('quantity', { header: 'Qty', cell: ({ getValue }) => <span className="block text-right tabular-nums">{getValue()}</span> }),
      column.display({
        id: 'daysWaiting',
        header: 'Days waiting',
        cell: ({ row }) => (
          <span className={`block text-right tabular-nums ${row.original.daysInQuarantine > 10 ? 'font-medium text-state-fail' : ''}`}>
            {row.original.daysInQuarantine}
          </span>
        ),
      }),
      column.display({
        id: 'plan',
        header: 'Plan',
        cell: ({ row: { original: r } }) =>
          r.plan ? (
            <span className="text-xs whitespace-nowrap">
              {r.plan.severity}, {r.plan.codeLetter}
              {r.plan.planLetter !== r.plan.codeLetter && `→${r.plan.planLetter}`}: n {r.plan.sampleSize}, Ac {r.plan.accept}/Re {r.plan.reject}
            </span>
          ) : (
            // Received while acceptance is discontinued: no plan until a quality manager resumes inspection.
            <span className="text-xs">
              <StateBadge state="acceptance-discontinued" tone="fail" label="Acceptance discontinued" />
              <span className="ml-2 text-ink-muted">waits without a plan until inspection resumes</span>
              {maySeeSwitching && (
                <Link to={`/switching/${r.supplierId}/${r.part.id}`} className="ml-2">
                  switching
                </Link>
              )}
            </span>
          ),
      }),
      column.display({
        id: 'sample',
        header: 'Sample',
        cell: ({ row: { original: r } }) => (
          <span className="block max-w-xs min-w-56 font-mono text-2xs text-ink-muted">
            {r.sampleSerials.slice(0, 8).join(' ')}
            {r.sampleSerials.length > 8 ? ` … +${r.sampleSerials.length - 8}` : ''}
          </span>
        ),
      }),
      column.display({
        id: 'measured',
        header: 'Measured',
        cell: ({ row: { original: r } }) =>
          r.plan && (
            <span className="block text-right whitespace-nowrap">
              {r.sortRemaining === null ? `${r.measured}/${r.plan.sampleSize}` : `${r.quantity - r.sortRemaining}/${r.quantity}`}
            </span>
          ),
      }),
      column.display({ id: 'proposal', header: 'Proposal', cell: ({ row: { original: r } }) => r.proposal && <VerdictBadge value={r.proposal} /> }),
    ],
    [maySeeSwitching],
  );
  return (
    <div>
      <PageHeader title="Inspection queue" subtitle="Lots in quarantine or under inspection, oldest first, with the sample each one needs." />
      <ListToolbar
        list={{ state, update }}
        placeholder="Lot, supplier lot, part, supplier"
        exportPath="/inspection/queue"
        summary={queue.data && counted(queue.data.total, 'lot waiting', 'lots waiting')}
      />
      {queue.error && <Notice tone="error">{queue.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={queue.data?.data ?? []}
        total={queue.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={queue.isPending}
        empty="No lot is waiting for inspection."
      />
    </div>
  );
}
