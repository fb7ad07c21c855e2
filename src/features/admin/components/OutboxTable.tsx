import { Notice } from '@/components/Notice';
import { ScrollBox } from '@/components/ScrollBox';
import { useOutbox } from '../api';
import { formatDateTime, formatTime } from '@shared/format';

export function OutboxTable() {
  const outbox = useOutbox();
  if (outbox.error) return <Notice tone="error">{outbox.error.message}</Notice>;
  const rows = outbox.data?.data ?? [];
  return (
    <ScrollBox label="Mail queue" className="rounded border border-paper-line bg-paper-card">
      <table className="w-full text-sm">
        <thead className="bg-paper-sunk text-left text-xs text-ink-muted">
          <tr>
            <th className="px-2.5 py-1.5 font-medium">Queued</th>
            <th className="px-2.5 py-1.5 font-medium">To</th>
            <th className="px-2.5 py-1.5 font-medium">Subject</th>
            <th className="px-2.5 py-1.5 font-medium">Delivery</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((m) => (
            <tr key={m.id} className="border-t border-paper-line/70">
              <td className="px-2.5 py-1 text-xs text-ink-muted">{formatDateTime(m.createdAt)}</td>
              <td className="px-2.5 py-1 text-xs">{m.recipients.join(', ')}</td>
              <td className="px-2.5 py-1">{m.subject}</td>
              <td className="px-2.5 py-1 text-xs">
                {m.status === 'sent' ? (
                  <span className="text-state-pass">Delivered {formatDateTime(m.sentAt!)}</span>
                ) : (
                  <span className="text-state-quarantine" title={m.lastError ?? undefined}>
                    Waiting
                    {m.attempts > 0 ? ` — ${m.attempts} failed tr${m.attempts === 1 ? 'y' : 'ies'}, next ${formatTime(m.nextAttemptAt!)}` : ''}
                  </span>
                )}
              </td>
            </tr>
          ))}
          {rows.length === 0 && (
            <tr>
              <td colSpan={4} className="px-2.5 py-4 text-center text-ink-faint">
                Phaselot has not queued any mail yet.
              </td>
            </tr>
          )}
        </tbody>
      </table>
    </ScrollBox>
  );
}
