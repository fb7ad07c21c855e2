import type { SupplierView } from '../../../shared/schemas/purchasing';
import type { SupplierRecord } from '../../purchasing/suppliers';

export function presentSupplier({ supplier, openOrders }: SupplierRecord): SupplierView {
  return {
    id: supplier.id,
    name: supplier.name,
    contactEmail: supplier.contactEmail,
    qualityContactEmail: supplier.qualityContactEmail,
    owner: supplier.owner ? { id: supplier.owner.id, name: supplier.owner.name } : null,
    notes: supplier.notes,
    active: supplier.active,
    openOrders,
  };
}
