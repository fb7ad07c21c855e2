import { useNavigate } from 'react-router-dom';
import { can } from '@shared/policies';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { useSession } from '@/lib/session';
import { ReceiveForm } from '../components/ReceiveForm';
import { ReceivingTabs } from '../components/ReceivingTabs';

export function ReceivePage() {
  const { data: user } = useSession();
  const navigate = useNavigate();
  return (
    <div className="max-w-5xl">
      <PageHeader title="Receiving" subtitle="Log a shipment against its PO line. The lot waits in quarantine until inspection decides it." />
      <ReceivingTabs />
      {can(user, 'shipments.receive') ? (
        <div className="rounded border border-paper-line bg-paper-card p-4">
          <ReceiveForm onReceived={(receipt) => navigate(`/lots/${receipt.lotId}?received=1`)} />
        </div>
      ) : (
        <Notice tone="info">Receiving clerks log shipments; you can follow them in the list of shipments and lots.</Notice>
      )}
    </div>
  );
}
