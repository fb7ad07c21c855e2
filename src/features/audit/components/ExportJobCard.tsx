import { Download } from 'lucide-react';
import type { ExportJobView } from '@shared/schemas/exports';
import { Notice } from '@/components/Notice';
import { apiUrl } from '@/lib/api';
import { useExportJob } from '../api';
import { CopyButton } from './CopyButton';
import { formatDateTime, formatTime } from '@shared/format';

const STATUS_LABELS = { queued: 'Waiting to start', running: 'Building', done: 'Ready', failed: 'Failed' } as const;

function describeFilter(job: ExportJobView, names: { supplier?: string; part?: string }) {
  const scope = [names.supplier && `supplier ${names.supplier}`, names.part && `part ${names.part}`].filter(Boolean).join(', ');
  return `${job.filter.from} to ${job.filter.to}${scope ? ` · ${scope}` : ''}`;
}

/** One export with its progress, polled until it is ready or has failed. */
export function ExportJobCard({ job: initial, names }: { job: ExportJobView; names: { supplier?: string; part?: string } }) {
  const { data: job } = useExportJob(initial);
  const percent = job.total === 0 ? 0 : Math.round((job.done / job.total) * 100);
  return (
    <li className="rounded border border-paper-line bg-paper-card px-3 py-2.5" aria-label={`Export ${job.id}`}>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <p className="font-medium">
          Export {job.id} <span className="font-normal text-ink-muted">· {describeFilter(job, names)}</span>
        </p>
        <p className="text-xs text-ink-muted">
          requested {formatDateTime(job.createdAt)}
          {job.finishedAt && `, finished ${formatTime(job.finishedAt)}`}
        </p>
      </div>
      <div className="mt-2 flex items-center gap-3">
        <div
          role="progressbar"
          aria-label={`Progress of export ${job.id}`}
          aria-valuemin={0}
          aria-valuemax={job.total}
          aria-valuenow={job.done}
          className="h-2 flex-1 overflow-hidden rounded bg-paper-sunk"
        >
          <div
            className={`h-full transition-[width] ${job.status === 'failed' ? 'bg-state-fail' : job.status === 'done' ? 'bg-state-pass' : 'bg-frame'}`}
            style={{ width: `${job.status === 'done' ? 100 : percent}%` }}
          />
        </div>
        <span className="w-48 text-right text-xs whitespace-nowrap" data-testid={`export-${job.id}-status`}>
          {STATUS_LABELS[job.status]} · {job.done} of {job.total} documents
        </span>
      </div>
      {job.status === 'failed' && (
        <div className="mt-2">
          <Notice tone="error" title="The export could not be built">
            {job.error}
          </Notice>
        </div>
      )}
      {job.status === 'done' && (
        <div className="mt-2 flex flex-wrap items-center gap-x-4 gap-y-1 text-sm">
          <a href={apiUrl(`/exports/${job.id}/download`)} download className="inline-flex items-center gap-1 font-medium">
            <Download className="h-4 w-4" aria-hidden /> Download ZIP ({((job.size ?? 0) / 1024).toFixed(0)} KiB)
          </a>
          <span className="inline-flex items-center gap-1 font-mono text-2xs text-ink-muted" title="SHA-256 of the ZIP">
            SHA-256 {job.sha256}
            <CopyButton value={job.sha256 ?? ''} label={`Copy SHA-256 of export ${job.id}`} />
          </span>
        </div>
      )}
    </li>
  );
}
