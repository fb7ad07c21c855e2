import { useNavigate, useParams } from 'react-router-dom';
import { can } from '@shared/policies';
import { Details, Panel } from '@/components/Details';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { SpecSummary } from '@/components/SpecSummary';
import { useSession } from '@/lib/session';
import { usePart } from '../api';
import { PartForm } from '../components/PartForm';
import { PurchasingTabs } from '../components/PurchasingTabs';

/** A part: the buyer edits it (or creates one at /purchasing/parts/new); everyone else reads it. */
export function PartPage() {
  const { partId } = useParams();
  const id = partId === 'new' ? undefined : Number(partId);
  const part = usePart(id);
  const { data: user } = useSession();
  const navigate = useNavigate();
  const toList = () => navigate('/purchasing/parts');
  if (part.error) return <Notice tone="error">{part.error.message}</Notice>;
  if (id !== undefined && !part.data) return <p className="text-ink-muted">Loading…</p>;
  return (
    <div className="max-w-5xl">
      <PageHeader
        title={part.data ? `Part ${part.data.number}` : 'New part'}
        subtitle={part.data?.description ?? 'A wave plate as it is ordered: what it must measure, and how it is judged.'}
      />
      <PurchasingTabs />
      {can(user, 'catalog.write') ? (
        <PartForm part={part.data} onSaved={(saved) => navigate(`/purchasing/parts/${saved.id}`)} onCancel={toList} />
      ) : (
        part.data && (
          <div className="space-y-3">
            <Panel title="Ordered specification">
              <SpecSummary spec={part.data.spec} />
            </Panel>
            <Panel title="Stock">
              <Details
                items={[
                  ['In stock bins', part.data.onHand],
                  ['Status', part.data.active ? 'Ordered' : 'Retired'],
                ]}
              />
            </Panel>
          </div>
        )
      )}
    </div>
  );
}
