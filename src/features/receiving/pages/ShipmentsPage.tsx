import { useMemo } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import type { ShipmentRow } from '@shared/schemas/receiving';
import { lotName } from '@shared/schemas/stock';
import { DataTable, useListState } from '@/components/DataTable';
import { ListToolbar } from '@/components/ListToolbar';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { counted } from '@/lib/plural';
import { useShipments } from '../api';
import { ReceivingTabs } from '../components/ReceivingTabs';
import { formatDateTime } from '@shared/format';

type Row = ShipmentRow & { lotIds: number[] };
const column = createColumnHelper<Row>();

export function ShipmentsPage() {
  const navigate = useNavigate();
  const { state, update } = useListState({ sort: '-receivedAt' });
  const shipments = useShipments(state);
  const columns = useMemo(
    () => [
      column.accessor('receivedAt', { header: 'Received', cell: ({ getValue }) => formatDateTime(getValue()) }),
      column.accessor('poNumber', { header: 'PO', cell: ({ getValue }) => <span className="font-mono">{getValue()}</span> }),
      column.accessor('supplierName', { header: 'Supplier' }),
      column.accessor('packingSlip', { header: 'Packing slip', cell: ({ getValue }) => <span className="font-mono">{getValue()}</span> }),
      column.accessor('carrier', { header: 'Carrier' }),
      column.accessor('receivedBy', { header: 'Received by', enableSorting: false }),
      column.accessor('lotIds', {
        header: 'Lots',
        enableSorting: false,
        cell: ({ getValue }) =>
          getValue().map((id) => (
            <Link key={id} to={`/lots/${id}`} onClick={(e) => e.stopPropagation()} className="mr-1 font-mono">
              {lotName(id)}
            </Link>
          )),
      }),
      column.accessor('pieces', { header: 'Pieces', cell: ({ getValue }) => <span className="tabular-nums">{getValue()}</span> }),
    ],
    [],
  );
  return (
    <div>
      <PageHeader title="Receiving" subtitle="Shipments received against purchase orders, newest first." />
      <ReceivingTabs />
      <ListToolbar
        list={{ state, update }}
        placeholder="PO, supplier, packing slip, carrier"
        exportPath="/shipments"
        summary={shipments.data && `${counted(shipments.data.total, 'shipment')} · ${counted(shipments.data.totals.pieces, 'piece')}`}
      />
      {shipments.error && <Notice tone="error">{shipments.error.message}</Notice>}
      <DataTable
        columns={columns}
        data={shipments.data?.data ?? []}
        total={shipments.data?.total ?? 0}
        state={state}
        onChange={update}
        isLoading={shipments.isPending}
        empty="No shipment matches."
        onRowClick={(row) => row.lotIds[0] && navigate(`/lots/${row.lotIds[0]}`)}
      />
    </div>
  );
}
