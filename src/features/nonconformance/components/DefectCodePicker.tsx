import type { DefectCodeView } from '@shared/schemas/nonconformance';

/** The catalogue's codes in use as tick boxes; `chosen` are the ids ticked. */
export function DefectCodePicker({
  codes,
  chosen,
  onChange,
  idPrefix,
}: {
  codes: DefectCodeView[];
  chosen: number[];
  onChange(ids: number[]): void;
  idPrefix: string;
}) {
  return (
    <div role="group" aria-label="Defect codes" className="grid gap-x-4 gap-y-1 sm:grid-cols-2">
      {codes
        .filter((c) => c.active || chosen.includes(c.id))
        .map((code) => (
          <label key={code.id} htmlFor={`${idPrefix}-${code.id}`} className="flex items-start gap-2 text-sm">
            <input
              id={`${idPrefix}-${code.id}`}
              type="checkbox"
              className="mt-0.5"
              checked={chosen.includes(code.id)}
              onChange={(e) => onChange(e.target.checked ? [...chosen, code.id] : chosen.filter((id) => id !== code.id))}
            />
            <span>
              {code.label} <span className="font-mono text-2xs text-ink-faint">{code.code}</span>
            </span>
          </label>
        ))}
    </div>
  );
}
