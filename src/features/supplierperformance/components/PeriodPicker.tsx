// The period every figure of the page covers, kept in the address bar (from, to); empty fields
// mean the year up to today.
import type { Period } from '@shared/schemas/supplierPerformance';
import { inputClass } from '@/components/Field';

type Props = { period: Period; chosen: { from?: string; to?: string }; onChange: (patch: { from?: string; to?: string }) => void };

export function PeriodPicker({ period, chosen, onChange }: Props) {
  return (
    <fieldset className="flex flex-wrap items-end gap-3">
      <legend className="sr-only">Period</legend>
      <label className="flex flex-col gap-1 text-xs font-medium text-ink-muted">
        Received from
        <input
          type="date"
          className={inputClass}
          value={chosen.from ?? period.from}
          max={chosen.to ?? period.to}
          onChange={(e) => onChange({ from: e.target.value || undefined })}
        />
      </label>
      <label className="flex flex-col gap-1 text-xs font-medium text-ink-muted">
        to
        <input
          type="date"
          className={inputClass}
          value={chosen.to ?? period.to}
          min={chosen.from ?? period.from}
          onChange={(e) => onChange({ to: e.target.value || undefined })}
        />
      </label>
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
