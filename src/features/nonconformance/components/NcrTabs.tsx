import { SectionTabs } from '@/components/SectionTabs';

export function NcrTabs() {
  return (
    <SectionTabs
      label="Nonconformance"
      tabs={[
        { to: '/nonconformances', label: 'Reports (NCR)', end: true },
        { to: '/nonconformances/returns', label: 'Returns to vendor' },
        { to: '/nonconformances/defect-codes', label: 'Defect codes' },
      ]}
    />
  );
}
