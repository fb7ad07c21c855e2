import type { ReactNode } from 'react';
import { AlertTriangle, Info, XCircle } from 'lucide-react';

const tones = {
  error: { box: 'border-state-fail/40 bg-state-fail/5 text-state-fail', Icon: XCircle },
  caution: { box: 'border-signal-deep/40 bg-signal/10 text-ink', Icon: AlertTriangle },
  info: { box: 'border-state-info/30 bg-state-info/5 text-ink', Icon: Info },
} as const;

export function Notice({ tone, title, children }: { tone: keyof typeof tones; title?: string; children: ReactNode }) {
  const { box, Icon } = tones[tone];
  return (
    <div role={tone === 'error' ? 'alert' : 'note'} className={`flex gap-2 rounded border px-3 py-2 text-sm ${box}`}>
      <Icon className="mt-0.5 h-4 w-4 shrink-0" aria-hidden />
      <div>
        {title && <p className="font-semibold">{title}</p>}
        <div>{children}</div>
      </div>
    </div>
  );
}
