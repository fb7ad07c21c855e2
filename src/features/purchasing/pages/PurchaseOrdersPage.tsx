import { useMemo } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { Plus } from 'lucide-react';
import { can } from '@shared/policies';
import { PO_STATUSES, type PurchaseOrderRow } from '@shared/schemas/purchasing';
import { DataTable, useListState } from '@/components/DataTable';
import { FilterSelect, ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { outcomeColumns, outcomeSummary } from '@/components/PieceOutcomes';
import { StateBadge } from '@/components/StateBadge';
import { counted } from '@/lib/plural';
import { useSession } from '@/lib/session';
import { usePurchaseOrders } from '../api';
import { money } from '../components/money';
import { PurchasingTabs } from '../components/PurchasingTabs';

const column = createColumnHelper<PurchaseOrderRow>();

export function PurchaseOrdersPage() {
  const { data: user } = useSession();
  const navigate = useNavigate();
  const { state, update, params } = useListState({ sort: '-orderedOn' });
  const status = params.get('status') ?? undefined;
  const orders = usePurchaseOrders({ ...state, status });
  const columns = useMemo(
    () => [
      column.accessor('number', { header: 'PO', cell: ({ getValue }) => <span className="font-mono">{getValue()}</span> }),
      column.accessor('supplierName', { header: 'Supplier' }),
      column.accessor('orderedOn', { header: 'Ordered on' }),
      column.accessor('status', { header: 'Status', cell: ({ getValue }) => <StateBadge state={getValue()} /> }),
      column.accessor('lineCount', { header: 'Lines', enableSorting: false }),
      column.accessor('ordered', { header: 'Ordered', cell: ({ getValue }) => <span className="tabular-nums">{getValue()}</span> }),
      column.accessor('received', {
        header: 'Received',
        cell: ({ row }) => (
          <span className={`tabular-nums ${row.original.received >= row.original.ordered ? 'text-state-pass' : ''}`}>{row.original.received}</span>
        ),
      }),
      ...outcomeColumns(column),
      column.accessor('value', {
        header: 'Value',
        cell: ({ row }) => <span className="tabular-nums">{money(row.original.value, row.original.currency)}</span>,
      }),
    ],
    [],
  );
  const totals = orders.data?.totals;
  return (
    <div>
      <PageHeader
        title="Purchasing"
        subtitle="Suppliers, the parts ordered from them with their optical specification, and purchase orders."
        actions={
          can(user, 'catalog.write') && (
            <Link
              to="/purchasing/orders/new"
              className="inline-flex items-center gap-1.5 rounded bg-frame px-3 py-1.5 text-sm font-medium text-white no-underline hover:bg-frame-deep"
            >
              <Plus className="h-4 w-4" aria-hidden /> New purchase order
            </Link>
          )
        }
      />
      <PurchasingTabs />
      <ListToolbar
        list={{ state, update }}
        filters={{ status }}
        placeholder="Search PO, supplier, notes"
        exportPath="/purchase-orders"
        summary={
          totals &&
          `${counted(orders.data?.total ?? 0, 'PO')} · ${counted(totals.ordered, 'piece')} ordered · ${totals.received} received · ${outcomeSummary(totals)}`
        }
      >
        <FilterSelect
          label="Status"
          value={status}
          onChange={(value) => update({ status: value })}
          options={PO_STATUSES.map((s) => ({ value: s, label: s === 'open' ? 'Open' : 'Closed' }))}
        />
      </ListToolbar>
      {orders.error && <Notice tone="error">{orders.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={orders.data?.data ?? []}
        total={orders.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={orders.isPending}
        empty="No purchase order matches."
        onRowClick={(o) => navigate(`/purchasing/orders/${o.id}`)}
      />
    </div>
  );
}
