import { SectionTabs } from '@/components/SectionTabs';

export function ReceivingTabs() {
  return (
    <SectionTabs
      label="Receiving"
      tabs={[
        { to: '/receiving', label: 'Shipments', end: true },
        { to: '/receiving/new', label: 'Receive a shipment' },
      ]}
    />
  );
}
