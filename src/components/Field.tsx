import type { ReactNode } from 'react';

type Props = { label: string; error?: string; hint?: string; children: ReactNode; htmlFor?: string };

export function Field({ label, error, hint, children, htmlFor }: Props) {
  return (
    // A select is as wide as its longest option unless told otherwise: in a narrow column it takes the column's width.
    <div className="flex min-w-0 flex-col gap-1 [&>select]:w-full">
      <label htmlFor={htmlFor} className="text-xs font-medium text-ink-muted">
        {label}
      </label>
      {children}
      {hint && !error && <p className="text-2xs text-ink-faint">{hint}</p>}
      {error && (
        <p role="alert" className="text-xs text-state-fail">
          {error}
        </p>
      )}
    </div>
  );
}

export const inputClass =
  'rounded border border-paper-line bg-paper-card px-2 py-1.5 text-sm outline-none focus:border-frame-soft focus:ring-2 focus:ring-frame/40';

/**
 * A day typed as ISO 8601 (YYYY-MM-DD). Not the browser's date input: that one shows the day in the
 * order of the machine's locale (11/25/2026 on one desk, 25.11.2026 on the next), and Phaselot writes
 * every date one way.
 */
export const isoDateInput = {
  type: 'text',
  inputMode: 'numeric',
  placeholder: 'YYYY-MM-DD',
  pattern: '[0-9]{4}-[0-9]{2}-[0-9]{2}',
  maxLength: 10,
  autoComplete: 'off',
  spellCheck: false,
  title: 'A day as YYYY-MM-DD, e.g. 2026-12-02',
} as const;
