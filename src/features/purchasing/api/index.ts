import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { PlanLookup } from '@shared/sampling/plan';
import type { PlanQuery } from '@shared/schemas/sampling';
import type { PartInput, PartView, PurchaseOrderInput, PurchaseOrderRow, PurchaseOrderView, SupplierInput, SupplierView } from '@shared/schemas/purchasing';
import type { ListState } from '@/components/DataTable';
import { api } from '@/lib/api';
import { listPage } from '@/lib/lists';

type Filters = Record<string, string | number | undefined>;

export const purchasingKeys = {
  all: ['purchasing'] as const,
  suppliers: (query: Filters) => [...purchasingKeys.all, 'suppliers', query] as const,
  parts: (query: Filters) => [...purchasingKeys.all, 'parts', query] as const,
  part: (id: number) => [...purchasingKeys.all, 'part', id] as const,
  orders: (query: Filters) => [...purchasingKeys.all, 'orders', query] as const,
  order: (id: number) => [...purchasingKeys.all, 'order', id] as const,
  plan: (query: PlanQuery | null) => [...purchasingKeys.all, 'plan', query] as const,
};

const listQuery = <T>(key: readonly unknown[], path: string, query: Filters) =>
  ({ queryKey: key, queryFn: listPage<T>(path, query), placeholderData: keepPreviousData }) as const;

export const useSuppliers = (query: ListState & Filters) => useQuery(listQuery<SupplierView>(purchasingKeys.suppliers(query), '/suppliers', query));
export const useParts = (query: ListState & Filters) => useQuery(listQuery<PartView>(purchasingKeys.parts(query), '/parts', query));
export const usePurchaseOrders = (query: ListState & Filters) => useQuery(listQuery<PurchaseOrderRow>(purchasingKeys.orders(query), '/purchase-orders', query));

export const usePart = (id: number | undefined) =>
  useQuery({ queryKey: purchasingKeys.part(id ?? 0), queryFn: () => api<PartView>(`/parts/${id}`), enabled: id !== undefined });
/** The plan the tables give for a line; null asks nothing (the line is not complete yet). */
export const useSamplingPlan = (query: PlanQuery | null) =>
  useQuery({
    queryKey: purchasingKeys.plan(query),
    queryFn: () => api<PlanLookup>('/sampling/plan', { query: query! }),
    enabled: query !== null,
    // The tables do not change while the app runs.
    staleTime: Number.POSITIVE_INFINITY,
  });
export const usePurchaseOrder = (id: number | undefined) =>
  useQuery({ queryKey: purchasingKeys.order(id ?? 0), queryFn: () => api<PurchaseOrderView>(`/purchase-orders/${id}`), enabled: id !== undefined });

/** Creates (no id) or replaces (id) a record, then refreshes every purchasing list. */
function useSave<Input, View>(path: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id?: number; input: Input }) => api<View>(id ? `${path}/${id}` : path, { method: id ? 'PUT' : 'POST', body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: purchasingKeys.all }),
  });
}

export const useSaveSupplier = () => useSave<SupplierInput, SupplierView>('/suppliers');
export const useSavePart = () => useSave<PartInput, PartView>('/parts');
export const useSavePurchaseOrder = () => useSave<PurchaseOrderInput, PurchaseOrderView>('/purchase-orders');
