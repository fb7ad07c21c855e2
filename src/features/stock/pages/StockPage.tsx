import { useMemo } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { LOCATION_KINDS, LOCATION_KIND_LABELS, type StockRow } from '@shared/schemas/stock';
import { DataTable, useListState } from '@/components/DataTable';
import { FilterSelect, ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { PartLabel } from '@/components/PartLabel';
import { StateBadge } from '@/components/StateBadge';
import { counted } from '@/lib/plural';
import { useLocations, useOnHand, useStockParts } from '../api';
import { StockTabs } from '../components/StockTabs';

const column = createColumnHelper<StockRow>();

export function StockPage() {
  const { state, update, params } = useListState({ sort: 'partNumber' });
  const filters = { partId: params.get('partId') ?? undefined, kind: params.get('kind') ?? undefined, locationId: params.get('locationId') ?? undefined };
  const stock = useOnHand({ ...state, ...filters });
  const parts = useStockParts();
  const locations = useLocations();
  const columns = useMemo(
    () => [
      column.accessor('partNumber', {
        header: 'Part',
        cell: ({ row }) => <PartLabel number={row.original.partNumber} description={row.original.partDescription} />,
      }),
      column.accessor('locationCode', { header: 'Location', cell: ({ getValue }) => <span className="font-mono">{getValue()}</span> }),
      column.accessor('locationKind', { header: 'Kind', cell: ({ getValue }) => <StateBadge state={getValue()} label={LOCATION_KIND_LABELS[getValue()]} /> }),
      column.accessor('onHand', {
        header: 'On hand',
        cell: ({ row }) => (
          <Link
            to={`/stock/moves?partId=${row.original.partId}&locationId=${row.original.locationId}`}
            onClick={(e) => e.stopPropagation()}
            className="tabular-nums"
          >
            {row.original.onHand}
          </Link>
        ),
      }),
    ],
    [],
  );
  return (
    <div>
      <PageHeader title="Stock" subtitle="Pieces counted where their latest move put them, by part and location. Issued pieces have left stores." />
      <StockTabs />
      <ListToolbar
        list={{ state, update }}
        filters={filters}
        placeholder="Search part or location"
        exportPath="/stock"
        summary={stock.data && `${counted(stock.data.totals.onHand, 'piece')} in ${counted(stock.data.total, 'place')}`}
      >
        <FilterSelect
          label="Part"
          value={filters.partId}
          onChange={(value) => update({ partId: value })}
          options={(parts.data?.data ?? []).map((p) => ({ value: String(p.id), label: p.number }))}
        />
        <FilterSelect
          label="Kind"
          value={filters.kind}
          onChange={(value) => update({ kind: value })}
          options={LOCATION_KINDS.map((k) => ({ value: k, label: LOCATION_KIND_LABELS[k] }))}
        />
        <FilterSelect
          label="Location"
          value={filters.locationId}
          onChange={(value) => update({ locationId: value })}
          options={(locations.data?.data ?? []).map((l) => ({ value: String(l.id), label: l.code }))}
        />
      </ListToolbar>
      {stock.error && <Notice tone="error">{stock.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={stock.data?.data ?? []}
        total={stock.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={stock.isPending}
        empty="Nothing is on hand for this filter."
      />
    </div>
  );
}
