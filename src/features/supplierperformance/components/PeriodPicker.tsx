// The period every figure of the page covers, kept in the address bar (from, to); empty fields
// mean the year up to today.
import type { Period } from '@shared/schemas/supplierPerformance';
import { useEffect, useState } from 'react';
import { inputClass, isoDateInput } from '@/components/Field';

type Props = { period: Period; chosen: { from?: string; to?: string }; onChange: (patch: { from?: string; to?: string }) => void };

export function PeriodPicker({ period, chosen, onChange }: Props) {
  return (
    <fieldset className="flex flex-wrap items-end gap-3">
      <legend className="sr-only">Period</legend>
      <DayField label="Received from" value={chosen.from ?? period.from} onDay={(from) => onChange({ from })} />
      <DayField label="to" value={chosen.to ?? period.to} onDay={(to) => onChange({ to })} />
      {(chosen.from || chosen.to) && (
        <button
          type="button"
          className="self-end rounded border border-paper-line px-2 py-1.5 text-xs hover:bg-paper-sunk"
          onClick={() => onChange({ from: undefined, to: undefined })}
        >
          Last 12 months
        </button>
      )}
    </fieldset>
  );
}

const WHOLE_DAY = /^\d{4}-\d{2}-\d{2}$/;

/** A day typed in full before the period follows it: a half-typed day would ask the server for nonsense. */
function DayField({ label, value, onDay }: { label: string; value: string; onDay: (day: string | undefined) => void }) {
  const [typed, setTyped] = useState(value);
  useEffect(() => setTyped(value), [value]);
  return (
    <label className="flex flex-col gap-1 text-xs font-medium text-ink-muted">
      {label}
      <input
        {...isoDateInput}
        className={inputClass}
        value={typed}
        onChange={(e) => {
          setTyped(e.target.value);
          if (e.target.value === '') onDay(undefined);
          else if (WHOLE_DAY.test(e.target.value)) onDay(e.target.value);
        }}
      />
    </label>
  );
}
