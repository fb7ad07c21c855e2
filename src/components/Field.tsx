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
