import { useState } from 'react';
import { Check, Copy } from 'lucide-react';

/** Copies a value (a document number, a hash) and says so for a moment. */
export function CopyButton({ value, label }: { value: string; label: string }) {
  const [state, setState] = useState<'idle' | 'copied' | 'failed'>('idle');
  const copy = async () => {
    try {
      await navigator.clipboard.writeText(value);
      setState('copied');
    } catch {
      setState('failed');
    }
    setTimeout(() => setState('idle'), 1500);
  };
  return (
    <button
      type="button"
      onClick={copy}
      aria-label={label}
      title={state === 'failed' ? 'The browser refused to copy' : label}
      className="inline-flex items-center rounded p-0.5 text-ink-faint hover:bg-paper-sunk hover:text-ink"
    >
      {state === 'copied' ? <Check className="h-3.5 w-3.5 text-state-pass" aria-hidden /> : <Copy className="h-3.5 w-3.5" aria-hidden />}
      {state !== 'idle' && (
        <span className="sr-only" role="status">
          {state === 'copied' ? 'Copied' : 'Copy refused'}
        </span>
      )}
    </button>
  );
}
