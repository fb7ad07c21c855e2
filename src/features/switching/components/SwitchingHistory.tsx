// The supplier-part's switching history, newest first: every decided lot (sampled on which
// severity, accepted or not), every resumption and override, what each did to the state and why.
// A result replaced by a superseding decision stays, struck through.
import { Link } from 'react-router-dom';
import { ArrowRight } from 'lucide-react';
import { DISPOSITION_LABELS, type Disposition } from '@shared/inspection/lotVerdict';
import type { SwitchingHistoryEntry } from '@shared/schemas/switching';
import { lotName } from '@shared/schemas/stock';
import { PhaseBadge } from '@/components/PhaseBadge';
import { formatDateTime, plural } from '@shared/format';

function Title({ entry }: { entry: SwitchingHistoryEntry }) {
  if (entry.kind === 'resume') return <>Inspection resumed</>;
  if (entry.kind === 'override') return <>Severity set to {entry.severity}</>;
  return (
    <>
      <Link to={`/lots/${entry.lotId}`} className="font-mono">
        {lotName(entry.lotId!)}
      </Link>{' '}
      {entry.accepted ? 'accepted' : 'not accepted'}
      <span className="font-normal text-ink-muted">
        {' '}
        · {entry.decision ? (DISPOSITION_LABELS[entry.decision as Disposition] ?? entry.decision) : ''} ·{' '}
        {entry.defectives === null ? 'defectives not recorded' : plural(entry.defectives, 'defective')} · sampled on {entry.sampledOn}
      </span>
    </>
  );
}

export function SwitchingHistory({ entries }: { entries: SwitchingHistoryEntry[] }) {
  if (entries.length === 0) return <p className="text-sm text-ink-faint">No lot of this part from this supplier has been decided yet.</p>;
  return (
    <ol className="divide-y divide-paper-line">
      {entries.map((entry) => (
        <li
          key={entry.id}
          className={`grid gap-x-4 gap-y-1 py-2 text-sm sm:grid-cols-[9rem_1fr] ${entry.superseded ? 'text-ink-faint' : ''}`}
          data-kind={entry.kind}
        >
          <div className="text-xs text-ink-muted">
            <p>{formatDateTime(entry.at)}</p>
            <p className="text-2xs">#{entry.position} in the sequence</p>
          </div>
          <div className="min-w-0 space-y-1">
            <p className={`font-medium ${entry.superseded ? 'line-through' : ''}`}>
              <Title entry={entry} />
              {entry.superseded && <span className="ml-2 text-2xs font-normal uppercase no-underline">superseded</span>}
            </p>
            {entry.from !== entry.to && (
              <p className="flex flex-wrap items-center gap-1.5">
                <PhaseBadge phase={entry.from} /> <ArrowRight className="h-3.5 w-3.5 text-ink-faint" aria-label="to" /> <PhaseBadge phase={entry.to} />
              </p>
            )}
            <p className="text-xs text-ink-muted first-letter:uppercase">{entry.explanation}.</p>
            {entry.reason && (
              <blockquote className="border-l-2 border-paper-line pl-2 text-xs">
                {entry.kind === 'resume' ? 'Corrective action: ' : 'Reason: '}
                {entry.reason}
                {entry.reference &&
                  (entry.correctiveActionId ? (
                    <>
                      {' ('}
                      <Link to={`/corrective-actions/${entry.correctiveActionId}`} className="font-mono">
                        {entry.reference}
                      </Link>
                      {')'}
                    </>
                  ) : (
                    <span className="font-mono"> ({entry.reference})</span>
                  ))}
              </blockquote>
            )}
            {entry.by && (
              <p className="text-2xs text-ink-faint">
                {entry.kind === 'lot' ? 'Decision signed by' : 'Signed by'} {entry.by}
              </p>
            )}
          </div>
        </li>
      ))}
    </ol>
  );
}
