import { useMemo } from 'react';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { Plus } from 'lucide-react';
import { can } from '@shared/policies';
import { DEVIATION_STATUSES, DEVIATION_STATUS_LABELS, type DeviationRow } from '@shared/schemas/deviations';
import { Button } from '@/components/Button';
import { DataTable, useListState } from '@/components/DataTable';
import { FilterSelect, ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { counted } from '@/lib/plural';
import { useSession } from '@/lib/session';
import { useDeviations } from '../api';
import { DeviationBadge } from '../components/Badges';
import { DeviationForm } from '../components/DeviationForm';

const column = createColumnHelper<DeviationRow>();
const optionalNumber = (value: string | null) => (value ? Number(value) : undefined);

/** The deviation register; `/deviations/new?supplierId=&partId=` opens the form for that supplier's part. */
export function DeviationsPage({ writing = false }: { writing?: boolean }) {
  const navigate = useNavigate();
  const [search] = useSearchParams();
  const { data: user } = useSession();
  const mayWrite = can(user, 'deviations.manage');
  const { state, update, params } = useListState({ sort: '-createdAt' });
  const filters = { status: params.get('status') ?? undefined };
  const list = useDeviations({ ...state, ...filters });
  const columns = useMemo(
    () => [
      column.accessor('number', { header: 'Deviation', cell: ({ getValue }) => <span className="font-mono font-medium whitespace-nowrap">{getValue()}</span> }),
      column.accessor((d) => d.supplier.name, { id: 'supplier', header: 'Supplier' }),
      column.accessor((d) => d.part.number, { id: 'part', header: 'Part' }),
      column.accessor('allowed', {
        header: 'Allows',
        enableSorting: false,
        cell: ({ getValue }) => <span className="line-clamp-2 text-xs text-ink-muted">{getValue()}</span>,
      }),
      column.accessor('quantityLeft', {
        header: 'Pieces left',
        cell: ({ row }) => (
          <span className="tabular-nums">{row.original.quantityLimit === null ? '—' : `${row.original.quantityLeft} of ${row.original.quantityLimit}`}</span>
        ),
      }),
      column.accessor('expiresOn', { header: 'Last day', cell: ({ getValue }) => getValue() ?? '—' }),
      column.accessor('status', { header: 'Standing', cell: ({ getValue }) => <DeviationBadge status={getValue()} /> }),
    ],
    [],
  );
  return (
    <div>
      <PageHeader
        title="Deviations"
        subtitle="What a supplier's part may deviate by, for how many pieces and until when. A lot or NCR is used as is only under a current deviation."
        actions={
          mayWrite &&
          !writing && (
            <Button onClick={() => navigate('/deviations/new')}>
              <Plus className="h-4 w-4" aria-hidden /> New deviation
            </Button>
          )
        }
      />
      {writing && mayWrite && (
        <DeviationForm
          preset={{ supplierId: optionalNumber(search.get('supplierId')), partId: optionalNumber(search.get('partId')) }}
          onSaved={(saved) => navigate(`/deviations/${saved.id}`)}
          onCancel={() => navigate('/deviations')}
        />
      )}
      <ListToolbar
        list={{ state, update }}
        filters={filters}
        placeholder="Number, supplier, part or text"
        exportPath="/deviations"
        summary={list.data && counted(list.data.total, 'deviation')}
      >
        <FilterSelect
          label="Standing"
          value={filters.status}
          onChange={(value) => update({ status: value })}
          options={DEVIATION_STATUSES.map((s) => ({ value: s, label: DEVIATION_STATUS_LABELS[s] }))}
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
        empty="No deviation matches."
        onRowClick={(row) => navigate(`/deviations/${row.id}`)}
      />
    </div>
  );
}
