import { useState } from 'react';
import { fixed, plural, signedFixed } from '@shared/format';
import type { LotInspectionView } from '@shared/schemas/inspection';
import { ScrollBox } from '@/components/ScrollBox';
import { VerdictBadge } from './VerdictBadge';

const num = (v: number | null | undefined, digits: number, signed = false) => (signed ? signedFixed(v, digits) : fixed(v, digits));

export function ResultsTable({ view }: { view: LotInspectionView }) {
  const [onlyToMeasure, setOnlyToMeasure] = useState(true);
  const pieces = view.pieces.filter((p) => !onlyToMeasure || p.toMeasure);
  return (
    <div className="rounded border border-paper-line bg-paper-card">
      <div className="flex items-center justify-between border-b border-paper-line px-3 py-1.5 text-xs text-ink-muted">
        <span>{plural(pieces.length, 'piece')}</span>
        <label className="inline-flex items-center gap-1.5">
          <input type="checkbox" checked={onlyToMeasure} onChange={(e) => setOnlyToMeasure(e.target.checked)} />{' '}
          {view.sort ? 'pieces of the sort only' : 'sample only'}
        </label>
      </div>
      <ScrollBox label="Piece results" className="max-h-[28rem]">
        <table className="w-full text-sm" aria-label="Piece results">
          <thead className="sticky top-0 bg-paper-sunk text-left text-xs text-ink-muted">
            <tr>
              {['Serial', 'λ nm', 'Retardance λ', 'nm', 'Error λ', 'Error nm', 'Fast axis °', 'Axis error °', 'Verdict'].map((h) => (
                <th key={h} className="px-2.5 py-1 font-medium whitespace-nowrap">
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {pieces.flatMap((p) =>
              p.results.length === 0
                ? [
                    <tr key={p.id} className="border-t border-paper-line/60 text-ink-faint">
                      <td className="px-2.5 py-0.5 font-mono whitespace-nowrap">
                        {p.serial}
                        {p.inSample && ' •'}
                      </td>
                      <td colSpan={7} className="px-2.5 py-0.5 text-xs">
                        not measured
                      </td>
                      <td className="px-2.5 py-0.5">
                        <VerdictBadge value="unmeasured" />
                      </td>
                    </tr>,
                  ]
                : p.results.map((r) => (
                    <tr key={r.id} className={`border-t border-paper-line/60 ${r.verdict === 'fail' ? 'bg-state-fail/5' : ''}`}>
                      <td className="px-2.5 py-0.5 font-mono whitespace-nowrap">
                        {p.serial}
                        {p.inSample && ' •'}
                      </td>
                      <td className="px-2.5 py-0.5 text-right">{num(r.wavelengthNm, 1)}</td>
                      <td className="px-2.5 py-0.5 text-right font-mono">{num(r.retardanceWaves, 4)}</td>
                      <td className="px-2.5 py-0.5 text-right font-mono">{num(r.retardanceNm, 2)}</td>
                      <td className="px-2.5 py-0.5 text-right font-mono">{num(r.retardanceErrorWaves, 4, true)}</td>
                      <td className="px-2.5 py-0.5 text-right font-mono">{num(r.retardanceErrorNm, 2, true)}</td>
                      <td className="px-2.5 py-0.5 text-right font-mono">
                        {num(r.fastAxisDeg, 2)}
                        {r.axisAmbiguous && ' ±90'}
                      </td>
                      <td className="px-2.5 py-0.5 text-right font-mono">{num(r.axisErrorDeg, 2, true)}</td>
                      <td className="px-2.5 py-0.5">
                        <VerdictBadge value={r.verdict} /> <span className="text-xs text-ink-muted">{r.reasons.join('; ')}</span>
                      </td>
                    </tr>
                  )),
            )}
          </tbody>
        </table>
      </ScrollBox>
      <p className="border-t border-paper-line px-3 py-1 text-2xs text-ink-faint">
        • in the sample. Retardance and axis error are along the fast-axis mark; a scan cannot tell fast from slow axis (±90).
      </p>
    </div>
  );
}
