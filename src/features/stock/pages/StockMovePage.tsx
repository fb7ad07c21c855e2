import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { can } from '@shared/policies';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { useSession } from '@/lib/session';
import { IssueForm, PutAwayForm, TransferForm } from '../components/MoveForms';
import { StockTabs } from '../components/StockTabs';

const SUBTITLES = {
  issue: 'Serials leave stores for a work order.',
  transfer: 'Serials move from one stock bin to another.',
  'put-away': 'Pieces of an accepted lot go from quarantine to a stock bin.',
};

export function StockMovePage({ move }: { move: keyof typeof SUBTITLES }) {
  const { data: user } = useSession();
  const [params] = useSearchParams();
  const [done, setDone] = useState<string | null>(null);
  const finish = (message: string) => setDone(message);
  return (
    <div className="max-w-4xl space-y-3">
      <PageHeader title="Stock" subtitle={SUBTITLES[move]} />
      <StockTabs />
      {!can(user, 'stock.move') ? (
        <Notice tone="error" title="Not available to your role">
          Receiving clerks move stock.
        </Notice>
      ) : (
        <>
          {done && (
            <Notice tone="info" title="Done">
              {done}
            </Notice>
          )}
          <div className="rounded border border-paper-line bg-paper-card p-4">
            {move === 'issue' && <IssueForm onDone={finish} />}
            {move === 'transfer' && <TransferForm onDone={finish} />}
            {move === 'put-away' && <PutAwayForm lotId={params.get('lot') ?? undefined} onDone={finish} />}
          </div>
        </>
      )}
    </div>
  );
}
