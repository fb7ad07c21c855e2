import type { ReactNode } from 'react';

/** Label–value pairs in a compact grid, for the head of a record page. */
export function Details({ items, columns = 3 }: { items: [string, ReactNode][]; columns?: 2 | 3 | 4 }) {
  const grid = { 2: 'sm:grid-cols-2', 3: 'sm:grid-cols-3', 4: 'sm:grid-cols-4' }[columns];
  return (
    <dl className={`grid gap-x-6 gap-y-2 ${grid}`}>
      {items.map(([label, value]) => (
        <div key={label} className="min-w-0">
          <dt className="text-2xs font-medium tracking-wide text-ink-faint uppercase">{label}</dt>
          <dd className="text-sm break-words">{value ?? '—'}</dd>
        </div>
      ))}
    </dl>
  );
}

/** A titled white panel. */
export function Panel({ title, actions, children }: { title: string; actions?: ReactNode; children: ReactNode }) {
  return (
    <section className="rounded border border-paper-line bg-paper-card" aria-label={title}>
      <div className="flex flex-wrap items-center justify-between gap-x-3 gap-y-1.5 border-b border-paper-line px-3 py-2">
        <h2 className="text-sm font-semibold">{title}</h2>
        {actions}
      </div>
      <div className="p-3">{children}</div>
    </section>
  );
}
