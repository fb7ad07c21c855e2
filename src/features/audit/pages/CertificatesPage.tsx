import { createColumnHelper } from '@tanstack/react-table';
import { FileText } from 'lucide-react';
import { DISPOSITION_LABELS } from '@shared/inspection/lotVerdict';
import { lotName } from '@shared/schemas/stock';
import { DataTable, useListState } from '@/components/DataTable';
import { Field, inputClass, isoDateInput } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { apiUrl } from '@/lib/api';
import { useDocuments, type IssuedDocument } from '../api';
import { CopyButton } from '../components/CopyButton';
import { DocumentStatus } from '../components/DocumentStatus';
import { FilterBar } from '../components/FilterBar';
import { formatDateTime } from '@shared/format';

const FILTERS = ['q', 'kind', 'from', 'to'] as const;
const KIND_LABELS = { certificate: 'Certificate of conformance', 'inspection-report': 'Inspection report' } as const;

const column = createColumnHelper<IssuedDocument>();
const columns = [
  column.accessor('number', {
    header: 'Number',
    cell: ({ row: { original: d } }) => (
      <span className="inline-flex items-center gap-1 font-mono whitespace-nowrap">
        {d.number}
        <CopyButton value={d.number} label={`Copy number ${d.number}`} />
      </span>
    ),
  }),
  column.display({ id: 'kind', header: 'Kind', cell: ({ row }) => <span className="text-xs">{KIND_LABELS[row.original.kind]}</span> }),
  column.accessor((d) => d.part.number, {
    id: 'part',
    header: 'Part',
    cell: ({ row: { original: d } }) => (
      <>
        <span className="font-mono">{d.part.number}</span>
        <span className="block text-xs text-ink-muted">{d.part.description}</span>
      </>
    ),
  }),
  column.accessor((d) => d.supplier.name, {
    id: 'supplier',
    header: 'Supplier / lot',
    cell: ({ row: { original: d } }) => (
      <>
        {d.supplier.name}
        <span className="block font-mono text-xs text-ink-muted">
          {lotName(d.lot.id)} · {d.lot.supplierLot}
        </span>
      </>
    ),
  }),
  column.display({ id: 'decision', header: 'Decision', cell: ({ row }) => DISPOSITION_LABELS[row.original.decision] }),
  column.display({ id: 'signer', header: 'Signed by', cell: ({ row }) => row.original.signer }),
  column.accessor('issuedAt', { header: 'Issued', cell: ({ getValue }) => <span className="whitespace-nowrap">{formatDateTime(getValue())}</span> }),
  column.display({ id: 'status', header: 'Status', cell: ({ row }) => <DocumentStatus revokedAt={row.original.revokedAt} /> }),
  column.display({
    id: 'hash',
    header: 'Data SHA-256',
    cell: ({ row: { original: d } }) => (
      <span className="inline-flex items-center gap-1 font-mono text-2xs text-ink-muted" title={d.dataHash}>
        {d.dataHash.slice(0, 12)}…
        <CopyButton value={d.dataHash} label={`Copy hash of ${d.number}`} />
      </span>
    ),
  }),
  column.display({
    id: 'pdf',
    header: 'PDF',
    cell: ({ row: { original: d } }) => (
      <a
        href={apiUrl(`/documents/${d.number}.pdf`)}
        target="_blank"
        rel="noreferrer"
        className="inline-flex items-center gap-1 whitespace-nowrap"
        aria-label={`Open PDF of ${d.number}`}
      >
        <FileText className="h-3.5 w-3.5" aria-hidden /> Open
      </a>
    ),
  }),
];

export function CertificatesPage() {
  const { state, update, params } = useListState({ sort: '-issuedAt', pageSize: 25 });
  const filter = Object.fromEntries(FILTERS.map((key) => [key, params.get(key) ?? undefined]));
  const documents = useDocuments({ ...state, ...filter });
  return (
    <div>
      <PageHeader title="Certificates" subtitle="Certificates of conformance and inspection reports issued on signed lot dispositions, newest first." />
      <FilterBar
        key={params.toString()}
        label="Filter documents"
        onApply={update}
        onClear={() => update(Object.fromEntries(FILTERS.map((key) => [key, undefined])))}
      >
        <Field label="Search" htmlFor="documents-q">
          <input id="documents-q" name="q" defaultValue={filter.q} placeholder="Number, supplier lot, part, supplier" className={`${inputClass} w-64`} />
        </Field>
        <Field label="Kind" htmlFor="documents-kind">
          <select id="documents-kind" name="kind" defaultValue={filter.kind ?? ''} className={inputClass}>
            <option value="">All documents</option>
            {Object.entries(KIND_LABELS).map(([value, label]) => (
              <option key={value} value={value}>
                {label}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Issued from" htmlFor="documents-from">
          <input id="documents-from" name="from" {...isoDateInput} defaultValue={filter.from} className={inputClass} />
        </Field>
        <Field label="Issued to" htmlFor="documents-to">
          <input id="documents-to" name="to" {...isoDateInput} defaultValue={filter.to} className={inputClass} />
        </Field>
      </FilterBar>
      {documents.error && <Notice tone="error">{documents.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={documents.data?.data ?? []}
        total={documents.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={documents.isPending}
        empty="No document matches this filter."
      />
    </div>
  );
}
