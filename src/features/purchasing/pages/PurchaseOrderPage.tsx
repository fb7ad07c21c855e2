import { Link, useNavigate, useParams } from 'react-router-dom';
import { FileDown, Pencil } from 'lucide-react';
import { can } from '@shared/policies';
import type { PieceQuantities } from '@shared/schemas/stock';
import { Details, Panel } from '@/components/Details';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { PieceOutcomes } from '@/components/PieceOutcomes';
import { SpecSummary } from '@/components/SpecSummary';
import { StateBadge } from '@/components/StateBadge';
import { apiUrl } from '@/lib/api';
import { useSession } from '@/lib/session';
import { usePurchaseOrder } from '../api';
import { money } from '../components/money';
import { PurchaseOrderForm } from '../components/PurchaseOrderForm';
import { PurchasingTabs } from '../components/PurchasingTabs';

/** A PO: its lines with what each has received, and the specification each line was ordered with. */
export function PurchaseOrderPage({ editing = false }: { editing?: boolean }) {
  const { orderId } = useParams();
  const id = orderId === undefined ? undefined : Number(orderId);
  const order = usePurchaseOrder(id);
  const { data: user } = useSession();
  const navigate = useNavigate();
  const mayEdit = can(user, 'catalog.write');
  if (order.error) return <Notice tone="error">{order.error.message}</Notice>;
  if (id !== undefined && !order.data) return <p className="text-ink-muted">Loading…</p>;
  const po = order.data;
  const header = (
    <PageHeader
      title={po ? `Purchase order ${po.number}` : 'New purchase order'}
      subtitle={po ? po.supplier.name : 'Lines take the specification of their part as it is today; later edits of the part do not change them.'}
      actions={
        po &&
        !editing && (
          <div className="flex flex-wrap gap-2">
            <a
              href={apiUrl(`/purchase-orders/${po.id}/order.pdf`)}
              target="_blank"
              rel="noreferrer"
              className="inline-flex items-center gap-1.5 rounded border border-paper-line bg-paper-card px-3 py-1.5 text-sm font-medium text-ink no-underline hover:bg-paper-sunk"
            >
              <FileDown className="h-4 w-4" aria-hidden /> PDF for the supplier
            </a>
            {mayEdit && (
              <Link
                to={`/purchasing/orders/${po.id}/edit`}
                className="inline-flex items-center gap-1.5 rounded border border-paper-line bg-paper-card px-3 py-1.5 text-sm font-medium text-ink no-underline hover:bg-paper-sunk"
              >
                <Pencil className="h-4 w-4" aria-hidden /> Edit
              </Link>
            )}
          </div>
        )
      }
    />
  );

  if (editing || !po) {
    if (!mayEdit)
      return (
        <Notice tone="error" title="Not available to your role">
          Only buyers place and change purchase orders.
        </Notice>
      );
    return (
      <div className="max-w-6xl">
        {header}
        <PurchasingTabs />
        <PurchaseOrderForm
          order={po}
          onSaved={(saved) => navigate(`/purchasing/orders/${saved.id}`)}
          onCancel={() => navigate(po ? `/purchasing/orders/${po.id}` : '/purchasing/orders')}
        />
      </div>
    );
  }
  const ordered = po.lines.reduce((sum, l) => sum + l.quantity, 0);
  const received = po.lines.reduce((sum, l) => sum + l.received, 0);
  const value = po.lines.reduce((sum, l) => sum + l.quantity * l.unitPrice, 0);
  const sumOf = (key: keyof PieceQuantities) => po.lines.reduce((sum, l) => sum + l[key], 0);
  const outcomes: PieceQuantities = { accepted: sumOf('accepted'), nonconforming: sumOf('nonconforming'), returned: sumOf('returned') };
  return (
    <div className="max-w-6xl space-y-3">
      {header}
      <PurchasingTabs />
      <Panel title="Order">
        <Details
          columns={4}
          items={[
            ['Status', <StateBadge key="s" state={po.status} />],
            ['Ordered on', po.orderedOn],
            ['Buyer', po.buyer?.name],
            ['Value', money(value, po.currency)],
            ['Pieces', `${received} of ${ordered} received`],
            ['Outcome', <PieceOutcomes key="o" quantities={outcomes} />],
            ['Replacements received', po.lines.reduce((sum, l) => sum + l.replaced, 0)],
            [
              'Receipts',
              <Link key="l" to={`/lots?purchaseOrderId=${po.id}`}>
                Lots of this PO
              </Link>,
            ],
            ['Notes', po.notes || '—'],
          ]}
        />
      </Panel>
      {po.lines.map((line) => (
        <Panel
          key={line.id}
          title={`Line ${line.lineNumber}: ${line.part.number}`}
          actions={
            <span className="text-xs text-ink-muted">
              {line.received} of {line.quantity} received{line.outstanding > 0 ? `, ${line.outstanding} expected` : ''}
            </span>
          }
        >
          <div className="space-y-3">
            <Details
              columns={4}
              items={[
                [
                  'Part',
                  <Link key="p" to={`/purchasing/parts/${line.part.id}`}>
                    {line.part.description}
                  </Link>,
                ],
                ['Unit price', money(line.unitPrice, po.currency)],
                ['Due', line.dueOn ?? 'No date agreed'],
                ['Sampling', `Level ${line.inspectionLevel}, AQL ${line.aql}`],
                ['100 % inspection', line.hundredPercent ? 'Yes' : 'No'],
                ['Outcome', <PieceOutcomes key="o" quantities={line} />],
                ['Replacements received', line.replaced > 0 ? `${line.replaced} for pieces returned` : 'None'],
              ]}
            />
            <div className="rounded bg-paper px-3 py-2">
              <p className="mb-1.5 text-2xs font-medium tracking-wide text-ink-faint uppercase">Specification as ordered</p>
              <SpecSummary spec={line.spec} />
            </div>
          </div>
        </Panel>
      ))}
    </div>
  );
}
