import { useMemo } from 'react';
import { useNavigate } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { REMEDIES, REMEDY_LABELS, type ReturnRow } from '@shared/schemas/nonconformance';
import { DataTable, useListState } from '@/components/DataTable';
import { FilterSelect, ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { counted } from '@/lib/plural';
import { useReturnList } from '../api';
import { NcrTabs } from '../components/NcrTabs';

const column = createColumnHelper<ReturnRow>();
const money = (amount: number | null, currency: string | null) => (amount === null ? '—' : `${amount.toFixed(2)} ${currency ?? ''}`.trim());

export function ReturnsPage() {
  const navigate = useNavigate();
  const { state, update, params } = useListState({ sort: '-shipDate' });
  const filters = { remedy: params.get('remedy') ?? undefined };
  const list = useReturnList({ ...state, ...filters });
  const columns = useMemo(
    () => [
      column.accessor('rmaNumber', { header: 'RMA', cell: ({ getValue }) => <span className="font-mono whitespace-nowrap">{getValue()}</span> }),
      column.accessor('ncrNumber', { header: 'NCR', cell: ({ getValue }) => <span className="font-mono whitespace-nowrap">{getValue()}</span> }),
      column.accessor('supplierName', { header: 'Supplier' }),
      column.accessor('shipDate', { header: 'Shipped' }),
      column.accessor('carrier', {
        header: 'Carrier',
        enableSorting: false,
        cell: ({ row }) => `${row.original.carrier}${row.original.tracking ? ` · ${row.original.tracking}` : ''}`,
      }),
      column.accessor('remedy', { header: 'For', cell: ({ getValue }) => REMEDY_LABELS[getValue()] }),
      column.accessor('creditAmount', {
        header: 'Credit expected',
        enableSorting: false,
        cell: ({ row }) => money(row.original.creditAmount, row.original.currency),
      }),
      column.accessor('pieces', { header: 'Pieces', cell: ({ getValue }) => <span className="tabular-nums">{getValue()}</span> }),
      column.accessor('replaced', {
        header: 'Replaced',
        enableSorting: false,
        cell: ({ row }) =>
          row.original.remedy === 'replacement' ? <span className="tabular-nums">{row.original.replaced}</span> : <span className="text-ink-faint">—</span>,
      }),
    ],
    [],
  );
  return (
    <div>
      <PageHeader title="Nonconformance" subtitle="Pieces shipped back to suppliers under their return authorisation (RMA), for a credit or a replacement." />
      <NcrTabs />
      <ListToolbar
        list={{ state, update }}
        filters={filters}
        placeholder="RMA, NCR, supplier or carrier"
        exportPath="/returns"
        summary={list.data && `${counted(list.data.total, 'return')} · ${list.data.totals.pieces ?? 0} pieces`}
      >
        <FilterSelect
          label="For"
          value={filters.remedy}
          onChange={(value) => update({ remedy: value })}
          options={REMEDIES.map((r) => ({ value: r, label: REMEDY_LABELS[r] }))}
        />
      </ListToolbar>
      {list.error && <Notice tone="error">{list.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={list.data?.data ?? []}
        total={list.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={list.isPending}
        empty="Nothing has been shipped back."
        onRowClick={(row) => navigate(`/nonconformances/${row.nonconformanceId}`)}
      />
    </div>
  );
}
