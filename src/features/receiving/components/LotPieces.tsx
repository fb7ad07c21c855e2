import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import type { LotView } from '@shared/schemas/receiving';
import { PIECE_STATE_LABELS } from '@shared/schemas/stock';
import { DataTable, type ListState } from '@/components/DataTable';
import { StateBadge } from '@/components/StateBadge';

type Piece = LotView['pieces'][number];
const column = createColumnHelper<Piece>();

/** The lot's pieces, paged in the browser (the lot page already holds them all). */
export function LotPieces({ pieces }: { pieces: Piece[] }) {
  const [state, setState] = useState<ListState>({ page: 1, pageSize: 25, sort: 'serial' });
  const columns = useMemo(
    () => [
      column.accessor('serial', {
        header: 'Serial',
        cell: ({ getValue }) => (
          <Link to={`/pieces/${encodeURIComponent(getValue())}`} className="font-mono">
            {getValue()}
          </Link>
        ),
      }),
      column.accessor('state', { header: 'State', cell: ({ getValue }) => <StateBadge state={getValue()} label={PIECE_STATE_LABELS[getValue()]} /> }),
      column.accessor('location', { header: 'Location', cell: ({ getValue }) => <span className="font-mono text-xs">{getValue() ?? 'issued out'}</span> }),
    ],
    [],
  );
  const rows = useMemo(() => {
    const key = (state.sort ?? 'serial').replace(/^-/, '') as keyof Piece;
    const sorted = [...pieces].sort(
      (a, b) => String(a[key] ?? '').localeCompare(String(b[key] ?? ''), undefined, { numeric: true }) * (state.sort?.startsWith('-') ? -1 : 1),
    );
    return sorted.slice((state.page - 1) * state.pageSize, state.page * state.pageSize);
  }, [pieces, state]);
  return <DataTable columns={columns} data={rows} total={pieces.length} state={state} onChange={(patch) => setState((s) => ({ ...s, page: 1, ...patch }))} />;
}
