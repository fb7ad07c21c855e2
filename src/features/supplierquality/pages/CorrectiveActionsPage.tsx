import { useMemo } from 'react';
import { useNavigate } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { Plus } from 'lucide-react';
import { can } from '@shared/policies';
import { CAR_STATUSES, CAR_STATUS_LABELS, type CarRow } from '@shared/schemas/correctiveActions';
import { Button } from '@/components/Button';
import { DataTable, useListState } from '@/components/DataTable';
import { FilterSelect, ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { counted } from '@/lib/plural';
import { useSession } from '@/lib/session';
import { useCorrectiveActions } from '../api';
import { RequestBadge } from '../components/Badges';

const column = createColumnHelper<CarRow>();

export function CorrectiveActionsPage() {
  const navigate = useNavigate();
  const { data: user } = useSession();
  const { state, update, params } = useListState({ sort: '-requestedAt' });
  const filters = { status: params.get('status') ?? undefined, overdue: params.get('overdue') ?? undefined };
  const list = useCorrectiveActions({ ...state, ...filters });
  const columns = useMemo(
    () => [
      column.accessor('number', { header: 'Request', cell: ({ getValue }) => <span className="font-mono font-medium whitespace-nowrap">{getValue()}</span> }),
      column.accessor((c) => c.supplier.name, { id: 'supplier', header: 'Supplier' }),
      column.accessor((c) => c.part.number, { id: 'part', header: 'Part' }),
      column.accessor('ncrs', {
        header: 'NCRs',
        enableSorting: false,
        cell: ({ getValue }) => <span className="font-mono text-xs">{getValue().join(', ')}</span>,
      }),
      column.accessor('responseDueOn', { header: 'Answer due' }),
      column.accessor('status', { header: 'Standing', cell: ({ row }) => <RequestBadge status={row.original.status} overdue={row.original.overdue} /> }),
    ],
    [],
  );
  return (
    <div>
      <PageHeader
        title="Corrective actions"
        subtitle="Requests to suppliers to find and remove the cause of a nonconformance: answered through a mailed link, reviewed by quality, verified on the lots that follow."
        actions={
          can(user, 'corrective.manage') && (
            <Button onClick={() => navigate('/corrective-actions/new')}>
              <Plus className="h-4 w-4" aria-hidden /> New request
            </Button>
          )
        }
      />
      <ListToolbar
        list={{ state, update }}
        filters={filters}
        placeholder="Number, supplier, part, NCR or text"
        exportPath="/corrective-actions"
        summary={list.data && counted(list.data.total, 'request')}
      >
        <FilterSelect
          label="Standing"
          value={filters.status}
          onChange={(value) => update({ status: value })}
          options={CAR_STATUSES.map((s) => ({ value: s, label: CAR_STATUS_LABELS[s] }))}
        />
        <FilterSelect
          label="Due date"
          value={filters.overdue}
          onChange={(value) => update({ overdue: value })}
          options={[
            { value: 'true', label: 'Overdue' },
            { value: 'false', label: 'Not overdue' },
          ]}
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
        empty="No request matches."
        onRowClick={(row) => navigate(`/corrective-actions/${row.id}`)}
      />
    </div>
  );
}
