import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import { Plus } from 'lucide-react';
import { can } from '@shared/policies';
import type { SupplierView } from '@shared/schemas/purchasing';
import { Button } from '@/components/Button';
import { DataTable, useListState } from '@/components/DataTable';
import { FilterSelect, ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { StateBadge } from '@/components/StateBadge';
import { counted } from '@/lib/plural';
import { useSession } from '@/lib/session';
import { useSuppliers } from '../api';
import { PurchasingTabs } from '../components/PurchasingTabs';
import { SupplierForm } from '../components/SupplierForm';

const column = createColumnHelper<SupplierView>();

export function SuppliersPage() {
  const { data: user } = useSession();
  const mayEdit = can(user, 'catalog.write');
  const maySeeSwitching = can(user, 'switching.read');
  const maySeePerformance = can(user, 'suppliers.performance');
  const { state, update, params } = useListState({ sort: 'name' });
  const active = params.get('active') ?? undefined;
  const suppliers = useSuppliers({ ...state, active });
  const [editing, setEditing] = useState<SupplierView | 'new' | null>(null);
  const columns = useMemo(
    () => [
      column.accessor('name', { header: 'Supplier', cell: ({ getValue }) => <span className="font-medium">{getValue()}</span> }),
      column.accessor('contactEmail', {
        header: 'Contact',
        cell: ({ getValue }) => (
          <a href={`mailto:${getValue()}`} onClick={(e) => e.stopPropagation()}>
            {getValue()}
          </a>
        ),
      }),
      column.accessor((s) => s.owner?.name ?? '—', { id: 'owner', header: 'Owner' }),
      column.accessor('openOrders', { header: 'Open POs', cell: ({ getValue }) => <span className="tabular-nums">{getValue()}</span> }),
      column.accessor('active', {
        header: 'Status',
        cell: ({ getValue }) => <StateBadge state={getValue() ? 'open' : 'closed'} label={getValue() ? 'Active' : 'Inactive'} />,
      }),
      column.accessor('notes', { header: 'Notes', enableSorting: false, cell: ({ getValue }) => <span className="text-xs text-ink-muted">{getValue()}</span> }),
      ...(maySeeSwitching
        ? [
            column.display({
              id: 'switching',
              header: 'Inspection severity',
              cell: ({ row }) => (
                <Link to={`/switching?supplierId=${row.original.id}`} onClick={(e) => e.stopPropagation()} className="text-xs whitespace-nowrap">
                  Switching by part
                </Link>
              ),
            }),
          ]
        : []),
      ...(maySeePerformance
        ? [
            column.display({
              id: 'performance',
              header: 'Performance',
              cell: ({ row }) => (
                <Link to={`/supplier-performance/${row.original.id}`} onClick={(e) => e.stopPropagation()} className="text-xs whitespace-nowrap">
                  Scorecard and drift
                </Link>
              ),
            }),
          ]
        : []),
    ],
    [maySeeSwitching, maySeePerformance],
  );
  return (
    <div>
      <PageHeader
        title="Purchasing"
        subtitle="Suppliers, the parts ordered from them with their optical specification, and purchase orders."
        actions={
          mayEdit &&
          editing === null && (
            <Button onClick={() => setEditing('new')}>
              <Plus className="h-4 w-4" aria-hidden /> New supplier
            </Button>
          )
        }
      />
      <PurchasingTabs />
      {editing && (
        <SupplierForm key={editing === 'new' ? 'new' : editing.id} supplier={editing === 'new' ? undefined : editing} onDone={() => setEditing(null)} />
      )}
      <ListToolbar
        list={{ state, update }}
        filters={{ active }}
        placeholder="Search name, e-mail or owner"
        exportPath="/suppliers"
        summary={counted(suppliers.data?.total ?? 0, 'supplier')}
      >
        <FilterSelect
          label="Status"
          value={active}
          onChange={(value) => update({ active: value })}
          options={[
            { value: 'true', label: 'Active' },
            { value: 'false', label: 'Inactive' },
          ]}
        />
      </ListToolbar>
      {suppliers.error && <Notice tone="error">{suppliers.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={suppliers.data?.data ?? []}
        total={suppliers.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={suppliers.isPending}
        empty="No supplier matches."
        onRowClick={mayEdit ? (row) => setEditing(row) : undefined}
      />
    </div>
  );
}
