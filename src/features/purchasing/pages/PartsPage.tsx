import { useMemo } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { Plus } from 'lucide-react';
import { can } from '@shared/policies';
import type { PartView } from '@shared/schemas/purchasing';
import { MATERIAL_LABELS, retardanceName } from '@shared/schemas/spec';
import { DataTable, useListState } from '@/components/DataTable';
import { ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { constructionText } from '@/components/SpecSummary';
import { StateBadge } from '@/components/StateBadge';
import { counted } from '@/lib/plural';
import { useSession } from '@/lib/session';
import { useParts } from '../api';
import { PurchasingTabs } from '../components/PurchasingTabs';

const column = createColumnHelper<PartView>();

export function PartsPage() {
  const { data: user } = useSession();
  const navigate = useNavigate();
  const { state, update } = useListState({ sort: 'number' });
  const parts = useParts(state);
  const columns = useMemo(
    () => [
      column.accessor('number', { header: 'Part number', cell: ({ getValue }) => <span className="font-mono">{getValue()}</span> }),
      column.accessor('description', { header: 'Description' }),
      column.accessor((p) => retardanceName(p.spec), { id: 'designWavelengthNm', header: 'Retardance' }),
      column.accessor((p) => `±${p.spec.retardanceTolWaves} λ, ±${p.spec.axisTolDeg}°`, { id: 'tolerance', header: 'Tolerances', enableSorting: false }),
      column.accessor((p) => constructionText(p.spec), { id: 'construction', header: 'Construction' }),
      column.accessor((p) => MATERIAL_LABELS[p.spec.material], { id: 'material', header: 'Material' }),
      column.accessor('onHand', { header: 'In stock', cell: ({ getValue }) => <span className="tabular-nums">{getValue()}</span> }),
      column.accessor('active', {
        header: 'Status',
        enableSorting: false,
        cell: ({ getValue }) => <StateBadge state={getValue() ? 'open' : 'closed'} label={getValue() ? 'Ordered' : 'Retired'} />,
      }),
    ],
    [],
  );
  return (
    <div>
      <PageHeader
        title="Purchasing"
        subtitle="Suppliers, the parts ordered from them with their optical specification, and purchase orders."
        actions={
          can(user, 'catalog.write') && (
            <Link
              to="/purchasing/parts/new"
              className="inline-flex items-center gap-1.5 rounded bg-frame px-3 py-1.5 text-sm font-medium text-white no-underline hover:bg-frame-deep"
            >
              <Plus className="h-4 w-4" aria-hidden /> New part
            </Link>
          )
        }
      />
      <PurchasingTabs />
      <ListToolbar
        list={{ state, update }}
        placeholder="Search part, description, material"
        exportPath="/parts"
        summary={counted(parts.data?.total ?? 0, 'part')}
      />
      {parts.error && <Notice tone="error">{parts.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={parts.data?.data ?? []}
        total={parts.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={parts.isPending}
        empty="No part matches."
        onRowClick={(p) => navigate(`/purchasing/parts/${p.id}`)}
      />
    </div>
  );
}
