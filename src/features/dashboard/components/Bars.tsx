// Counts people compare, drawn as horizontal bars on one scale, each with its number written out
// (the bars are the picture; the numbers are what a screen reader and a careful reader take).
import { Link } from 'react-router-dom';
import type { Bar } from '@shared/schemas/dashboard';
import { wholeNumber } from '@shared/format';

export function Bars({ title, bars, unit }: { title: string; bars: Bar[]; unit: string }) {
  const most = Math.max(1, ...bars.map((b) => b.value));
  return (
    <figure className="min-w-0 rounded border border-paper-line bg-paper-card px-3 py-2">
      <figcaption className="mb-1.5 text-xs font-semibold">{title}</figcaption>
      {bars.length === 0 ? (
        <p className="text-xs text-ink-muted">Nothing to compare.</p>
      ) : (
        <dl className="grid grid-cols-[minmax(0,9rem)_1fr_auto] items-center gap-x-2 gap-y-1 text-xs">
          {bars.map((bar) => (
            <div key={bar.label} className="contents">
              <dt className="truncate" title={bar.label}>
                {bar.link ? <Link to={bar.link}>{bar.label}</Link> : bar.label}
              </dt>
              <dd aria-hidden className="h-2.5 rounded-sm bg-paper-sunk">
                <div className="h-full rounded-sm bg-frame-soft" style={{ width: `${(bar.value / most) * 100}%` }} />
              </dd>
              <dd className="text-right tabular-nums">
                {wholeNumber(bar.value)} <span className="sr-only">{unit}</span>
              </dd>
            </div>
          ))}
        </dl>
      )}
    </figure>
  );
}

/** A count per day as a row of columns, oldest on the left; the day and count of each are its label. */
export function DailyColumns({ title, days, unit }: { title: string; days: Bar[]; unit: string }) {
  const most = Math.max(1, ...days.map((d) => d.value));
  return (
    <figure className="min-w-0 rounded border border-paper-line bg-paper-card px-3 py-2">
      <figcaption className="mb-1.5 text-xs font-semibold">{title}</figcaption>
      <ol className="flex h-16 items-end gap-0.5">
        {days.map((d) => (
          <li key={d.label} className="flex h-full flex-1 items-end" title={`${d.label}: ${wholeNumber(d.value)} ${unit}`}>
            <span className="sr-only">
              {d.label}: {wholeNumber(d.value)} {unit}
            </span>
            <span aria-hidden className="block w-full rounded-t-sm bg-frame-soft" style={{ height: `${Math.max(d.value ? 6 : 2, (d.value / most) * 100)}%` }} />
          </li>
        ))}
      </ol>
      {days.length > 0 && (
        <p aria-hidden className="mt-1 flex justify-between text-2xs text-ink-muted">
          <span>{days[0].label}</span>
          <span>{days[days.length - 1].label}</span>
        </p>
      )}
    </figure>
  );
}
