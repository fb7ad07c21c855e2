import { useMemo } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { FilePlus2 } from 'lucide-react';
import { can } from '@shared/policies';
import { NCR_ORIGINS, NCR_ORIGIN_LABELS, NCR_STATUSES, NCR_STATUS_LABELS, type NcrRow } from '@shared/schemas/nonconformance';
import { lotName } from '@shared/schemas/stock';
import { DataTable, useListState } from '@/components/DataTable';
import { FilterSelect, ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { StateBadge } from '@/components/StateBadge';
import { counted } from '@/lib/plural';
import { useSession } from '@/lib/session';
import { useNcrList } from '../api';
import { NcrTabs } from '../components/NcrTabs';
import { formatDate } from '@shared/format';

const column = createColumnHelper<NcrRow>();

export function NcrListPage() {
  const navigate = useNavigate();
  const { data: user } = useSession();
  const { state, update, params } = useListState({ sort: '-openedAt' });
  const filters = { status: params.get('status') ?? undefined, origin: params.get('origin') ?? undefined };
  const list = useNcrList({ ...state, ...filters });
  const columns = useMemo(
    () => [
      column.accessor('number', { header: 'NCR', cell: ({ getValue }) => <span className="font-mono whitespace-nowrap">{getValue()}</span> }),
      column.accessor('status', { header: 'Status', cell: ({ getValue }) => <StateBadge state={getValue()} label={NCR_STATUS_LABELS[getValue()]} /> }),
      column.accessor('supplierName', { header: 'Supplier' }),
      column.accessor('partNumber', { header: 'Part', cell: ({ getValue }) => <span className="font-mono whitespace-nowrap">{getValue()}</span> }),
      column.accessor('lotId', {
        header: 'Lot',
        enableSorting: false,
        cell: ({ getValue }) => (getValue() ? <span className="font-mono whitespace-nowrap">{lotName(getValue()!)}</span> : '—'),
      }),
      column.accessor('origin', { header: 'Origin', enableSorting: false, cell: ({ getValue }) => NCR_ORIGIN_LABELS[getValue()] }),
      column.accessor('defects', {
        header: 'Defects',
        enableSorting: false,
        cell: ({ getValue }) => <span className="text-xs text-ink-muted">{getValue().join(', ') || '—'}</span>,
      }),
      column.accessor('pieces', { header: 'Pieces', cell: ({ getValue }) => <span className="tabular-nums">{getValue()}</span> }),
      column.accessor('awaiting', {
        header: 'Awaiting disposition',
        cell: ({ getValue }) => <span className={`tabular-nums ${getValue() > 0 ? 'font-medium text-state-fail' : 'text-ink-faint'}`}>{getValue()}</span>,
      }),
      column.accessor('owner', { header: 'Owner', enableSorting: false, cell: ({ getValue }) => getValue() ?? '—' }),
      column.accessor('openedAt', { header: 'Opened', cell: ({ getValue }) => formatDate(getValue()) }),
    ],
    [],
  );
  return (
    <div>
      <PageHeader
        title="Nonconformance"
        subtitle="Material set aside by lot decisions or found later, its disposition piece by piece, and what goes back to the supplier."
        actions={
          can(user, 'nonconformance.open') && (
            <Link
              to="/nonconformances/new"
              className="inline-flex items-center gap-1.5 rounded bg-frame px-3 py-1.5 text-sm font-medium text-white no-underline hover:bg-frame-deep"
            >
              <FilePlus2 className="h-4 w-4" aria-hidden /> Open an NCR
            </Link>
          )
        }
      />
      <NcrTabs />
      <ListToolbar
        list={{ state, update }}
        filters={filters}
        placeholder="NCR, supplier, part, lot or serial"
        exportPath="/nonconformances"
        summary={list.data && `${counted(list.data.total, 'NCR')} · ${list.data.totals.awaiting ?? 0} pieces awaiting disposition`}
      >
        <FilterSelect
          label="Status"
          value={filters.status}
          onChange={(value) => update({ status: value })}
          options={NCR_STATUSES.map((s) => ({ value: s, label: NCR_STATUS_LABELS[s] }))}
        />
        <FilterSelect
          label="Origin"
          value={filters.origin}
          onChange={(value) => update({ origin: value })}
          options={NCR_ORIGINS.map((o) => ({ value: o, label: NCR_ORIGIN_LABELS[o] }))}
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
        empty="No NCR matches."
        onRowClick={(row) => navigate(`/nonconformances/${row.id}`)}
      />
    </div>
  );
}
