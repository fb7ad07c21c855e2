import { useMemo } from 'react';
import { useNavigate } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { SWITCHING_PHASES, SWITCHING_PHASE_LABELS, type SwitchingRow } from '@shared/schemas/switching';
import { DataTable, useListState } from '@/components/DataTable';
import { FilterSelect, ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { PartLabel } from '@/components/PartLabel';
import { counted } from '@/lib/plural';
import { useSwitchingList } from '../api';
import { PhaseBadge } from '@/components/PhaseBadge';
import { formatDate } from '@shared/format';

const column = createColumnHelper<SwitchingRow>();
const number = (value: number) => <span className="tabular-nums">{value}</span>;

export function SwitchingListPage() {
  const navigate = useNavigate();
  const { state, update, params } = useListState({ sort: 'supplierName' });
  const filters = { phase: params.get('phase') ?? undefined, supplierId: params.get('supplierId') ?? undefined };
  const list = useSwitchingList({ ...state, ...filters });
  const columns = useMemo(
    () => [
      column.accessor('supplierName', { header: 'Supplier' }),
      column.accessor('partNumber', {
        header: 'Part',
        cell: ({ row }) => <PartLabel number={row.original.partNumber} description={row.original.partDescription} />,
      }),
      column.accessor('phase', { header: 'Inspection', cell: ({ getValue }) => <PhaseBadge phase={getValue()} /> }),
      column.accessor('switchingScore', { header: 'Score', cell: ({ getValue }) => number(getValue()) }),
      column.accessor('consecutiveAccepted', { header: 'Accepted in a row', enableSorting: false, cell: ({ getValue }) => number(getValue()) }),
      column.accessor('tightenedCount', { header: 'Not accepted on tightened', enableSorting: false, cell: ({ getValue }) => number(getValue()) }),
      column.accessor('waitingLots', {
        header: 'Lots waiting',
        enableSorting: false,
        cell: ({ getValue }) => (getValue() > 0 ? <span className="font-medium text-state-fail">{getValue()}</span> : number(0)),
      }),
      column.accessor('changedAt', {
        header: 'Last event',
        enableSorting: false,
        cell: ({ getValue }) => (getValue() ? formatDate(getValue()!) : '—'),
      }),
    ],
    [],
  );
  return (
    <div>
      <PageHeader
        title="Switching"
        subtitle="The inspection severity of each part from each supplier under the ISO 2859-1 switching rules, and where acceptance is discontinued."
      />
      <ListToolbar
        list={{ state, update }}
        filters={filters}
        placeholder="Supplier or part"
        exportPath="/switching"
        summary={list.data && counted(list.data.total, 'supplier and part', 'suppliers and parts')}
      >
        <FilterSelect
          label="Inspection"
          value={filters.phase}
          onChange={(value) => update({ phase: value })}
          options={SWITCHING_PHASES.map((p) => ({ value: p, label: SWITCHING_PHASE_LABELS[p] }))}
        />
        {filters.supplierId && (
          <button
            type="button"
            className="self-center rounded border border-paper-line px-2 py-1 text-xs hover:bg-paper-sunk"
            onClick={() => update({ supplierId: undefined })}
          >
            One supplier only ✕
          </button>
        )}
      </ListToolbar>
      {list.error && <Notice tone="error">{list.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={list.data?.data ?? []}
        total={list.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={list.isPending}
        empty="No supplier and part matches."
        onRowClick={(row) => navigate(`/switching/${row.supplierId}/${row.partId}`)}
      />
    </div>
  );
}
