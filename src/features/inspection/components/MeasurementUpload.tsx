import { useState } from 'react';
import { FileCheck2, Upload } from 'lucide-react';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { ApiError } from '@/lib/api';
import { useBenchInstruments, useCommitMeasurements, usePreviewMeasurements } from '../api';
import type { FilePreview } from '@shared/schemas/inspection';
import { VerdictBadge } from './VerdictBadge';

const num = (v: number | null | undefined, digits: number) => (v === null || v === undefined ? '—' : v.toFixed(digits));

function PreviewOfFile({ file }: { file: FilePreview }) {
  const problems = file.errors.length + (file.fatal ? 1 : 0);
  return (
    <section aria-label={`Preview of ${file.name}`} className="rounded border border-paper-line bg-paper-card">
      <header className="flex flex-wrap items-baseline gap-x-4 gap-y-1 border-b border-paper-line px-3 py-2 text-sm">
        <span className="font-medium">{file.name}</span>
        <span className="text-xs text-ink-muted">{file.method ?? 'method not recognised'} · {file.instrument?.code ?? 'no instrument'} · {file.pieces.length} piece result(s)</span>
        <span className="font-mono text-2xs text-ink-faint">SHA-256 {file.sha256.slice(0, 16)}…</span>
        <span className={`ml-auto text-xs font-medium ${problems ? 'text-state-fail' : 'text-state-pass'}`}>{problems ? `${problems} problem(s)` : 'ready to save'}</span>
      </header>
      {file.fatal && <div className="px-3 py-2"><Notice tone="error">{file.fatal}</Notice></div>}
      {file.errors.length > 0 && (
        <ul className="max-h-48 overflow-y-auto px-3 py-2 text-sm" aria-label="Errors">
          {file.errors.map((e, i) => (
            <li key={i} className="text-state-fail"><span className="font-mono">line {e.line}</span>: {e.message}</li>
          ))}
        </ul>
      )}
      {file.warnings.length > 0 && (
        <ul className="px-3 py-1 text-xs text-ink-muted">
          {file.warnings.map((w, i) => <li key={i}>line {w.line}: {w.message}</li>)}
        </ul>
      )}
      {file.pieces.length > 0 && (
        <div className="max-h-72 overflow-y-auto">
          <table className="w-full text-xs">
            <thead className="sticky top-0 bg-paper-sunk text-left text-ink-muted">
              <tr>{['Serial', 'λ nm', 'Retardance λ', 'Error λ', 'Axis error °', 'Verdict'].map((h) => <th key={h} className="px-2.5 py-1 font-medium">{h}</th>)}</tr>
            </thead>
            <tbody>
              {file.pieces.map((p) => (
                <tr key={`${p.serial}-${p.wavelengthNm}`} className="border-t border-paper-line/60">
                  <td className="px-2.5 py-0.5 font-mono">{p.serial}</td>
                  <td className="px-2.5 py-0.5 text-right">{num(p.wavelengthNm, 1)}</td>
                  <td className="px-2.5 py-0.5 text-right font-mono">{num(p.retardanceWaves, 4)}</td>
                  <td className="px-2.5 py-0.5 text-right font-mono">{num(p.retardanceErrorWaves, 4)}</td>
                  <td className="px-2.5 py-0.5 text-right font-mono">{num(p.axisErrorDeg, 2)}</td>
                  <td className="px-2.5 py-0.5"><VerdictBadge value={p.verdict} /> <span className="text-ink-muted">{p.reasons.join('; ')}</span></td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}

export function MeasurementUpload({ lotId }: { lotId: number }) {
  const instruments = useBenchInstruments();
  const preview = usePreviewMeasurements(lotId);
  const commit = useCommitMeasurements(lotId);
  const [files, setFiles] = useState<File[]>([]);
  const [instrumentId, setInstrumentId] = useState<number | undefined>();
  const [inputKey, setInputKey] = useState(0);
  const previews = preview.data?.files ?? [];
  const ready = previews.length > 0 && previews.every((f) => !f.fatal && f.errors.length === 0);

  const choose = (list: FileList | null) => {
    setFiles(list ? [...list] : []);
    preview.reset();
    commit.reset();
  };
  const save = () =>
    commit.mutate({ files, instrumentId }, {
      onSuccess: () => {
        setFiles([]);
        preview.reset();
        setInputKey((k) => k + 1);
      },
    });
  const commitErrors = commit.error instanceof ApiError && Array.isArray(commit.error.details) ? commit.error.details : [];

  return (
    <div className="space-y-3 rounded border border-paper-line bg-paper p-3">
      <div className="flex flex-wrap items-end gap-3">
        <Field label="Bench files (CSV)" htmlFor="bench-files">
          <input key={inputKey} id="bench-files" type="file" accept=".csv,text/csv,text/plain" multiple className="text-sm" onChange={(e) => choose(e.target.files)} />
        </Field>
        <Field label="Instrument (when the file does not name it)" htmlFor="bench-instrument">
          <select id="bench-instrument" className={inputClass} value={instrumentId ?? ''} onChange={(e) => setInstrumentId(e.target.value ? Number(e.target.value) : undefined)}>
            <option value="">— named in the file —</option>
            {(instruments.data?.data ?? []).filter((i) => i.active).map((i) => (
              <option key={i.id} value={i.id}>{i.code}{i.calibrationCurrent ? '' : ' (calibration lapsed)'}</option>
            ))}
          </select>
        </Field>
        <Button look="secondary" disabled={files.length === 0 || preview.isPending} onClick={() => preview.mutate({ files, instrumentId })}>
          <FileCheck2 className="h-4 w-4" aria-hidden /> {preview.isPending ? 'Checking…' : 'Check files'}
        </Button>
        <Button disabled={!ready || commit.isPending} onClick={save}>
          <Upload className="h-4 w-4" aria-hidden /> {commit.isPending ? 'Saving…' : 'Save readings'}
        </Button>
      </div>
      <p className="text-xs text-ink-muted">Checking runs every row through the analysis and saves nothing. Saving stores the raw file with its SHA-256, its readings and the results together.</p>
      {preview.error && <Notice tone="error">{preview.error.message}</Notice>}
      {commit.error && (
        <Notice tone="error" title={commit.error.message}>
          {commitErrors.map((f: { name: string; fatal?: string; errors: { line: number; message: string }[] }) => (
            <p key={f.name}>{f.name}: {f.fatal ?? `${f.errors.length} error(s), first at line ${f.errors[0]?.line}`}</p>
          ))}
        </Notice>
      )}
      {commit.isSuccess && <Notice tone="info">Saved {commit.data.files.map((f) => `${f.name} (${f.rows} rows, ${f.pieces} results)`).join(', ')}.</Notice>}
      {previews.map((f) => <PreviewOfFile key={f.sha256 + f.name} file={f} />)}
    </div>
  );
}
