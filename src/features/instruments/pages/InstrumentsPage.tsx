import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Plus } from 'lucide-react';
import { fixed } from '@shared/format';
import { can } from '@shared/policies';
import { INSTRUMENT_KIND_LABELS, type InstrumentView } from '@shared/schemas/instruments';
import { Button } from '@/components/Button';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { ScrollBox } from '@/components/ScrollBox';
import { useSession } from '@/lib/session';
import { useInstruments } from '../api';
import { CalibrationDue } from '../components/CalibrationDue';
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
        subtitle="The bench's polarimeters, their export profile, expanded uncertainty and calibration. Open an instrument for its calibration history and the files measured with it; readings taken outside its calibrations are refused."
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
      <ScrollBox label="Instruments" className="rounded border border-paper-line bg-paper-card">
        <table className="w-full text-sm">
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
                <td className="px-2.5 py-1 font-mono">
                  <Link to={`/instruments/${i.id}`} className="font-medium">
                    {i.code}
                  </Link>
                </td>
                <td className="px-2.5 py-1">{INSTRUMENT_KIND_LABELS[i.kind]}</td>
                <td className="px-2.5 py-1">
                  {i.description}
                  {!i.active && ' (not in use)'}
                </td>
                <td className="px-2.5 py-1 font-mono whitespace-nowrap">±{fixed(i.uncertaintyWaves, 4)} λ</td>
                <td className="px-2.5 py-1 font-mono whitespace-nowrap">±{fixed(i.uncertaintyDeg, 2)}°</td>
                <td className="px-2.5 py-1 text-xs">
                  {i.s3Sign === -1 ? 'S3 reversed' : 'S3 as ours'}, {i.angleSign === -1 ? 'angles reversed' : 'angles as ours'}
                </td>
                <td className="px-2.5 py-1">
                  <CalibrationDue dueOn={i.calibrationDueOn} />
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
      </ScrollBox>
    </div>
  );
}
