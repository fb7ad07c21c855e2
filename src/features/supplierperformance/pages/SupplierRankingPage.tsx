// Every supplier's scorecard over a period, ranked by lot acceptance, then nonconforming pieces per
// million, then on-time delivery; a row opens the supplier's page for the same period.
import { useMemo } from 'react';
import { useNavigate } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { resolvePeriod, type SupplierRankingRow } from '@shared/schemas/supplierPerformance';
import { DataTable, useListState } from '@/components/DataTable';
import { ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { counted } from '@/lib/plural';
import { useSupplierRanking } from '../api';
import { percent, whole } from '../components/format';
import { PeriodPicker } from '../components/PeriodPicker';

const column = createColumnHelper<SupplierRankingRow>();
const number = (value: number) => <span className="tabular-nums">{value}</span>;

export function SupplierRankingPage() {
  const navigate = useNavigate();
  const { state, update, params } = useListState({ sort: 'rank' });
  const chosen = { from: params.get('from') ?? undefined, to: params.get('to') ?? undefined };
  const list = useSupplierRanking({ ...state, ...chosen });
  const columns = useMemo(
    () => [
      column.accessor('rank', {
        header: 'Rank',
        cell: ({ getValue }) => (getValue() === null ? <span className="text-ink-faint">—</span> : number(getValue()!)),
      }),
      column.accessor((r) => r.supplier.name, {
        id: 'name',
        header: 'Supplier',
        cell: ({ row }) => <span className={row.original.supplier.active ? '' : 'text-ink-muted'}>{row.original.supplier.name}</span>,
      }),
      column.accessor('lotsReceived', {
        header: 'Lots',
        cell: ({ row }) => (
          <span className="tabular-nums">
            {row.original.lotsReceived} <span className="text-ink-faint">({row.original.lotsDecided} decided)</span>
          </span>
        ),
      }),
      column.accessor('acceptanceRate', { header: 'Accepted', cell: ({ getValue }) => <span className="tabular-nums">{percent(getValue())}</span> }),
      column.accessor('ppm', {
        header: 'Nonconforming',
        cell: ({ getValue }) => <span className="tabular-nums">{getValue() === null ? '—' : `${whole(getValue())} ppm`}</span>,
      }),
      column.accessor('onTimeRate', { header: 'On time', cell: ({ getValue }) => <span className="tabular-nums">{percent(getValue())}</span> }),
      column.accessor('openNcrs', { header: 'Open NCRs', cell: ({ getValue }) => number(getValue()) }),
      column.accessor('openCorrectiveActions', { header: 'Open CARs', cell: ({ getValue }) => number(getValue()) }),
      column.accessor('alarms', {
        header: 'Drift alarms',
        cell: ({ getValue }) => (getValue() > 0 ? <span className="font-medium text-state-quarantine">{getValue()}</span> : number(0)),
      }),
    ],
    [],
  );
  const period = list.data?.data[0]?.period ?? resolvePeriod(chosen);
  return (
    <div>
      <PageHeader
        title="Supplier performance"
        subtitle="Lots received in the period, ranked by lot acceptance, then nonconforming pieces per million, then on-time delivery. Suppliers without a decided lot are listed unranked."
      />
      <div className="mb-3">
        <PeriodPicker period={period} chosen={chosen} onChange={(patch) => update(patch)} />
      </div>
      <ListToolbar
        list={{ state, update }}
        filters={chosen}
        placeholder="Supplier"
        exportPath="/supplier-scorecards"
        summary={list.data && counted(list.data.total, 'supplier')}
      />
      {list.error && <Notice tone="error">{list.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={list.data?.data ?? []}
        total={list.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={list.isPending}
        empty="No supplier matches."
        onRowClick={(row) =>
          navigate({
            pathname: `/supplier-performance/${row.supplier.id}`,
            search: new URLSearchParams(Object.entries(chosen).filter((e): e is [string, string] => !!e[1])).toString(),
          })
        }
      />
    </div>
  );
}
