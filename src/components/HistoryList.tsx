import type { HistoryEntry } from '@shared/schemas/receiving';
import { formatDateTime } from '@shared/format';

export function HistoryList({ entries }: { entries: HistoryEntry[] }) {
  if (entries.length === 0) return <p className="text-sm text-ink-faint">Nothing recorded yet.</p>;
  return (
    <ol className="space-y-2 border-l-2 border-paper-line pl-3">
      {entries.map((entry, i) => (
        <li key={i} className="text-sm">
          <p>
            <span className="font-medium">{entry.what}</span>
            {entry.who && <span className="text-ink-muted"> · {entry.who}</span>}
          </p>
          {entry.detail && <p className="text-xs text-ink-muted">{entry.detail}</p>}
          <p className="text-2xs text-ink-faint">{formatDateTime(entry.at)}</p>
        </li>
      ))}
    </ol>
  );
}
