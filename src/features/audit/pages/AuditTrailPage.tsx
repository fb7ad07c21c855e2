import { createColumnHelper } from '@tanstack/react-table';
import { FileDown } from 'lucide-react';
import type { AuditEventView } from '@shared/schemas/audit';
import { DataTable, useListState } from '@/components/DataTable';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { apiUrl } from '@/lib/api';
import { useAuditEvents } from '../api';
import { ChainAnchor } from '../components/ChainAnchor';
import { ChainCheck } from '../components/ChainCheck';
import { FilterBar } from '../components/FilterBar';

const FILTERS = ['from', 'to', 'action', 'entityType', 'entityId', 'actor', 'q'] as const;

function Change({ label, value }: { label: string; value: unknown }) {
  if (value === null || value === undefined) return null;
  return (
    <details className="text-xs">
      <summary className="cursor-pointer text-ink-muted">{label}</summary>
      <pre className="mt-1 max-h-64 max-w-xl overflow-auto rounded bg-paper-sunk p-2 font-mono text-2xs">{JSON.stringify(value, null, 2)}</pre>
    </details>
  );
}

const column = createColumnHelper<AuditEventView>();
const columns = [
  column.accessor('occurredAt', { header: 'When', cell: ({ getValue }) => <span className="whitespace-nowrap">{new Date(getValue()).toLocaleString()}</span> }),
  column.display({
    id: 'actor',
    header: 'Who',
    cell: ({ row: { original: e } }) => (
      <>
        {e.actorEmail ?? '—'}
        {e.actorRoles.length > 0 && <span className="block text-xs text-ink-muted">{e.actorRoles.join(', ')}</span>}
      </>
    ),
  }),
  column.display({ id: 'action', header: 'Action', cell: ({ row }) => <span className="font-mono text-xs">{row.original.action}</span> }),
  column.display({
    id: 'entity',
    header: 'Record',
    cell: ({ row: { original: e } }) => (
      <span className="whitespace-nowrap">
        {e.entityType}
        {e.entityId ? ` ${e.entityId}` : ''}
      </span>
    ),
  }),
  column.display({
    id: 'change',
    header: 'Before / after',
    cell: ({ row: { original: e } }) => (
      <>
        <Change label="before" value={e.before} />
        <Change label="after" value={e.after} />
      </>
    ),
  }),
  column.display({
    id: 'origin',
    header: 'Request',
    cell: ({ row: { original: e } }) => (
      <span className="font-mono text-2xs text-ink-muted">
        {e.address}
        <span className="block">{e.requestId}</span>
      </span>
    ),
  }),
  column.display({
    id: 'hash',
    header: 'Digest',
    cell: ({ row }) => (
      <span className="font-mono text-2xs text-ink-muted" title={row.original.hash}>
        #{row.original.seq} · {row.original.hash.slice(0, 10)}…
      </span>
    ),
  }),
];

export function AuditTrailPage() {
  const { state, update, params } = useListState({ pageSize: 50 });
  const filter = Object.fromEntries(FILTERS.map((key) => [key, params.get(key) ?? undefined]));
  const events = useAuditEvents({ ...state, ...filter });
  const input = (name: (typeof FILTERS)[number], label: string, props: { type?: string; placeholder?: string; className?: string } = {}) => (
    <Field label={label} htmlFor={`audit-${name}`}>
      <input
        id={`audit-${name}`}
        name={name}
        defaultValue={filter[name]}
        type={props.type ?? 'text'}
        placeholder={props.placeholder}
        className={`${inputClass} ${props.className ?? 'w-40'}`}
      />
    </Field>
  );
  return (
    <div>
      <PageHeader
        title="Audit trail"
        subtitle="Every recorded change, append-only and chained by SHA-256: who, when, from where, and the record before and after."
        actions={
          <a
            href={apiUrl('/audit/export.csv', filter)}
            download
            className="inline-flex items-center gap-1.5 rounded border border-paper-line bg-paper-card px-3 py-1.5 text-sm font-medium text-ink no-underline hover:bg-paper-sunk"
          >
            <FileDown className="h-4 w-4" aria-hidden /> Export CSV
          </a>
        }
      />
      <div className="mb-3 space-y-3">
        <ChainAnchor />
        <ChainCheck />
      </div>
      <FilterBar
        key={params.toString()}
        label="Filter events"
        onApply={update}
        onClear={() => update(Object.fromEntries(FILTERS.map((key) => [key, undefined])))}
      >
        {input('from', 'From', { type: 'date', className: '' })}
        {input('to', 'To', { type: 'date', className: '' })}
        {input('action', 'Action starts with', { placeholder: 'disposition.' })}
        {input('entityType', 'Record type', { placeholder: 'lot' })}
        {input('entityId', 'Record id', { className: 'w-24' })}
        {input('actor', 'Actor e-mail')}
        {input('q', 'Search', { className: 'w-48' })}
      </FilterBar>
      {events.error && <Notice tone="error">{events.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={events.data?.data ?? []}
        total={events.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={events.isPending}
        empty="No event matches this filter."
      />
    </div>
  );
}
