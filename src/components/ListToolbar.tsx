// Above a server-side list: the search box, the list's filters, what the filter totals, and the CSV
// export of exactly what the filter shows.
import { useEffect, useRef, useState, type ReactNode } from 'react';
import { Download, Search } from 'lucide-react';
import { apiUrl } from '@/lib/api';
import type { ListState } from './DataTable';
import { inputClass } from './Field';

type Props = {
  /** The list's state and its updater, as useListState gives them. */
  list: { state: ListState; update: (patch: Partial<ListState>) => void };
  /** The list's own filters, sent along with the export. */
  filters?: Record<string, string | undefined>;
  placeholder: string;
  /** The list's endpoint, for the export link. */
  exportPath: string;
  summary?: ReactNode;
  children?: ReactNode;
};

export function ListToolbar({ list, filters, placeholder, exportPath, summary, children }: Props) {
  const { q, sort } = list.state;
  // The updater changes with every render; the pending search always uses the latest one.
  const update = useRef(list.update);
  update.current = list.update;
  const [text, setText] = useState(q ?? '');
  useEffect(() => setText(q ?? ''), [q]);
  // Typing settles for a moment before the list is asked again.
  useEffect(() => {
    if (text.trim() === (q ?? '')) return;
    const timer = setTimeout(() => update.current({ q: text.trim() || undefined }), 300);
    return () => clearTimeout(timer);
  }, [text, q]);
  return (
    <div className="mb-2 flex flex-wrap items-end gap-3">
      <label className="relative">
        <span className="sr-only">Search</span>
        <Search className="pointer-events-none absolute top-2 left-2 h-4 w-4 text-ink-faint" aria-hidden />
        <input type="search" value={text} onChange={(e) => setText(e.target.value)} placeholder={placeholder} className={`${inputClass} w-72 pl-7`} />
      </label>
      {children}
      <div className="ml-auto flex items-center gap-3 text-xs text-ink-muted">
        {summary}
        <a
          href={apiUrl(exportPath, { q, sort, ...filters, format: 'csv' })}
          className="inline-flex items-center gap-1 rounded border border-paper-line bg-paper-card px-2 py-1 text-ink no-underline hover:bg-paper-sunk"
          download
        >
          <Download className="h-3.5 w-3.5" aria-hidden /> CSV
        </a>
      </div>
    </div>
  );
}

/** A filter drop-down of a list; the empty choice shows everything. */
export function FilterSelect({
  label,
  value,
  options,
  onChange,
}: {
  label: string;
  value?: string;
  options: { value: string; label: string }[];
  onChange: (value: string | undefined) => void;
}) {
  return (
    <label className="flex flex-col gap-1 text-xs font-medium text-ink-muted">
      {label}
      <select value={value ?? ''} onChange={(e) => onChange(e.target.value || undefined)} className={`${inputClass} min-w-36`}>
        <option value="">All</option>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </label>
  );
}
