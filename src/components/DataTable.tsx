// The app's table: TanStack Table driven by the server (paging and sorting happen in the API), with a
// dense layout, sortable headers and a pager. State lives in the URL through useListState.
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef, type SortingState } from '@tanstack/react-table';
import { ArrowDown, ArrowUp, ChevronLeft, ChevronRight } from 'lucide-react';
import { useSearchParams } from 'react-router-dom';

export type ListState = { page: number; pageSize: number; sort?: string; q?: string };

/** Paging, sorting and search kept in the address bar, so a filtered list can be bookmarked. */
export function useListState(defaults: Partial<ListState> = {}) {
  const [params, setParams] = useSearchParams();
  const state: ListState = {
    page: Number(params.get('page') ?? 1),
    pageSize: Number(params.get('pageSize') ?? defaults.pageSize ?? 50),
    sort: params.get('sort') ?? defaults.sort,
    q: params.get('q') ?? undefined,
  };
  const update = (patch: Partial<ListState> & Record<string, string | number | undefined>) => {
    setParams((previous) => {
      const next = new URLSearchParams(previous);
      for (const [key, value] of Object.entries(patch)) {
        if (value === undefined || value === '') next.delete(key);
        else next.set(key, String(value));
      }
      if (!('page' in patch)) next.delete('page');
      return next;
    });
  };
  return { state, update, params };
}

type Props<T> = {
  // Accessor columns each have their own value type; TanStack types such a list as ColumnDef<T, any>.
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  columns: ColumnDef<T, any>[];
  data: T[];
  total: number;
  state: ListState;
  onChange: (patch: Partial<ListState>) => void;
  isLoading?: boolean;
  empty?: string;
  onRowClick?: (row: T) => void;
};

function toSorting(sort?: string): SortingState {
  if (!sort) return [];
  return [{ id: sort.replace(/^-/, ''), desc: sort.startsWith('-') }];
}

export function DataTable<T>({ columns, data, total, state, onChange, isLoading, empty = 'Nothing to show', onRowClick }: Props<T>) {
  const table = useReactTable({
    data,
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualPagination: true,
    manualSorting: true,
    rowCount: total,
    state: { sorting: toSorting(state.sort), pagination: { pageIndex: state.page - 1, pageSize: state.pageSize } },
    onSortingChange: (updater) => {
      const next = typeof updater === 'function' ? updater(toSorting(state.sort)) : updater;
      onChange({ sort: next[0] ? `${next[0].desc ? '-' : ''}${next[0].id}` : undefined });
    },
  });
  const pages = Math.max(1, Math.ceil(total / state.pageSize));
  const first = total === 0 ? 0 : (state.page - 1) * state.pageSize + 1;
  const last = Math.min(total, state.page * state.pageSize);

  return (
    <div className="overflow-hidden rounded border border-paper-line bg-paper-card">
      <div className="relative overflow-x-auto">
        {/* Each column keeps room for a word or two, and identifiers (set in mono) stay whole: on a phone
            the table scrolls sideways instead of breaking every cell into a tall column of fragments. */}
        <table className="w-full border-collapse text-sm [&_.font-mono]:whitespace-nowrap" style={{ minWidth: `${columns.length * 5}rem` }}>
          <thead className="bg-paper-sunk text-left text-xs text-ink-muted">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const canSort = header.column.getCanSort();
                  return (
                    <th key={header.id} className="border-b border-paper-line px-2.5 py-1.5 font-medium whitespace-nowrap">
                      {canSort ? (
                        <button type="button" className="inline-flex items-center gap-1 hover:text-ink" onClick={header.column.getToggleSortingHandler()}>
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          {sorted === 'asc' && <ArrowUp className="h-3 w-3" aria-label="ascending" />}
                          {sorted === 'desc' && <ArrowDown className="h-3 w-3" aria-label="descending" />}
                        </button>
                      ) : (
                        flexRender(header.column.columnDef.header, header.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr
                key={row.id}
                className={`border-b border-paper-line/70 last:border-0 hover:bg-paper ${onRowClick ? 'cursor-pointer' : ''}`}
                onClick={onRowClick ? () => onRowClick(row.original) : undefined}
              >
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-2.5 py-1 align-top">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {data.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-2.5 py-6 text-center text-ink-faint">
                  {isLoading ? 'Loading…' : empty}
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      <div className="flex items-center justify-between border-t border-paper-line bg-paper px-2.5 py-1.5 text-xs text-ink-muted">
        <span>
          {first}–{last} of {total}
        </span>
        <div className="flex items-center gap-1">
          <button
            type="button"
            aria-label="Previous page"
            className="rounded p-1 hover:bg-paper-sunk disabled:opacity-40"
            disabled={state.page <= 1}
            onClick={() => onChange({ page: state.page - 1 })}
          >
            <ChevronLeft className="h-4 w-4" />
          </button>
          <span>
            page {state.page} / {pages}
          </span>
          <button
            type="button"
            aria-label="Next page"
            className="rounded p-1 hover:bg-paper-sunk disabled:opacity-40"
            disabled={state.page >= pages}
            onClick={() => onChange({ page: state.page + 1 })}
          >
            <ChevronRight className="h-4 w-4" />
          </button>
        </div>
      </div>
    </div>
  );
}
