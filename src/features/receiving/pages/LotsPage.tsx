import { useMemo } from 'react';
import { useNavigate } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import type { LotRow } from '@shared/schemas/receiving';
import { LOT_STATES, LOT_STATE_LABELS, lotName } from '@shared/schemas/stock';
import { DataTable, useListState } from '@/components/DataTable';
import { FilterSelect, ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { PartLabel } from '@/components/PartLabel';
import { outcomeColumns, outcomeSummary } from '@/components/PieceOutcomes';
import { StateBadge } from '@/components/StateBadge';
import { counted } from '@/lib/plural';
import { useLots } from '../api';
import { formatDate } from '@shared/format';

const column = createColumnHelper<LotRow>();

export function LotsPage() {
  const navigate = useNavigate();
  const { state, update, params } = useListState({ sort: '-receivedAt' });
  const filters = { state: params.get('state') ?? undefined, purchaseOrderId: params.get('purchaseOrderId') ?? undefined };
  const lots = useLots({ ...state, ...filters });
  const columns = useMemo(
    () => [
      column.accessor('id', { header: 'Lot', cell: ({ getValue }) => <span className="font-mono">{lotName(getValue())}</span> }),
      column.accessor('state', {
        header: 'State',
        cell: ({ getValue, row }) => (
          <span className="flex flex-wrap gap-1">
            <StateBadge state={getValue()} label={LOT_STATE_LABELS[getValue()]} />
            {row.original.acceptanceDiscontinued && <StateBadge state="acceptance-discontinued" tone="fail" label="Acceptance discontinued" />}
          </span>
        ),
      }),
      column.accessor('partNumber', {
        header: 'Part',
        cell: ({ row }) => <PartLabel number={row.original.partNumber} description={row.original.partDescription} />,
      }),
      column.accessor('supplierName', { header: 'Supplier' }),
      column.accessor('supplierLot', { header: 'Supplier lot', cell: ({ getValue }) => <span className="font-mono">{getValue()}</span> }),
      column.accessor('poNumber', {
        header: 'PO / line',
        cell: ({ row }) => (
          <span className="font-mono">
            {row.original.poNumber} / {row.original.lineNumber}
          </span>
        ),
      }),
      column.accessor('quantity', { header: 'Pieces', cell: ({ getValue }) => <span className="tabular-nums">{getValue()}</span> }),
      ...outcomeColumns(column),
      column.accessor('receivedAt', { header: 'Received', cell: ({ getValue }) => formatDate(getValue()) }),
    ],
    [],
  );
  return (
    <div>
      <PageHeader title="Lots" subtitle="Every lot received, with its state from quarantine to disposition. Search also finds a lot by one of its serials." />
      <ListToolbar
        list={{ state, update }}
        filters={filters}
        placeholder="Lot, serial, part, supplier, PO"
        exportPath="/lots"
        summary={lots.data && `${counted(lots.data.total, 'lot')} · ${counted(lots.data.totals.quantity, 'piece')} · ${outcomeSummary(lots.data.totals)}`}
      >
        <FilterSelect
          label="State"
          value={filters.state}
          onChange={(value) => update({ state: value })}
          options={LOT_STATES.map((s) => ({ value: s, label: LOT_STATE_LABELS[s] }))}
        />
        {filters.purchaseOrderId && (
          <button
            type="button"
            className="self-center rounded border border-paper-line px-2 py-1 text-xs hover:bg-paper-sunk"
            onClick={() => update({ purchaseOrderId: undefined })}
          >
            One PO only ✕
          </button>
        )}
      </ListToolbar>
      {lots.error && <Notice tone="error">{lots.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={lots.data?.data ?? []}
        total={lots.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={lots.isPending}
        empty="No lot matches."
        onRowClick={(lot) => navigate(`/lots/${lot.id}`)}
      />
    </div>
  );
}
