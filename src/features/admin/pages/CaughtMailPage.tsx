import { useState } from 'react';
import { Paperclip } from 'lucide-react';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { useCaughtMail } from '../api';
import { OutboxTable } from '../components/OutboxTable';
import { formatDateTime, plural } from '@shared/format';

export function CaughtMailPage() {
  const mail = useCaughtMail();
  const [openId, setOpenId] = useState<string | null>(null);
  const messages = mail.data?.data ?? [];
  return (
    <div className="max-w-5xl">
      <PageHeader title="Outgoing mail" subtitle="What Phaselot queued and how delivery went, then what the local mail catcher received." />
      <h2 className="mb-2">Queue</h2>
      <OutboxTable />
      <h2 className="mt-6 mb-2">Received by the local catcher</h2>
      {mail.error && <Notice tone="error">{mail.error.message}</Notice>}
      {mail.data && !mail.data.catcherEnabled && <Notice tone="info">Mail goes to a real relay on this site; no local copy is kept.</Notice>}
      {mail.data?.catcherEnabled && messages.length === 0 && <p className="text-ink-muted">No messages yet.</p>}
      <ul className="divide-y divide-paper-line rounded border border-paper-line bg-paper-card">
        {messages.map((m) => (
          <li key={m.id}>
            <button
              type="button"
              className="flex w-full flex-col gap-0.5 px-3 py-2 text-left hover:bg-paper sm:flex-row sm:items-baseline sm:gap-3"
              onClick={() => setOpenId(openId === m.id ? null : m.id)}
            >
              <span className="shrink-0 text-xs text-ink-muted sm:w-40">{formatDateTime(m.receivedAt)}</span>
              <span className="max-w-full min-w-0 shrink-0 truncate text-xs sm:w-56">{m.to}</span>
              <span className="min-w-0 flex-1 font-medium wrap-anywhere">{m.subject}</span>
              {m.attachments.length > 0 && <Paperclip className="h-3.5 w-3.5 text-ink-muted" aria-label={plural(m.attachments.length, 'attachment')} />}
            </button>
            {openId === m.id && (
              <div className="border-t border-paper-line bg-paper px-3 py-3">
                <p className="text-xs wrap-anywhere text-ink-muted">From {m.from}</p>
                <pre className="mt-2 font-sans text-sm whitespace-pre-wrap wrap-anywhere">{m.text}</pre>
                {m.attachments.length > 0 && (
                  <ul className="mt-2 text-xs text-ink-muted">
                    {m.attachments.map((a) => (
                      <li key={a.filename}>
                        {a.filename} ({a.contentType}, {(a.size / 1024).toFixed(1)} KiB)
                      </li>
                    ))}
                  </ul>
                )}
              </div>
            )}
          </li>
        ))}
      </ul>
    </div>
  );
}
