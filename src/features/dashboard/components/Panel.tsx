// A dashboard card: a title with its count, a few rows that each open their record, and a link to
// the whole list when the card shows only the first of them.
import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { wholeNumber } from '@shared/format';

type Props = {
  title: string;
  total: number;
  /** What the count counts, in words: "lots", "lines due". */
  unit: string;
  shown: number;
  all?: { to: string; label: string };
  alert?: ReactNode;
  empty: string;
  children: ReactNode;
};

export function Panel({ title, total, unit, shown, all, alert, empty, children }: Props) {
  const id = `panel-${title.toLowerCase().replace(/[^a-z0-9]+/g, '-')}`;
  return (
    <section aria-labelledby={id} className="flex min-w-0 flex-col rounded border border-paper-line bg-paper-card">
      <header className="flex items-baseline justify-between gap-2 border-b border-paper-line px-3 py-2">
        <h2 id={id} className="text-sm font-semibold">
          {title}
        </h2>
        <p className="text-right whitespace-nowrap">
          <span className="text-xl font-semibold tabular-nums" data-testid={`${id}-total`}>
            {wholeNumber(total)}
          </span>{' '}
          <span className="text-xs text-ink-muted">{unit}</span>
        </p>
      </header>
      {alert && <div className="border-b border-paper-line px-3 py-1.5 text-xs">{alert}</div>}
      {total === 0 ? <p className="px-3 py-3 text-sm text-ink-muted">{empty}</p> : <ul className="divide-y divide-paper-line">{children}</ul>}
      {all && total > shown && (
        <p className="mt-auto border-t border-paper-line px-3 py-1.5 text-xs">
          <Link to={all.to}>{all.label}</Link>
        </p>
      )}
    </section>
  );
}

/** One row of a panel: the whole row is the link. */
export function PanelRow({ to, title, detail, aside }: { to: string; title: ReactNode; detail: ReactNode; aside: ReactNode }) {
  return (
    <li>
      <Link to={to} className="flex items-center justify-between gap-3 px-3 py-1.5 text-ink no-underline hover:bg-paper-sunk">
        <span className="min-w-0">
          <span className="block truncate text-sm font-medium text-frame">{title}</span>
          <span className="block truncate text-xs text-ink-muted">{detail}</span>
        </span>
        <span className="shrink-0 text-right text-xs">{aside}</span>
      </Link>
    </li>
  );
}
