import { useState } from 'react';
import { Plus } from 'lucide-react';
import { can } from '@shared/policies';
import { INSTRUMENT_KIND_LABELS, type InstrumentView } from '@shared/schemas/instruments';
import { Button } from '@/components/Button';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { useSession } from '@/lib/session';
import { useInstruments } from '../api';
import { InstrumentForm } from '../components/InstrumentForm';

export function InstrumentsPage() {
  const { data: user } = useSession();
  const instruments = useInstruments();
  const [editing, setEditing] = useState<InstrumentView | 'new' | null>(null);
  const mayManage = can(user, 'instruments.manage');
  return (
    <div className="max-w-6xl">
      <PageHeader
        title="Instruments"
        subtitle="The bench's polarimeters, their export profile, expanded uncertainty and calibration. Readings from an instrument past its due date are refused."
        actions={
          mayManage &&
          !editing && (
            <Button onClick={() => setEditing('new')}>
              <Plus className="h-4 w-4" aria-hidden /> Register instrument
            </Button>
          )
        }
      />
      {editing && <InstrumentForm instrument={editing === 'new' ? undefined : editing} onDone={() => setEditing(null)} />}
      {instruments.error && <Notice tone="error">{instruments.error.message}</Notice>}
      <table className="w-full rounded border border-paper-line bg-paper-card text-sm">
        <thead className="bg-paper-sunk text-left text-xs text-ink-muted">
          <tr>
            {['Code', 'Kind', 'Description', 'U retardance', 'U axis', 'Profile', 'Calibration', ''].map((h) => (
              <th key={h} className="px-2.5 py-1.5 font-medium">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {(instruments.data?.data ?? []).map((i) => (
            <tr key={i.id} className={`border-t border-paper-line/70 ${i.active ? '' : 'text-ink-faint'}`}>
              <td className="px-2.5 py-1 font-mono">{i.code}</td>
              <td className="px-2.5 py-1">{INSTRUMENT_KIND_LABELS[i.kind]}</td>
              <td className="px-2.5 py-1">
                {i.description}
                {!i.active && ' (not in use)'}
              </td>
              <td className="px-2.5 py-1 font-mono">±{i.uncertaintyWaves.toFixed(4)} λ</td>
              <td className="px-2.5 py-1 font-mono">±{i.uncertaintyDeg.toFixed(2)}°</td>
              <td className="px-2.5 py-1 text-xs">
                {i.s3Sign === -1 ? 'S3 reversed' : 'S3 as ours'}, {i.angleSign === -1 ? 'angles reversed' : 'angles as ours'}
              </td>
              <td className="px-2.5 py-1 text-xs">
                <span className={i.calibrationCurrent ? 'text-state-pass' : 'font-medium text-state-fail'}>
                  {i.calibrationCurrent ? `due ${i.calibrationDueOn}` : `lapsed ${i.calibrationDueOn}`}
                </span>
              </td>
              <td className="px-2.5 py-1 text-right">
                {mayManage && (
                  <Button look="quiet" className="!py-0 text-xs" onClick={() => setEditing(i)}>
                    Edit
                  </Button>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
