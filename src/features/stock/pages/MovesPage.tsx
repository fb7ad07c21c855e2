import { useMemo } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { MOVE_REASONS, MOVE_REASON_LABELS, lotName, type MoveView } from '@shared/schemas/stock';
import { DataTable, useListState } from '@/components/DataTable';
import { FilterSelect, ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { counted } from '@/lib/plural';
import { useMoves } from '../api';
import { StockTabs } from '../components/StockTabs';
import { formatDateTime } from '@shared/format';

const column = createColumnHelper<MoveView>();
const place = (code: string | null, empty: string) => (code ? <span className="font-mono">{code}</span> : <span className="text-ink-faint">{empty}</span>);

/** The stock ledger: every move of every piece, newest first. Rows are only ever added. */
export function MovesPage() {
  const { state, update, params } = useListState({ sort: '-movedAt' });
  const filters = {
    reason: params.get('reason') ?? undefined,
    partId: params.get('partId') ?? undefined,
    locationId: params.get('locationId') ?? undefined,
    lotId: params.get('lotId') ?? undefined,
  };
  const moves = useMoves({ ...state, ...filters });
  const narrowed = filters.partId || filters.locationId || filters.lotId;
  const columns = useMemo(
    () => [
      column.accessor('movedAt', { header: 'When', cell: ({ getValue }) => formatDateTime(getValue()) }),
      column.accessor('serial', {
        header: 'Serial',
        cell: ({ getValue }) => (
          <Link to={`/pieces/${encodeURIComponent(getValue())}`} className="font-mono">
            {getValue()}
          </Link>
        ),
      }),
      column.accessor('partNumber', { header: 'Part', cell: ({ getValue }) => <span className="font-mono">{getValue()}</span> }),
      column.accessor('lotId', {
        header: 'Lot',
        enableSorting: false,
        cell: ({ getValue }) => (
          <Link to={`/lots/${getValue()}`} className="font-mono">
            {lotName(getValue())}
          </Link>
        ),
      }),
      column.accessor('reason', { header: 'Move', cell: ({ getValue }) => MOVE_REASON_LABELS[getValue()] }),
      column.accessor('from', { header: 'From', cell: ({ getValue }) => place(getValue(), 'supplier / work order') }),
      column.accessor('to', { header: 'To', cell: ({ getValue }) => place(getValue(), 'issued out') }),
      column.accessor('workOrder', { header: 'Work order', cell: ({ getValue }) => <span className="font-mono">{getValue() ?? ''}</span> }),
      column.accessor('actor', { header: 'By', enableSorting: false }),
    ],
    [],
  );
  return (
    <div>
      <PageHeader title="Stock" subtitle="The ledger of moves. On-hand is the sum of these rows; no row is ever changed or removed." />
      <StockTabs />
      <ListToolbar
        list={{ state, update }}
        filters={filters}
        placeholder="Serial, work order, location, part"
        exportPath="/stock/moves"
        summary={moves.data && counted(moves.data.total, 'move')}
      >
        <FilterSelect
          label="Move"
          value={filters.reason}
          onChange={(value) => update({ reason: value })}
          options={MOVE_REASONS.map((r) => ({ value: r, label: MOVE_REASON_LABELS[r] }))}
        />
        {narrowed && (
          <button
            type="button"
            className="self-center rounded border border-paper-line px-2 py-1 text-xs hover:bg-paper-sunk"
            onClick={() => update({ partId: undefined, locationId: undefined, lotId: undefined })}
          >
            Narrowed to one part, place or lot ✕
          </button>
        )}
      </ListToolbar>
      {moves.error && <Notice tone="error">{moves.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={moves.data?.data ?? []}
        total={moves.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={moves.isPending}
        empty="No move matches."
      />
    </div>
  );
}
