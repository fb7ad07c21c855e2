import type { Supplier } from '../../../db/models';
import type { SupplierView } from '../../../shared/schemas/purchasing';
import type { ListDefinition } from '../../http/list';
import { filterWhen } from '../../http/list';
import type { z } from 'zod';
import type { supplierListQuerySchema } from '../../../shared/schemas/purchasing';

export function presentSupplier(supplier: Supplier, openOrders: number): SupplierView {
  return {
    id: supplier.id,
    name: supplier.name,
    contactEmail: supplier.contactEmail,
    owner: supplier.owner ? { id: supplier.owner.id, name: supplier.owner.name } : null,
    notes: supplier.notes,
    active: supplier.active,
    openOrders,
  };
}

export const supplierList: ListDefinition<SupplierView, z.infer<typeof supplierListQuerySchema>> = {
  select: `s.id, s.name, s.contact_email AS "contactEmail", s.notes, s.active, u.id AS "ownerId", u.name AS "ownerName",
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
