import { SectionTabs } from '@/components/SectionTabs';

export function PurchasingTabs() {
  return (
    <SectionTabs
      label="Purchasing"
      tabs={[
        { to: '/purchasing/orders', label: 'Purchase orders' },
        { to: '/purchasing/parts', label: 'Parts' },
        { to: '/purchasing/suppliers', label: 'Suppliers' },
      ]}
    />
  );
}
