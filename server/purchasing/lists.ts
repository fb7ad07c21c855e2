// The purchasing lists (suppliers, parts, purchase orders): their SQL, the row each shows and their CSV.
import type { z } from 'zod';
import type {
  PartView,
  PoStatus,
  PurchaseOrderRow,
  SupplierView,
  partListQuerySchema,
  poListQuerySchema,
  supplierListQuerySchema,
} from '../../shared/schemas/purchasing';
import { retardanceName, type PartSpec } from '../../shared/schemas/spec';
import { filterWhen, type ListDefinition } from '../http/list';
import { onHandSql } from '../stock/onHand';
import { pieceQuantities, pieceQuantitiesSql, receivedAsOrderedSql } from '../stock/standing';

export const supplierList: ListDefinition<SupplierView, z.infer<typeof supplierListQuerySchema>> = {
  select: `s.id, s.name, s.contact_email AS "contactEmail", s.quality_contact_email AS "qualityContactEmail", s.notes, s.active, u.id AS "ownerId", u.name AS "ownerName",
    (SELECT count(*) FROM purchase_orders po WHERE po.supplier_id = s.id AND po.status = 'open') AS "openOrders"`,
  from: 'suppliers s LEFT JOIN users u ON u.id = s.owner_id',
  sortable: { name: 's.name', contactEmail: 's.contact_email', owner: 'u.name', openOrders: '"openOrders"', active: 's.active' },
  defaultSort: 'name',
  tieBreaker: 's.id',
  search: ['s.name', 's.contact_email', 'u.name'],
  filters: (query) => filterWhen({ clauses: [], replacements: {} }, query.active, 's.active = :active', 'active'),
  present: (r) => ({
    id: Number(r.id),
    name: String(r.name),
    contactEmail: String(r.contactEmail),
    qualityContactEmail: (r.qualityContactEmail as string | null) ?? null,
    owner: r.ownerId ? { id: Number(r.ownerId), name: String(r.ownerName) } : null,
    notes: String(r.notes),
    active: Boolean(r.active),
    openOrders: Number(r.openOrders),
  }),
  csv: {
    filename: 'suppliers',
    columns: [
      { header: 'name', value: (s) => s.name },
      { header: 'contact_email', value: (s) => s.contactEmail },
      { header: 'owner', value: (s) => s.owner?.name },
      { header: 'open_orders', value: (s) => s.openOrders },
      { header: 'active', value: (s) => s.active },
      { header: 'notes', value: (s) => s.notes },
    ],
  },
};

export const partList: ListDefinition<PartView, z.infer<typeof partListQuerySchema>> = {
  select: `p.id, p.number, p.description, p.spec, p.active, ${onHandSql('p.id')} AS "onHand"`,
  from: 'parts p',
  sortable: {
    number: 'p.number',
    description: 'p.description',
    nominalWaves: "(p.spec->>'nominalWaves')::numeric",
    designWavelengthNm: "(p.spec->>'designWavelengthNm')::numeric",
    material: "p.spec->>'material'",
    construction: "p.spec->>'construction'",
    onHand: '"onHand"',
  },
  defaultSort: 'number',
  tieBreaker: 'p.id',
  search: ['p.number', 'p.description', "p.spec->>'material'", "p.spec->>'construction'"],
  filters: (query) => filterWhen({ clauses: [], replacements: {} }, query.active, 'p.active = :active', 'active'),
  present: (r) => ({
    id: Number(r.id),
    number: String(r.number),
    description: String(r.description),
    spec: r.spec as PartSpec,
    active: Boolean(r.active),
    onHand: Number(r.onHand),
  }),
  csv: {
    filename: 'parts',
    columns: [
      { header: 'part_number', value: (p) => p.number },
      { header: 'description', value: (p) => p.description },
      { header: 'retardance', value: (p) => retardanceName(p.spec) },
      { header: 'nominal_waves', value: (p) => p.spec.nominalWaves },
      { header: 'design_wavelength_nm', value: (p) => p.spec.designWavelengthNm },
      { header: 'retardance_tolerance_waves', value: (p) => p.spec.retardanceTolWaves },
      { header: 'axis_tolerance_deg', value: (p) => p.spec.axisTolDeg },
      { header: 'construction', value: (p) => p.spec.construction },
      { header: 'material', value: (p) => p.spec.material },
      { header: 'diameter_mm', value: (p) => p.spec.diameterMm },
      { header: 'decision_rule', value: (p) => p.spec.decisionRule },
      { header: 'on_hand', value: (p) => p.onHand },
      { header: 'active', value: (p) => p.active },
    ],
  },
};

const lineTotals = `(SELECT count(*) AS lines, sum(pol.quantity) AS ordered, sum(pol.quantity * pol.unit_price) AS value,
    ${receivedAsOrderedSql('ol.po_line_id IN (SELECT x.id FROM purchase_order_lines x WHERE x.purchase_order_id = po.id)')} AS received
  FROM purchase_order_lines pol WHERE pol.purchase_order_id = po.id)`;
const outcomes = pieceQuantitiesSql('ql.po_line_id IN (SELECT x.id FROM purchase_order_lines x WHERE x.purchase_order_id = po.id)');

export const purchaseOrderList: ListDefinition<PurchaseOrderRow, z.infer<typeof poListQuerySchema>> = {
  select: `po.id, po.number, s.name AS "supplierName", po.ordered_on AS "orderedOn", po.status, po.currency,
    t.lines AS "lineCount", t.ordered, t.received, t.value, q.accepted, q.nonconforming, q.returned`,
  from: `purchase_orders po JOIN suppliers s ON s.id = po.supplier_id CROSS JOIN LATERAL ${lineTotals} AS t CROSS JOIN LATERAL ${outcomes} AS q`,
  sortable: {
    number: 'po.number',
    supplierName: 's.name',
    orderedOn: 'po.ordered_on',
    status: 'po.status',
    ordered: 't.ordered',
    received: 't.received',
    value: 't.value',
    accepted: 'q.accepted',
    nonconforming: 'q.nonconforming',
    returned: 'q.returned',
  },
  defaultSort: '-orderedOn',
  tieBreaker: 'po.id',
  search: ['po.number', 's.name', 'po.notes'],
  totals: { ordered: 'sum(ordered)', received: 'sum(received)', accepted: 'sum(accepted)', nonconforming: 'sum(nonconforming)', returned: 'sum(returned)' },
  filters: (query) => {
    const filters = filterWhen({ clauses: [], replacements: {} }, query.status, 'po.status = :status', 'status');
    return filterWhen(filters, query.supplierId, 'po.supplier_id = :supplierId', 'supplierId');
  },
  present: (r) => ({
    id: Number(r.id),
    number: String(r.number),
    supplierName: String(r.supplierName),
    orderedOn: String(r.orderedOn),
    status: r.status as PoStatus,
    currency: String(r.currency),
    lineCount: Number(r.lineCount),
    ordered: Number(r.ordered ?? 0),
    received: Number(r.received ?? 0),
    value: Number(r.value ?? 0),
    ...pieceQuantities(r),
  }),
  csv: {
    filename: 'purchase-orders',
    columns: [
      { header: 'po_number', value: (r) => r.number },
      { header: 'supplier', value: (r) => r.supplierName },
      { header: 'ordered_on', value: (r) => r.orderedOn },
      { header: 'status', value: (r) => r.status },
      { header: 'lines', value: (r) => r.lineCount },
      { header: 'ordered', value: (r) => r.ordered },
      { header: 'received', value: (r) => r.received },
      { header: 'accepted', value: (r) => r.accepted },
      { header: 'nonconforming', value: (r) => r.nonconforming },
      { header: 'returned', value: (r) => r.returned },
      { header: 'value', value: (r) => r.value.toFixed(2) },
      { header: 'currency', value: (r) => r.currency },
    ],
  },
};
