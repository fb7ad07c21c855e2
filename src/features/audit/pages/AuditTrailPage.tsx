import { useMemo, type ReactNode } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { FileDown } from 'lucide-react';
import { ACTION_GROUP_LABELS, ACTION_LABELS, actionWords, changedFields, recordTypeWords } from '@shared/auditWords';
import { formatDateTime, plural } from '@shared/format';
import type { AuditEventView } from '@shared/schemas/audit';
import { ROLE_LABELS, type Role } from '@shared/schemas/roles';
import { lotName } from '@shared/schemas/stock';
import { DataTable, useListState } from '@/components/DataTable';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { apiUrl } from '@/lib/api';
import { useAuditChoices, useAuditEvents } from '../api';
import { ChainAnchor } from '../components/ChainAnchor';
import { ChainCheck } from '../components/ChainCheck';
import { FilterBar } from '../components/FilterBar';

const FILTERS = ['from', 'to', 'action', 'entityType', 'entityId', 'actor', 'q'] as const;

/** The change an event records, field by field: what each field was and what it became. */
function Difference({ before, after }: { before: unknown; after: unknown }) {
  const changes = changedFields(before, after);
  if (changes.length === 0) return <span className="text-xs text-ink-faint">no field changed</span>;
  const created = before === null || before === undefined;
  return (
    <details className="text-xs" open={changes.length <= 4}>
      <summary className="cursor-pointer text-ink-muted">
        {created ? plural(changes.length, 'field recorded', 'fields recorded') : plural(changes.length, 'field changed', 'fields changed')}
      </summary>
      <table className="mt-1 max-w-xl" aria-label="Changed fields">
        <tbody>
          {changes.map((c) => (
            <tr key={c.path} className="align-top">
              <th scope="row" className="pr-2 text-left font-medium whitespace-nowrap">
                {c.label}
              </th>
              <td className="break-words">
                {!created && (
                  <>
                    <del className="text-ink-muted decoration-ink-faint">{c.before}</del> <span className="text-ink-faint">→</span>{' '}
                  </>
                )}
                {c.after === '—' && !created ? <span className="text-ink-muted">removed</span> : c.after}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </details>
  );
}

const column = createColumnHelper<AuditEventView>();
const columnsFor = (names: Map<string, string>) => [
  column.accessor('occurredAt', { header: 'When', cell: ({ getValue }) => <span className="whitespace-nowrap">{formatDateTime(getValue())}</span> }),
  column.display({
    id: 'actor',
    header: 'Who',
    cell: ({ row: { original: e } }) => (
      <>
        {e.actorEmail ? (names.get(e.actorEmail) ?? e.actorEmail) : 'Phaselot (no user)'}
        {e.actorEmail && names.has(e.actorEmail) && <span className="block text-xs text-ink-muted">{e.actorEmail}</span>}
        {e.actorRoles.length > 0 && <span className="block text-xs text-ink-muted">{e.actorRoles.map((r) => ROLE_LABELS[r as Role] ?? r).join(', ')}</span>}
      </>
    ),
  }),
  column.display({
    id: 'action',
    header: 'Action',
    cell: ({ row }) => <span title={row.original.action}>{actionWords(row.original.action)}</span>,
  }),
  column.display({
    id: 'entity',
    header: 'Record',
    cell: ({ row: { original: e } }) => (
      <span className="whitespace-nowrap" title={e.entityType}>
        {recordTypeWords(e.entityType)}
        {e.entityId ? ` ${e.entityType === 'lot' && /^\d+$/.test(e.entityId) ? lotName(Number(e.entityId)) : e.entityId}` : ''}
      </span>
    ),
  }),
  column.display({
    id: 'change',
    header: 'Change',
    cell: ({ row: { original: e } }) => <Difference before={e.before} after={e.after} />,
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
  const choices = useAuditChoices();
  const names = useMemo(() => new Map((choices.data?.actors ?? []).map((a) => [a.email, a.name])), [choices.data]);
  const columns = useMemo(() => columnsFor(names), [names]);
  const select = (name: (typeof FILTERS)[number], label: string, options: ReactNode, className = 'w-56') => (
    <Field label={label} htmlFor={`audit-${name}`}>
      <select id={`audit-${name}`} name={name} defaultValue={filter[name] ?? ''} className={`${inputClass} ${className}`}>
        {options}
      </select>
    </Field>
  );
  const recordTypes = [...new Set([...(choices.data?.recordTypes ?? []), ...(filter.entityType ? [filter.entityType] : [])])].sort((a, b) =>
    recordTypeWords(a).localeCompare(recordTypeWords(b)),
  );
  const actions = Object.keys(ACTION_LABELS).sort((a, b) => actionWords(a).localeCompare(actionWords(b)));
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
        key={`${params.toString()}|${choices.isSuccess}`}
        label="Filter events"
        // A lot is named L-<id> on every page; the trail records its id.
        onApply={(values) => update({ ...values, entityId: values.entityId?.replace(/^L-(\d+)$/i, '$1') })}
        onClear={() => update(Object.fromEntries(FILTERS.map((key) => [key, undefined])))}
      >
        {input('from', 'From', { type: 'date', className: '' })}
        {input('to', 'To', { type: 'date', className: '' })}
        {select(
          'entityType',
          'Record type',
          <>
            <option value="">All record types</option>
            {recordTypes.map((type) => (
              <option key={type} value={type}>
                {recordTypeWords(type)}
              </option>
            ))}
          </>,
          'w-48',
        )}
        {select(
          'action',
          'Action',
          <>
            <option value="">All actions</option>
            <optgroup label="Groups">
              {Object.entries(ACTION_GROUP_LABELS).map(([value, label]) => (
                <option key={value} value={value}>
                  {label}
                </option>
              ))}
            </optgroup>
            <optgroup label="Actions">
              {actions.map((action) => (
                <option key={action} value={action}>
                  {actionWords(action)}
                </option>
              ))}
            </optgroup>
            {filter.action && !ACTION_LABELS[filter.action] && !ACTION_GROUP_LABELS[filter.action] && (
              <option value={filter.action}>{actionWords(filter.action)}</option>
            )}
          </>,
          'w-64',
        )}
        {input('entityId', 'Record number', { className: 'w-24' })}
        {select(
          'actor',
          'User',
          <>
            <option value="">Anyone</option>
            {(choices.data?.actors ?? []).map((a) => (
              <option key={a.email} value={a.email}>
                {a.name} ({a.email})
              </option>
            ))}
            {filter.actor && !names.has(filter.actor) && <option value={filter.actor}>{filter.actor}</option>}
          </>,
        )}
        {input('q', 'Search', { className: 'w-48' })}
      </FilterBar>
      {events.error && <Notice tone="error">{events.error.message}</Notice>}
      {choices.error && <Notice tone="error">The filter lists could not be loaded: {choices.error.message}</Notice>}
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
