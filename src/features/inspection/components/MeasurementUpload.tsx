import { useState, type ReactNode } from 'react';
import { ChevronLeft, ChevronRight, FileCheck2, Upload } from 'lucide-react';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { ApiError } from '@/lib/api';
import { useBenchInstruments, useCommitMeasurements, usePreviewMeasurements, usePreviewPage, type PreviewEntry, type PreviewPageQuery } from '../api';
import { PREVIEW_PAGE_SIZE, type FilePreview, type PlanEffect, type PreviewList, type PreviewPiece, type SampleStanding } from '@shared/schemas/inspection';
import { VerdictBadge } from './VerdictBadge';
import { fixed, plural, wholeNumber } from '@shared/format';

/** "51–100 of 1 234" and the page buttons of one list of a checked file. */
function Pager({ what, page, total, onPage }: { what: string; page: number; total: number; onPage: (page: number) => void }) {
  const pages = Math.max(1, Math.ceil(total / PREVIEW_PAGE_SIZE));
  if (pages === 1) return null;
  const first = total === 0 ? 0 : (page - 1) * PREVIEW_PAGE_SIZE + 1;
  return (
    <div className="flex items-center justify-end gap-1 border-t border-paper-line/60 px-3 py-1 text-xs text-ink-muted">
      <span className="mr-auto">
        {what} {wholeNumber(first)}–{wholeNumber(Math.min(total, page * PREVIEW_PAGE_SIZE))} of {wholeNumber(total)}
      </span>
      <button
        type="button"
        aria-label={`Previous ${what}`}
        className="rounded p-1 hover:bg-paper-sunk disabled:opacity-40"
        disabled={page <= 1}
        onClick={() => onPage(page - 1)}
      >
        <ChevronLeft className="h-4 w-4" />
      </button>
      <span>
        page {page} / {pages}
      </span>
      <button
        type="button"
        aria-label={`Next ${what}`}
        className="rounded p-1 hover:bg-paper-sunk disabled:opacity-40"
        disabled={page >= pages}
        onClick={() => onPage(page + 1)}
      >
        <ChevronRight className="h-4 w-4" />
      </button>
    </div>
  );
}

type Checked = { lotId: number; file: FilePreview; instrumentId?: number };

/** One list of a checked file, a page at a time: the first page came with the check, the others are asked for. */
function usePagedList<L extends PreviewList>(
  { lotId, file, instrumentId }: Checked,
  list: L,
  firstPage: PreviewEntry<L>[],
  total: number,
  verdict?: PreviewPiece['verdict'],
) {
  const [page, setPage] = useState(1);
  const query: PreviewPageQuery = { page, instrumentId, verdict };
  const asked = page > 1 || verdict !== undefined;
  const fetched = usePreviewPage(lotId, file.sha256, list, query, asked);
  return {
    entries: asked ? (fetched.data?.data ?? []) : firstPage,
    total: asked ? (fetched.data?.total ?? total) : total,
    page,
    setPage,
    error: fetched.error,
  };
}

function MessageList({ checked, list, label, tone, total }: { checked: Checked; list: 'errors' | 'warnings'; label: string; tone: string; total: number }) {
  const paged = usePagedList(checked, list, checked.file[list], total);
  if (total === 0) return null;
  return (
    <div>
      <ul className={`max-h-48 overflow-y-auto px-3 py-2 ${tone}`} aria-label={label}>
        {paged.entries.map((e, i) => (
          <li key={`${e.line}-${i}`}>
            <span className="font-mono">line {e.line}</span>: {e.message}
          </li>
        ))}
      </ul>
      {paged.error && (
        <div className="px-3 pb-2">
          <Notice tone="error">{paged.error.message}</Notice>
        </div>
      )}
      <Pager what={label.toLowerCase()} page={paged.page} total={paged.total} onPage={paged.setPage} />
    </div>
  );
}

const VERDICTS = ['pass', 'fail', 'incomplete'] as const;

function PieceList({ checked }: { checked: Checked }) {
  const { counts } = checked.file;
  const [verdict, setVerdict] = useState<PreviewPiece['verdict'] | undefined>();
  const paged = usePagedList(checked, 'pieces', checked.file.pieces, counts.pieces, verdict);
  if (counts.pieces === 0) return null;
  return (
    <div>
      <div className="flex flex-wrap items-center gap-1 border-t border-paper-line/60 px-3 py-1 text-xs" role="group" aria-label="Show pieces">
        {([undefined, ...VERDICTS] as const).map((v) => (
          <button
            key={v ?? 'all'}
            type="button"
            aria-pressed={verdict === v}
            className={`rounded px-2 py-0.5 ${verdict === v ? 'bg-frame text-white' : 'text-ink-muted hover:bg-paper-sunk'}`}
            onClick={() => setVerdict(v)}
          >
            {v ?? 'all'} {wholeNumber(v ? counts[v] : counts.pieces)}
          </button>
        ))}
      </div>
      <div className="max-h-72 overflow-auto">
        <table className="w-full text-xs" aria-label="Checked pieces">
          <thead className="sticky top-0 bg-paper-sunk text-left text-ink-muted">
            <tr>
              {['Serial', 'λ nm', 'Retardance λ', 'Error λ', 'Axis error °', 'Verdict'].map((h) => (
                <th key={h} className="px-2.5 py-1 font-medium whitespace-nowrap">
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {paged.entries.map((p) => (
              <tr key={`${p.serial}-${p.wavelengthNm}`} className="border-t border-paper-line/60">
                <td className="px-2.5 py-0.5 font-mono">{p.serial}</td>
                <td className="px-2.5 py-0.5 text-right">{fixed(p.wavelengthNm, 1)}</td>
                <td className="px-2.5 py-0.5 text-right font-mono">{fixed(p.retardanceWaves, 4)}</td>
                <td className="px-2.5 py-0.5 text-right font-mono">{fixed(p.retardanceErrorWaves, 4)}</td>
                <td className="px-2.5 py-0.5 text-right font-mono">{fixed(p.axisErrorDeg, 2)}</td>
                <td className="px-2.5 py-0.5">
                  <VerdictBadge value={p.verdict} /> <span className="text-ink-muted">{p.reasons.join('; ')}</span>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {paged.error && (
        <div className="px-3 py-2">
          <Notice tone="error">{paged.error.message}</Notice>
        </div>
      )}
      <Pager what="pieces" page={paged.page} total={paged.total} onPage={paged.setPage} />
    </div>
  );
}

function PreviewOfFile({ checked }: { checked: Checked }) {
  const { file } = checked;
  const { counts } = file;
  const problems = counts.errors + (file.fatal ? 1 : 0);
  return (
    <section aria-label={`Preview of ${file.name}`} className="rounded border border-paper-line bg-paper-card">
      <header className="flex flex-wrap items-baseline gap-x-4 gap-y-1 border-b border-paper-line px-3 py-2 text-sm">
        <span className="font-medium">{file.name}</span>
        <span className="text-xs text-ink-muted">
          {file.method ?? 'method not recognised'} · {file.instrument?.code ?? 'no instrument'} · {plural(counts.pieces, 'piece result')}
          {counts.pieces > 0 && ` (${counts.pass} pass, ${counts.fail} fail, ${counts.incomplete} incomplete)`}
        </span>
        <span className="font-mono text-2xs text-ink-faint">SHA-256 {file.sha256.slice(0, 16)}…</span>
        <span className={`ml-auto text-xs font-medium ${problems ? 'text-state-fail' : 'text-state-pass'}`}>
          {problems ? plural(problems, 'problem') : 'ready to save'}
        </span>
      </header>
      {file.fatal && (
        <div className="px-3 py-2">
          <Notice tone="error">{file.fatal}</Notice>
        </div>
      )}
      <MessageList checked={checked} list="errors" label="Errors" tone="text-sm text-state-fail" total={counts.errors} />
      <MessageList checked={checked} list="warnings" label="Warnings" tone="text-xs text-ink-muted" total={counts.warnings} />
      <PieceList checked={checked} />
    </section>
  );
}

const standingText = (s: SampleStanding) => `${s.measured} measured, ${plural(s.defectives, 'defective')}`;

/** What saving the checked files would do to the lot's decision. */
function PlanEffectNote({ effect }: { effect: PlanEffect }) {
  const { plan, now, afterSaving } = effect;
  const rows: [string, ReactNode][] = [
    ['Sample', `n = ${plan.sampleSize}, Ac ${plan.accept}, Re ${plan.reject}`],
    [
      'Now',
      <>
        {standingText(now)} · <VerdictBadge value={now.proposal} />
      </>,
    ],
    [
      'After saving',
      <>
        {standingText(afterSaving)} · <VerdictBadge value={afterSaving.proposal} /> <span className="text-ink-muted">{afterSaving.explanation}</span>
      </>,
    ],
  ];
  if (effect.sortRemaining) rows.push(['Left to sort', `${effect.sortRemaining.now} now, ${effect.sortRemaining.afterSaving} after saving`]);
  return (
    <section aria-label="Effect on the sampling decision" className="rounded border border-paper-line bg-paper-card px-3 py-2 text-sm">
      <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5">
        {rows.map(([k, v]) => (
          <div key={k} className="contents">
            <dt className="text-xs leading-5 text-ink-muted">{k}</dt>
            <dd>{v}</dd>
          </div>
        ))}
      </dl>
      <p className="mt-1 text-xs text-ink-muted">
        These files measure {plural(effect.samplePieces, 'sample piece')} and {plural(effect.otherPieces, 'other piece')}
        {effect.replacing > 0 && `; ${plural(effect.replacing, 'result')} replace current ones`}.
      </p>
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
  const ready = previews.length > 0 && previews.every((f) => !f.fatal && f.counts.errors === 0);

  const choose = (list: FileList | null) => {
    setFiles(list ? [...list] : []);
    preview.reset();
    commit.reset();
  };
  const save = () =>
    commit.mutate(
      { files, instrumentId },
      {
        onSuccess: () => {
          setFiles([]);
          preview.reset();
          setInputKey((k) => k + 1);
        },
      },
    );
  const commitErrors = commit.error instanceof ApiError && Array.isArray(commit.error.details) ? commit.error.details : [];

  return (
    <div className="space-y-3 rounded border border-paper-line bg-paper p-3">
      {/* Where the plates are measured: the bench's cautions, once, beside the files it produces. */}
      <p className="text-xs text-ink-muted">
        At the bench: polarimeters use laser sources, so keep beams at bench height, wear the eyewear the source's class requires and never look into the beam
        or its reflections. Handle plates by the rim with gloves; crystal and film retarders are fragile.
      </p>
      <div className="flex flex-wrap items-end gap-3">
        <Field label="Bench files (CSV)" htmlFor="bench-files">
          <input
            key={inputKey}
            id="bench-files"
            type="file"
            accept=".csv,text/csv,text/plain"
            multiple
            className="text-sm"
            onChange={(e) => choose(e.target.files)}
          />
        </Field>
        <Field label="Instrument (when the file does not name it)" htmlFor="bench-instrument">
          <select
            id="bench-instrument"
            className={inputClass}
            value={instrumentId ?? ''}
            onChange={(e) => setInstrumentId(e.target.value ? Number(e.target.value) : undefined)}
          >
            <option value="">— named in the file —</option>
            {(instruments.data?.data ?? [])
              .filter((i) => i.active)
              .map((i) => (
                <option key={i.id} value={i.id}>
                  {i.code}
                  {i.calibrationCurrent ? '' : ' (calibration lapsed)'}
                </option>
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
      <p className="text-xs text-ink-muted">
        Checking runs every row through the analysis and saves nothing. Saving stores the raw file with its SHA-256, its readings and the results together.
      </p>
      {preview.error && <Notice tone="error">{preview.error.message}</Notice>}
      {commit.error && (
        <Notice tone="error" title={commit.error.message}>
          {commitErrors.map((f: { name: string; fatal?: string; errors: { line: number; message: string }[] }) => (
            <p key={f.name}>
              {f.name}: {f.fatal ?? `${plural(f.errors.length, 'error')}, first at line ${f.errors[0]?.line}`}
            </p>
          ))}
        </Notice>
      )}
      {commit.isSuccess && <Notice tone="info">Saved {commit.data.files.map((f) => `${f.name} (${f.rows} rows, ${f.pieces} results)`).join(', ')}.</Notice>}
      {preview.data?.planEffect && <PlanEffectNote effect={preview.data.planEffect} />}
      {previews.map((f) => (
        <PreviewOfFile key={f.sha256 + f.name} checked={{ lotId, file: f, instrumentId: preview.variables?.instrumentId }} />
      ))}
    </div>
  );
}
