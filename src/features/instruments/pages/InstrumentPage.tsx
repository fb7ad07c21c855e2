import { useMemo, useRef, useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { FileText, Plus } from 'lucide-react';
import { calibrationDueStatus, type CalibrationStanding } from '@shared/calibration';
import { fixed, formatDate, formatDateTime, MISSING } from '@shared/format';
import { can } from '@shared/policies';
import { INSTRUMENT_KIND_LABELS, type CalibrationView, type InstrumentDetailView, type InstrumentFileView } from '@shared/schemas/instruments';
import { Button } from '@/components/Button';
import { DataTable, useListState } from '@/components/DataTable';
import { Details, Panel } from '@/components/Details';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { ScrollBox } from '@/components/ScrollBox';
import { StateBadge, type Tone } from '@/components/StateBadge';
import { useSession } from '@/lib/session';
import { certificateUrl, useAttachCertificate, useInstrument, useInstrumentFiles } from '../api';
import { CalibrationDue } from '../components/CalibrationDue';
import { CalibrationForm } from '../components/CalibrationForm';

const STANDINGS: Record<CalibrationStanding, { label: string; tone: Tone }> = {
  'in-force': { label: 'In force', tone: 'pass' },
  lapsed: { label: 'Lapsed', tone: 'fail' },
  superseded: { label: 'Superseded', tone: 'neutral' },
};

/** The uncertainties a certificate states, as written on it. */
function statedUncertainty(c: CalibrationView) {
  const parts = [
    c.uncertaintyRetardance !== null && `±${c.uncertaintyRetardance} ${c.uncertaintyRetardanceUnit === 'waves' ? 'λ' : 'nm'}`,
    c.uncertaintyAngleDeg !== null && `±${fixed(c.uncertaintyAngleDeg, 2)}°`,
    c.uncertaintyNote,
  ].filter(Boolean);
  return parts.length ? parts.join('; ') : MISSING;
}

function AttachCertificate({ instrumentId, calibration }: { instrumentId: number; calibration: CalibrationView }) {
  const attach = useAttachCertificate(instrumentId);
  const input = useRef<HTMLInputElement>(null);
  const id = `attach-${calibration.id}`;
  return (
    // Relative: the visually hidden input stays inside the scrolling table instead of widening the page.
    <span className="relative inline-flex flex-col gap-0.5">
      <label htmlFor={id} className="cursor-pointer text-xs font-medium text-frame hover:underline">
        Attach PDF
      </label>
      <input
        id={id}
        ref={input}
        type="file"
        accept="application/pdf"
        className="sr-only"
        onChange={(event) => {
          const file = event.target.files?.[0];
          if (file) attach.mutate({ calibrationId: calibration.id, file });
          event.target.value = '';
        }}
      />
      {attach.error && (
        <span role="alert" className="text-2xs text-state-fail">
          {attach.error.message}
        </span>
      )}
    </span>
  );
}

function CalibrationHistory({ instrument, mayCalibrate }: { instrument: InstrumentDetailView; mayCalibrate: boolean }) {
  return (
    <ScrollBox label="Calibration records">
      <table className="w-full text-sm">
        <thead className="bg-paper-sunk text-left text-xs text-ink-muted">
          <tr>
            {['Calibrated on', 'Due on', 'Standing', 'Performed by', 'Certificate', 'Stated uncertainty', 'Recorded'].map((h) => (
              <th key={h} className="px-2.5 py-1.5 font-medium whitespace-nowrap">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {instrument.calibrations.map((c) => (
            <tr key={c.id} data-standing={c.standing} className={`border-t border-paper-line/70 ${c.standing === 'in-force' ? 'bg-state-pass/5' : ''}`}>
              <td className="px-2.5 py-1 font-mono whitespace-nowrap">{formatDate(c.calibratedOn)}</td>
              <td className="px-2.5 py-1 font-mono whitespace-nowrap">{formatDate(c.dueOn)}</td>
              <td className="px-2.5 py-1">
                <StateBadge state={c.standing} label={STANDINGS[c.standing].label} tone={STANDINGS[c.standing].tone} />
              </td>
              <td className="px-2.5 py-1">{c.performedBy || MISSING}</td>
              <td className="px-2.5 py-1 whitespace-nowrap">
                {c.certificateNumber && <span className="mr-2 font-mono text-xs">{c.certificateNumber}</span>}
                {c.certificate ? (
                  <a href={certificateUrl(instrument.id, c.id)} target="_blank" rel="noreferrer" className="inline-flex items-center gap-1 text-xs font-medium">
                    <FileText className="h-3.5 w-3.5" aria-hidden /> {c.certificate.name}
                  </a>
                ) : mayCalibrate ? (
                  <AttachCertificate instrumentId={instrument.id} calibration={c} />
                ) : (
                  <span className="text-xs text-ink-muted">no PDF</span>
                )}
              </td>
              <td className="px-2.5 py-1 text-xs">{statedUncertainty(c)}</td>
              <td className="px-2.5 py-1 text-xs whitespace-nowrap text-ink-muted">
                {c.carriedOver ? `Carried over from the instrument's dates` : `${c.recordedBy ?? MISSING}, ${formatDateTime(c.recordedAt)}`}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </ScrollBox>
  );
}

const column = createColumnHelper<InstrumentFileView>();

function MeasuredFiles({ instrumentId }: { instrumentId: number }) {
  const { state, update } = useListState({ sort: '-uploadedAt', pageSize: 20 });
  const files = useInstrumentFiles(instrumentId, { page: state.page, pageSize: state.pageSize, sort: state.sort });
  const columns = useMemo(
    () => [
      column.accessor('name', { header: 'File', cell: ({ getValue }) => <span className="font-mono text-xs whitespace-nowrap">{getValue()}</span> }),
      column.accessor('lot', {
        header: 'Lot',
        cell: ({ row }) => (
          <Link to={`/lots/${row.original.lotId}`} className="font-mono font-medium">
            {row.original.lot}
          </Link>
        ),
      }),
      column.accessor('method', { header: 'Method', enableSorting: false }),
      column.accessor('measuredOn', { header: 'Measured on', enableSorting: false, cell: ({ getValue }) => formatDate(getValue()) }),
      column.accessor('rowCount', { header: 'Rows', enableSorting: false, cell: ({ getValue }) => <span className="tabular-nums">{getValue()}</span> }),
      column.accessor('uploadedAt', { header: 'Uploaded', cell: ({ getValue }) => <span className="whitespace-nowrap">{formatDateTime(getValue())}</span> }),
      column.accessor('uploadedBy', { header: 'By', enableSorting: false }),
    ],
    [],
  );
  if (files.error) return <Notice tone="error">{files.error.message}</Notice>;
  return (
    <DataTable
      columns={columns}
      data={files.data?.data ?? []}
      total={files.data?.total ?? 0}
      state={state}
      onChange={update}
      isLoading={files.isLoading}
      empty="No bench file has been measured with this instrument"
    />
  );
}

export function InstrumentPage() {
  const id = Number(useParams().id);
  const { data: user } = useSession();
  const instrument = useInstrument(id);
  const [recording, setRecording] = useState(false);
  const mayCalibrate = can(user, 'instruments.calibrate');
  if (instrument.error) return <Notice tone="error">{instrument.error.message}</Notice>;
  const i = instrument.data;
  if (!i) return <p className="text-sm text-ink-muted">Loading…</p>;
  const due = calibrationDueStatus(i.calibrationDueOn);
  return (
    <div className="max-w-6xl space-y-4">
      <PageHeader
        title={`Instrument ${i.code}`}
        subtitle={
          <>
            <Link to="/instruments">Instruments</Link> · {INSTRUMENT_KIND_LABELS[i.kind]}
            {!i.active && ' · not in use'}
          </>
        }
      />
      {due.state === 'lapsed' && (
        <Notice tone="error" title="Calibration lapsed">
          Bench files measured on {i.code} after {i.calibrationDueOn} are refused until a new calibration is recorded.
        </Notice>
      )}
      <Panel title="Details">
        <Details
          columns={4}
          items={[
            ['Calibration', <CalibrationDue key="due" dueOn={i.calibrationDueOn} />],
            ['Calibrated on', formatDate(i.calibratedOn)],
            ['Expanded uncertainty, retardance', `±${fixed(i.uncertaintyWaves, 4)} λ (k = 2)`],
            ['Expanded uncertainty, fast axis', `±${fixed(i.uncertaintyDeg, 2)}° (k = 2)`],
            ['Description', i.description || MISSING],
            ['S3 sign in its exports', i.s3Sign === -1 ? 'reversed' : 'as in our convention'],
            ['Angle direction in its exports', i.angleSign === -1 ? 'reversed' : 'as in our convention'],
            ['In use', i.active ? 'yes' : 'no'],
          ]}
        />
      </Panel>
      <Panel
        title="Calibration history"
        actions={
          mayCalibrate &&
          !recording && (
            <Button onClick={() => setRecording(true)}>
              <Plus className="h-4 w-4" aria-hidden /> Record a calibration
            </Button>
          )
        }
      >
        <div className="space-y-3">
          {recording && (
            <div className="rounded border border-paper-line bg-paper-sunk/50 p-3">
              <CalibrationForm instrumentId={i.id} onDone={() => setRecording(false)} />
            </div>
          )}
          <p className="text-xs text-ink-muted">
            Newest first. A bench file is accepted when the day it was measured lies within one of these calibrations, from its calibration date to its due
            date.
          </p>
          <CalibrationHistory instrument={i} mayCalibrate={mayCalibrate} />
        </div>
      </Panel>
      <section className="space-y-2" aria-label="Bench files measured with it">
        <h2 className="text-sm font-semibold">Bench files measured with it</h2>
        <MeasuredFiles instrumentId={i.id} />
      </section>
    </div>
  );
}
