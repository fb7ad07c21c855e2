import { can } from '@shared/policies';
import { SectionTabs } from '@/components/SectionTabs';
import { useSession } from '@/lib/session';

export function StockTabs() {
  const { data: user } = useSession();
  const moves = can(user, 'stock.move')
    ? [
        { to: '/stock/issue', label: 'Issue to work order' },
        { to: '/stock/transfer', label: 'Transfer' },
        { to: '/stock/put-away', label: 'Put away' },
      ]
    : [];
  return (
    <SectionTabs
      label="Stock"
      tabs={[{ to: '/stock', label: 'On hand', end: true }, { to: '/stock/moves', label: 'Ledger' }, { to: '/pieces', label: 'Find a serial' }, ...moves]}
    />
  );
}
